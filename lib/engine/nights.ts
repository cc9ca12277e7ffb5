// The night-by-night calendar (docs/computation.md "Night-by-night calendar"): for each night of the
// analysed period, the required, dark and unknown minutes, and one status a calendar cell shows.
// A "night" runs from local mean solar noon to the next one and carries the date of its evening, so
// one dusk-to-dawn window never splits across two cells (with an always-on schedule a night is simply
// that 24-hour span).
import type { NightCalendar, NightStatus } from "../../shared/study-schemas";

const DAY_S = 86_400;
const HALF_DAY_S = DAY_S / 2;
/** Less than a minute of dark or required time is treated as none (rounding of sub-steps). */
const NEGLIGIBLE_S = 60;

export interface NightInputs {
  periodStart: number;
  periodEnd: number;
  /** Seconds added to UTC for local mean solar time. */
  solarOffsetSeconds: number;
  /** Required windows [start, end, …], ascending, epoch seconds. */
  windows: ArrayLike<number>;
  /** Sample times and the longest interval still taken as known. */
  t: ArrayLike<number>;
  maxGapSeconds: number;
  /** Dark stretches [start, end, …], ascending, epoch seconds. */
  stretches: ArrayLike<number>;
}

/** Start (epoch s) of the night dated `day` (days since 1970-01-01 in local solar time). */
const nightStart = (day: number, offset: number) => day * DAY_S + HALF_DAY_S - offset;

/** Known time: sample intervals no longer than the maximum gap, clipped to the period and merged. */
export function knownIntervals(t: ArrayLike<number>, maxGapSeconds: number, start: number, end: number): number[] {
  const out: number[] = [];
  for (let i = 0; i + 1 < t.length; i++) {
    if (t[i + 1] - t[i] > maxGapSeconds) continue;
    const a = Math.max(t[i], start);
    const b = Math.min(t[i + 1], end);
    if (b <= a) continue;
    if (out.length && out[out.length - 1] >= a) out[out.length - 1] = Math.max(out[out.length - 1], b);
    else out.push(a, b);
  }
  return out;
}

/** Intersection of two ascending, non-overlapping interval lists. */
export function intersectIntervals(x: ArrayLike<number>, y: ArrayLike<number>): number[] {
  const out: number[] = [];
  let i = 0;
  let j = 0;
  while (i < x.length && j < y.length) {
    const a = Math.max(x[i], y[j]);
    const b = Math.min(x[i + 1], y[j + 1]);
    if (b > a) out.push(a, b);
    if (x[i + 1] < y[j + 1]) i += 2;
    else j += 2;
  }
  return out;
}

/** Seconds of `intervals` falling in each of `count` day-long bins starting at `origin`. */
export function secondsPerDay(intervals: ArrayLike<number>, origin: number, count: number): Float64Array {
  const bins = new Float64Array(count);
  for (let k = 0; k + 1 < intervals.length; k += 2) {
    let a = intervals[k];
    const b = intervals[k + 1];
    while (a < b) {
      const bin = Math.floor((a - origin) / DAY_S);
      const binEnd = origin + (bin + 1) * DAY_S;
      const e = Math.min(b, binEnd);
      if (bin >= 0 && bin < count) bins[bin] += e - a;
      a = e;
    }
  }
  return bins;
}

const minutes = (seconds: number) => Math.round(seconds / 6) / 10;

export function nightCalendar(n: NightInputs): NightCalendar {
  const firstDay = Math.floor((n.periodStart + n.solarOffsetSeconds - HALF_DAY_S) / DAY_S);
  const lastDay = Math.floor((n.periodEnd - 1 + n.solarOffsetSeconds - HALF_DAY_S) / DAY_S);
  const count = Math.max(0, lastDay - firstDay + 1);
  const origin = nightStart(firstDay, n.solarOffsetSeconds);
  const known = knownIntervals(n.t, n.maxGapSeconds, n.periodStart, n.periodEnd);
  const required = secondsPerDay(n.windows, origin, count);
  const requiredKnown = secondsPerDay(intersectIntervals(n.windows, known), origin, count);
  const dark = secondsPerDay(n.stretches, origin, count);
  return {
    first: new Date(firstDay * DAY_S * 1000).toISOString().slice(0, 10),
    requiredMinutes: Array.from(required, minutes),
    darkMinutes: Array.from(dark, minutes),
    unknownMinutes: Array.from(required, (r, i) => minutes(Math.max(0, r - requiredKnown[i]))),
  };
}

/**
 * One word per night: `none` (no required time, e.g. a polar summer day), `unknown` (half or more of
 * the required time has no known current), `dark` (dark through all of its known required time),
 * `partly` (some dark minutes), else `lit`.
 */
export function nightStatus(requiredMinutes: number, darkMinutes: number, unknownMinutes: number): NightStatus {
  const negligible = NEGLIGIBLE_S / 60;
  if (requiredMinutes < negligible) return "none";
  if (unknownMinutes * 2 >= requiredMinutes) return "unknown";
  if (darkMinutes < negligible) return "lit";
  return darkMinutes >= requiredMinutes - unknownMinutes - negligible ? "dark" : "partly";
}

export interface Night {
  /** Date of the evening the night starts (local mean solar time), YYYY-MM-DD. */
  date: string;
  /** When the night's span starts and ends (UTC ISO). */
  start: string;
  end: string;
  requiredMinutes: number;
  darkMinutes: number;
  unknownMinutes: number;
  status: NightStatus;
}

/** The calendar as one record per night (for the page, the report and the tests). */
export function nightsOf(calendar: NightCalendar, solarOffsetSeconds: number): Night[] {
  const firstDay = Date.parse(`${calendar.first}T00:00:00Z`) / 1000 / DAY_S;
  return calendar.requiredMinutes.map((required, i) => {
    const start = nightStart(firstDay + i, solarOffsetSeconds);
    const dark = calendar.darkMinutes[i] ?? 0;
    const unknown = calendar.unknownMinutes[i] ?? 0;
    return {
      date: new Date((firstDay + i) * DAY_S * 1000).toISOString().slice(0, 10),
      start: new Date(start * 1000).toISOString(),
      end: new Date((start + DAY_S) * 1000).toISOString(),
      requiredMinutes: required,
      darkMinutes: dark,
      unknownMinutes: unknown,
      status: nightStatus(required, dark, unknown),
    };
  });
}
