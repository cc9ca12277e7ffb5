// Policy for repeated failed sign-ins: slow down first, then refuse for a while.
// Counts are failures within the window, per account (e-mail) and per address (IP).

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

export function assessSignIn(accountFailures: number, addressFailures: number): ThrottleDecision {
  if (accountFailures >= THROTTLE.lockAccountAfter) {
    return {
      allowed: false,
      delayMs: 0,
      message: `This account is locked after ${THROTTLE.lockAccountAfter} failed sign-ins. Try again in ${THROTTLE.windowMinutes} minutes or reset your password.`,
    };
  }
  if (addressFailures >= THROTTLE.lockAddressAfter) {
    return {
      allowed: false,
      delayMs: 0,
      message: `Too many failed sign-ins from this address. Try again in ${THROTTLE.windowMinutes} minutes.`,
    };
  }
  const over = Math.max(accountFailures, addressFailures) - THROTTLE.slowAfter + 1;
  const delayMs = over > 0 ? Math.min(THROTTLE.maxDelayMs, over * THROTTLE.delayStepMs) : 0;
  return { allowed: true, delayMs };
}
