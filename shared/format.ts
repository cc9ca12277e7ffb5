// Number formatting for figures shown to users (client and server render the same text).

export function formatPercent(share: number, digits = 2): string {
  return `${(share * 100).toFixed(digits)} %`;
}

export function formatHours(hours: number, digits = 1): string {
  return `${hours.toLocaleString("en-US", { minimumFractionDigits: digits, maximumFractionDigits: digits })} h`;
}

export function formatNumber(value: number, digits = 0): string {
  return value.toLocaleString("en-US", { minimumFractionDigits: digits, maximumFractionDigits: digits });
}

export function formatMoney(value: number, currency = "USD"): string {
  return value.toLocaleString("en-US", { style: "currency", currency, maximumFractionDigits: 0 });
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
