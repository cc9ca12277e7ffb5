/**
 * Delay before the next attempt after `attempts` failed ones: 1 s, 2 s, 4 s … doubling, capped
 * (default 5 minutes), so a short SMTP outage is bridged quickly and a long one is not hammered.
 */
export function retryDelayMs(attempts: number, { baseMs = 1000, capMs = 5 * 60_000 } = {}): number {
  if (attempts < 1) return 0;
  return Math.min(capMs, baseMs * 2 ** Math.min(attempts - 1, 30));
}
