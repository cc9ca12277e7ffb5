// Policy for repeated failed sign-ins: slow down first, then refuse for a while.
// Counts are failures within the window, per account (e-mail) and per address (IP). The address
// count is null when the client's address is unknown: then only the per-account limit applies,
// because counting every client as one address would let anyone lock everyone out.

export const THROTTLE = {
  windowMinutes: 15,
  /** Failures after which each further attempt is delayed. */
  slowAfter: 3,
  delayStepMs: 400,
  maxDelayMs: 2000,
  /** Failures after which the account is refused until the window passes. */
  lockAccountAfter: 5,
  /** Failures from one address (any account) after which it is refused. */
  lockAddressAfter: 20,
} as const;

export interface ThrottleDecision {
  allowed: boolean;
  delayMs: number;
  message?: string;
}

export function assessSignIn(accountFailures: number, addressFailures: number | null): ThrottleDecision {
  if (accountFailures >= THROTTLE.lockAccountAfter) {
    return {
      allowed: false,
      delayMs: 0,
      message: `This account is locked after ${THROTTLE.lockAccountAfter} failed sign-ins. Try again in ${THROTTLE.windowMinutes} minutes or reset your password.`,
    };
  }
  if (addressFailures !== null && addressFailures >= THROTTLE.lockAddressAfter) {
    return {
      allowed: false,
      delayMs: 0,
      message: `Too many failed sign-ins from this address. Try again in ${THROTTLE.windowMinutes} minutes.`,
    };
  }
  const over = Math.max(accountFailures, addressFailures ?? 0) - THROTTLE.slowAfter + 1;
  const delayMs = over > 0 ? Math.min(THROTTLE.maxDelayMs, over * THROTTLE.delayStepMs) : 0;
  return { allowed: true, delayMs };
}

/** Password-reset requests: per e-mail (mail flooding) and per address (probing), within the window. */
export const RESET_LIMITS = {
  windowMinutes: 60,
  perEmail: 3,
  perAddress: 20,
} as const;
