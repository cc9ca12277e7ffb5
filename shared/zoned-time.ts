// Times in a circuit's IANA time zone, for pages (server and browser render the same text):
// wall-clock parts and UTC offsets from Intl, and a local calendar date → its UTC start.

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(zone: string): Intl.DateTimeFormat {
  let f = formatters.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", { timeZone: zone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" });
    formatters.set(zone, f);
  }
  return f;
}

export interface WallClock {
  year: number;
  month: number; // 1–12
  day: number;
  hour: number;
  minute: number;
  second: number;
  /** Local − UTC, in minutes. */
  offsetMinutes: number;
}

/** The wall clock in `zone` at a UTC instant (ms). */
export function wallClock(ms: number, zone: string): WallClock {
  const parts: Record<string, number> = {};
  for (const p of formatter(zone).formatToParts(ms)) if (p.type !== "literal") parts[p.type] = Number(p.value);
  const whole = Math.floor(ms / 1000) * 1000;
  const asUtc = Date.UTC(parts.year, parts.month - 1, parts.day, parts.hour, parts.minute, parts.second);
  return { year: parts.year, month: parts.month, day: parts.day, hour: parts.hour, minute: parts.minute, second: parts.second, offsetMinutes: Math.round((asUtc - whole) / 60_000) };
}

const pad = (n: number) => String(n).padStart(2, "0");

/** "UTC", "UTC+1", "UTC−5", "UTC+5:30". */
export function offsetLabel(offsetMinutes: number): string {
  if (offsetMinutes === 0) return "UTC";
  const sign = offsetMinutes > 0 ? "+" : "−";
  const abs = Math.abs(offsetMinutes);
  return `UTC${sign}${Math.floor(abs / 60)}${abs % 60 ? `:${pad(abs % 60)}` : ""}`;
}

/** "2025-03-01 08:05 UTC−6": the local wall-clock time in `zone` with its offset. */
export function formatLocal(iso: string | number, zone: string): string {
  const c = wallClock(typeof iso === "number" ? iso : Date.parse(iso), zone);
  return `${c.year}-${pad(c.month)}-${pad(c.day)} ${pad(c.hour)}:${pad(c.minute)} ${offsetLabel(c.offsetMinutes)}`;
}

/** "2025-03-01": the local calendar date in `zone`. */
export function localDate(iso: string | number, zone: string): string {
  const c = wallClock(typeof iso === "number" ? iso : Date.parse(iso), zone);
  return `${c.year}-${pad(c.month)}-${pad(c.day)}`;
}

/**
 * The UTC instant (ms) at which the local calendar day `date` (YYYY-MM-DD) begins in `zone`: its
 * first wall-clock moment (midnight, or the end of a daylight-saving gap at midnight).
 */
export function startOfLocalDay(date: string, zone: string): number {
  const [y, m, d] = date.split("-").map(Number);
  const wall = Date.UTC(y, m - 1, d);
  // Two rounds settle the offset (the offset at the guess may differ from that at the answer).
  let guess = wall - wallClock(wall, zone).offsetMinutes * 60_000;
  guess = wall - wallClock(guess, zone).offsetMinutes * 60_000;
  // Midnight skipped by a change: the day starts where the clock jumps to, within the hour.
  const c = wallClock(guess, zone);
  if (`${c.year}-${pad(c.month)}-${pad(c.day)}` !== date.slice(0, 10)) {
    while (localDate(guess, zone) < date.slice(0, 10)) guess += 15 * 60_000;
  }
  return guess;
}

/** The calendar date `days` after `date` (YYYY-MM-DD), on the proleptic calendar. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split("-").map(Number);
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}
