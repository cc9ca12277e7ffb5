// Number formatting for figures shown to users (client and server render the same text).

export function formatPercent(share: number, digits = 2): string {
  return `${(share * 100).toFixed(digits)} %`;
}

// Number formats are built once per option set: toLocaleString with options builds a new
// Intl.NumberFormat at every call, which was the largest single cost of rendering a study page.
const formats = new Map<string, Intl.NumberFormat>();
function numberFormat(key: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  let format = formats.get(key);
  if (!format) formats.set(key, (format = new Intl.NumberFormat("en-US", options)));
  return format;
}
const fixed = (digits: number) => numberFormat(`fixed:${digits}`, { minimumFractionDigits: digits, maximumFractionDigits: digits });

export function formatHours(hours: number, digits = 1): string {
  return `${fixed(digits).format(hours)} h`;
}

export function formatNumber(value: number, digits = 0): string {
  return fixed(digits).format(value);
}

export function formatMoney(value: number, currency = "USD"): string {
  return numberFormat(`money:${currency}`, { style: "currency", currency, maximumFractionDigits: 0 }).format(value);
}

/** "2025-03-01T14:05:00.000Z" → "2025-03-01 14:05 UTC". */
export function formatUtc(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

/** 500 MB style sizes (binary multiples, as file managers show them). */
export function formatBytes(bytes: number): string {
  const units = ["bytes", "KB", "MB", "GB", "TB"];
  let v = bytes;
  let u = 0;
  while (v >= 1024 && u < units.length - 1) {
    v /= 1024;
    u++;
  }
  return `${Number.isInteger(v) ? v : v.toFixed(1)} ${units[u]}`;
}

/**
 * Availability as a percentage, rounded down so it never reads as more than it is: "100 %" only
 * when nothing was dark, "> 99.999 %" when the dark share is below the last digit shown, so a
 * figure never says 100 % beside dark hours or meets a threshold that the verdict says it misses.
 */
export function formatAvailability(share: number | null | undefined, digits = 3): string {
  if (share == null) return "—";
  if (share >= 1) return "100 %";
  const scale = 10 ** digits;
  const top = 100 * scale;
  if ((1 - share) * top < 1) return `> ${((top - 1) / scale).toFixed(digits)} %`;
  // The small nudge undoes binary error (0.999 × 10⁵ is 99899.999…), never a whole last digit.
  const units = Math.min(top - 1, Math.floor(share * top + 1e-7));
  return `${(units / scale).toFixed(digits)} %`;
}

/**
 * Rounds parts to `digits` decimals so that they add up to their rounded total (largest remainder):
 * a table row of lit, dark and unknown hours then sums to the required hours it shows.
 */
export function roundToTotal(parts: readonly number[], digits = 1): number[] {
  const scale = 10 ** digits;
  const scaled = parts.map((p) => p * scale);
  const target = Math.round(scaled.reduce((a, b) => a + b, 0));
  const floors = scaled.map((x) => Math.floor(x + 1e-9));
  let missing = target - floors.reduce((a, b) => a + b, 0);
  const order = scaled.map((x, i) => ({ i, rest: x - floors[i] })).sort((a, b) => b.rest - a.rest || a.i - b.i);
  for (let k = 0; missing > 0 && k < order.length; k++, missing--) floors[order[k].i]++;
  return floors.map((f) => f / scale);
}
