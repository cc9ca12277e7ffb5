// Timestamp parsing for current-history CSVs: all supported formats, local times in an
// IANA zone through Intl only (no hand-written zone rules), DST gaps and folds.
// Browser-safe: no Node APIs.
import type { TimestampFormat } from "../../shared/ingest-options";
import { inTimeRange } from "./time-range";

export type ConcreteTimestampFormat = Exclude<TimestampFormat, "auto">;

export type TimestampProblem = "bad-timestamp" | "nonexistent-local-time" | "out-of-range-timestamp";

/** Spreadsheet serial days (1900 date system): serial 25569 is 1970-01-01 00:00. */
export const SERIAL_DAY_OF_UNIX_EPOCH = 25569;

const DAY = 86400;
const HOUR = 3600;

// ---------------------------------------------------------------------------------------
// Civil date-time fields: "2024-03-10 02:15:00", "10/03/2024 2:15 PM", "…T…+02:00"
// ---------------------------------------------------------------------------------------

type FieldOrder = "ymd" | "dmy" | "mdy";

/** Result slots of the last `parseCivil` call (kept outside to avoid an object per row). */
const civil = { localSeconds: 0, offsetSeconds: NaN };

let lastDayKey = -1;
const dayDate = new Date(0);
let lastDaySeconds = 0;

function daySeconds(year: number, month: number, day: number): number {
  const key = year * 10000 + month * 100 + day;
  if (key !== lastDayKey) {
    lastDayKey = key;
    // Not Date.UTC: it reads years 0–99 as 1900–1999, so "0001-01-01" would become 1901.
    dayDate.setTime(0);
    dayDate.setUTCFullYear(year, month - 1, day);
    lastDaySeconds = dayDate.getTime() / 1000;
  }
  return lastDaySeconds;
}

function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

const isDigit = (c: number) => c >= 48 && c <= 57;
const dateFields = new Int32Array(3);
const dateWidths = new Int32Array(3);

/**
 * Reads a date (three numeric fields in `order`, separated by - / or .), an optional time
 * (h:mm[:ss[.fff]] with optional AM/PM) and an optional explicit offset (Z, UTC, ±hh[:mm]).
 * Reads `s` from `from` to `n` (exclusive) and never past `n`, so the text may be a whole
 * chunk of the file. Fills `civil` and returns true, or returns false when the text is not such a timestamp.
 */
function parseCivil(s: string, from: number, n: number, order: FieldOrder): boolean {
  if (order === "ymd" && parseFixedYmd(s, from, n)) return true;
  let i = from;
  while (i < n && s.charCodeAt(i) === 32) i++;

  // Three date fields (module-level slots: no allocation per row).
  let separator = -1;
  for (let f = 0; f < 3; f++) {
    let v = 0;
    const start = i;
    let c = 0;
    while (i < n && (c = s.charCodeAt(i)) >= 48 && c <= 57) {
      v = v * 10 + (c - 48);
      i++;
    }
    const width = i - start;
    if (width === 0 || width > 4) return false;
    dateFields[f] = v;
    dateWidths[f] = width;
    if (f < 2) {
      c = at(s, i, n);
      if (c !== 45 && c !== 47 && c !== 46) return false; // - / .
      if (separator === -1) separator = c;
      else if (c !== separator) return false;
      i++;
    }
  }
  let year: number, month: number, day: number, yearWidth: number;
  if (order === "ymd") {
    year = dateFields[0];
    month = dateFields[1];
    day = dateFields[2];
    yearWidth = dateWidths[0];
    if (dateWidths[1] > 2 || dateWidths[2] > 2) return false;
  } else {
    year = dateFields[2];
    yearWidth = dateWidths[2];
    day = order === "dmy" ? dateFields[0] : dateFields[1];
    month = order === "dmy" ? dateFields[1] : dateFields[0];
    if (dateWidths[0] > 2 || dateWidths[1] > 2) return false;
  }
  if (yearWidth === 2 && order !== "ymd") year += year < 70 ? 2000 : 1900;
  else if (yearWidth !== 4) return false;
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return false;

  // Optional time of day.
  let seconds = 0;
  let offset = NaN;
  let c = at(s, i, n);
  if (i < n && (c === 84 || c === 116 || c === 32 || c === 44)) {
    // T, t, space or "," (as in "3/10/2024, 2:15 AM")
    i++;
    while (i < n && s.charCodeAt(i) === 32) i++;
    let hour = 0;
    let w = 0;
    while (i < n && isDigit((c = s.charCodeAt(i)))) {
      hour = hour * 10 + (c - 48);
      i++;
      w++;
    }
    if (w === 0 || w > 2 || at(s, i, n) !== 58) return false;
    i++;
    const minute = twoDigits(s, i, n);
    if (minute < 0 || minute > 59) return false;
    i += 2;
    let second = 0;
    let fraction = 0;
    if (at(s, i, n) === 58) {
      second = twoDigits(s, i + 1, n);
      if (second < 0 || second > 59) return false;
      i += 3;
      c = at(s, i, n);
      if ((c === 46 || c === 44) && isDigit(at(s, i + 1, n))) {
        i++;
        let scale = 0.1;
        while (i < n && isDigit((c = s.charCodeAt(i)))) {
          fraction += (c - 48) * scale;
          scale /= 10;
          i++;
        }
        fraction = Math.round(fraction * 1000) / 1000;
      }
    }
    // AM / PM
    let j = i;
    while (j < n && s.charCodeAt(j) === 32) j++;
    const m0 = at(s, j, n) | 32;
    if ((m0 === 97 || m0 === 112) && (at(s, j + 1, n) | 32) === 109) {
      if (hour < 1 || hour > 12) return false;
      hour = (hour % 12) + (m0 === 112 ? 12 : 0);
      i = j + 2;
    }
    if (hour > 23) return false;
    seconds = hour * HOUR + minute * 60 + second + fraction;

    // Explicit offset.
    while (i < n && s.charCodeAt(i) === 32) i++;
    c = at(s, i, n);
    if (c === 90 || c === 122) {
      offset = 0;
      i++;
    } else if ((c === 85 || c === 71) && i + 3 <= n && /^(UTC|GMT)$/i.test(s.slice(i, i + 3))) {
      offset = 0;
      i += 3;
    }
    c = at(s, i, n);
    if (c === 43 || c === 45) {
      const sign = c === 43 ? 1 : -1;
      const oh = twoDigits(s, i + 1, n);
      if (oh < 0 || oh > 14) return false;
      i += 3;
      let om = 0;
      if (at(s, i, n) === 58) i++;
      if (isDigit(at(s, i, n))) {
        om = twoDigits(s, i, n);
        if (om < 0 || om > 59) return false;
        i += 2;
      }
      offset = sign * (oh * HOUR + om * 60);
    }
  }
  while (i < n && (s.charCodeAt(i) === 32 || s.charCodeAt(i) === 13)) i++;
  if (i !== n) return false;
  civil.localSeconds = daySeconds(year, month, day) + seconds;
  civil.offsetSeconds = offset;
  return true;
}

/**
 * The usual historian shape, "YYYY-MM-DD hh:mm" or "YYYY-MM-DD hh:mm:ss" (date fields joined by
 * - / or ., then T or a space), read at fixed places: about four times faster than the general
 * reading, and the same result. False for anything else, which the general reading then takes.
 */
function parseFixedYmd(s: string, i: number, n: number): boolean {
  const length = n - i;
  if (length !== 19 && length !== 16) return false;
  const separator = s.charCodeAt(i + 4);
  if ((separator !== 45 && separator !== 47 && separator !== 46) || s.charCodeAt(i + 7) !== separator) return false;
  const t = s.charCodeAt(i + 10);
  if ((t !== 32 && t !== 84 && t !== 116) || s.charCodeAt(i + 13) !== 58) return false;
  const century = twoDigits(s, i, n);
  const yy = twoDigits(s, i + 2, n);
  const month = twoDigits(s, i + 5, n);
  const day = twoDigits(s, i + 8, n);
  const hour = twoDigits(s, i + 11, n);
  const minute = twoDigits(s, i + 14, n);
  let second = 0;
  if (length === 19) {
    if (s.charCodeAt(i + 16) !== 58) return false;
    second = twoDigits(s, i + 17, n);
  }
  if ((century | yy | day | hour) < 0 || month < 1 || month > 12 || minute < 0 || minute > 59 || second < 0 || second > 59 || hour > 23) return false;
  const year = century * 100 + yy;
  if (day < 1 || day > daysInMonth(year, month)) return false;
  civil.localSeconds = daySeconds(year, month, day) + hour * HOUR + minute * 60 + second;
  civil.offsetSeconds = NaN;
  return true;
}

/** The character code at `i`, or NaN at or past `n` (as charCodeAt past a string's end). */
function at(s: string, i: number, n: number): number {
  return i < n ? s.charCodeAt(i) : NaN;
}

function twoDigits(s: string, i: number, n: number): number {
  const a = at(s, i, n) - 48;
  const b = at(s, i + 1, n) - 48;
  if (a < 0 || a > 9 || b < 0 || b > 9) return -1;
  return a * 10 + b;
}

/** A plain decimal number (no thousands separators): the epoch and serial formats. */
function parsePlainNumber(s: string): number {
  const t = s.trim();
  if (t === "" || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return NaN;
  return Number(t);
}

// ---------------------------------------------------------------------------------------
// Zone offsets through Intl, cached per local day, and per local hour on transition days
// ---------------------------------------------------------------------------------------

export type LocalResolution =
  | { kind: "single"; offset: number }
  | { kind: "ambiguous"; earlier: number; later: number } // offsets; the earlier instant has the larger offset
  | { kind: "nonexistent" };

/** Offsets on both sides of a local day, and per-hour resolutions on transition days ("mixed": resolve each time). */
interface DayEntry {
  before: number;
  after: number;
  hours?: Map<number, LocalResolution | "mixed">;
}

/** Maps local wall-clock seconds (as if UTC) to UTC seconds in one IANA zone. */
export class ZoneResolver {
  readonly zone: string;
  private readonly formatter: Intl.DateTimeFormat;
  private readonly days = new Map<number, DayEntry>();
  private lastDay = NaN;
  private lastDayOffset = NaN; // set when the last day had one offset all day

  constructor(zone: string) {
    this.zone = zone;
    this.formatter = new Intl.DateTimeFormat("en-US", {
      timeZone: zone,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
      era: "short",
    });
  }

  /** UTC offset in seconds (local − UTC) at a UTC instant, from Intl. */
  offsetAt(utcSeconds: number): number {
    const whole = Math.floor(utcSeconds);
    let year = 0;
    let month = 1;
    let day = 1;
    let hour = 0;
    let minute = 0;
    let second = 0;
    let bc = false;
    for (const part of this.formatter.formatToParts(whole * 1000)) {
      switch (part.type) {
        case "year":
          year = Number(part.value);
          break;
        case "month":
          month = Number(part.value);
          break;
        case "day":
          day = Number(part.value);
          break;
        case "hour":
          hour = Number(part.value);
          break;
        case "minute":
          minute = Number(part.value);
          break;
        case "second":
          second = Number(part.value);
          break;
        case "era":
          bc = /^B/i.test(part.value);
          break;
      }
    }
    if (bc) year = 1 - year;
    const date = new Date(0);
    date.setUTCFullYear(year, month - 1, day);
    date.setUTCHours(hour, minute, second, 0);
    return date.getTime() / 1000 - whole;
  }

  /**
   * Resolve a local time exactly from the offsets in force before and after it.
   * Assumes at most one transition within about two days, as in the tz database.
   */
  private resolveExact(local: number, before: number, after: number): LocalResolution {
    const candidates = before === after ? [before] : [before, after];
    const valid = candidates.filter((o) => this.offsetAt(local - o) === o);
    if (valid.length === 0) return { kind: "nonexistent" };
    if (valid.length === 1) return { kind: "single", offset: valid[0] };
    return { kind: "ambiguous", earlier: Math.max(...valid), later: Math.min(...valid) };
  }

  /** The day's single offset when no transition falls on that local day, else NaN (fast path). */
  uniformOffset(local: number): number {
    const dayIndex = Math.floor(local / DAY);
    if (dayIndex === this.lastDay) return this.lastDayOffset;
    const entry = this.dayEntry(dayIndex);
    this.lastDay = dayIndex;
    this.lastDayOffset = entry.before === entry.after ? entry.before : NaN;
    return this.lastDayOffset;
  }

  private dayEntry(dayIndex: number): DayEntry {
    let entry = this.days.get(dayIndex);
    if (!entry) {
      const dayStart = dayIndex * DAY;
      // Any zone's offset lies within −12 h … +14 h, so these instants bracket the local day.
      entry = { before: this.offsetAt(dayStart - 15 * HOUR), after: this.offsetAt(dayStart + DAY + 13 * HOUR) };
      this.days.set(dayIndex, entry);
    }
    return entry;
  }

  /** How a local wall-clock time maps to UTC: one offset, two (a repeated hour) or none (a skipped hour). */
  resolve(local: number): LocalResolution {
    const entry = this.dayEntry(Math.floor(local / DAY));
    if (entry.before === entry.after) return { kind: "single", offset: entry.before };
    // A transition day: cache per local hour; an hour holding the transition itself
    // (zones that switch at half past, say) is resolved time by time.
    entry.hours ??= new Map();
    const hourIndex = Math.floor(local / HOUR);
    let hour = entry.hours.get(hourIndex);
    if (!hour) {
      const first = this.resolveExact(hourIndex * HOUR, entry.before, entry.after);
      const last = this.resolveExact(hourIndex * HOUR + HOUR - 1e-3, entry.before, entry.after);
      hour = sameResolution(first, last) ? first : "mixed";
      entry.hours.set(hourIndex, hour);
    }
    return hour === "mixed" ? this.resolveExact(local, entry.before, entry.after) : hour;
  }
}

function sameResolution(a: LocalResolution, b: LocalResolution): boolean {
  if (a.kind !== b.kind) return false;
  if (a.kind === "single" && b.kind === "single") return a.offset === b.offset;
  if (a.kind === "ambiguous" && b.kind === "ambiguous") return a.earlier === b.earlier && a.later === b.later;
  return true;
}

const resolvers = new Map<string, ZoneResolver>();

/** One resolver (with its caches) per zone, reused across files. */
export function zoneResolver(zone: string): ZoneResolver {
  let r = resolvers.get(zone);
  if (!r) {
    r = new ZoneResolver(zone);
    resolvers.set(zone, r);
  }
  return r;
}

const isUtcZone = (zone: string) => /^(UTC|Etc\/UTC|Etc\/GMT|GMT|Z|Etc\/Zulu|Zulu|Universal|Etc\/Universal)$/i.test(zone);

// ---------------------------------------------------------------------------------------
// The per-file parser
// ---------------------------------------------------------------------------------------

/**
 * Parses one file's timestamps in one format. Stateful: a repeated autumn hour is resolved
 * by file order — the first pass through the hour takes the earlier instant; once times
 * stop advancing within the repeated hour, the later one.
 */
export class TimestampParser {
  readonly format: ConcreteTimestampFormat;
  private readonly order: FieldOrder;
  private readonly zone: ZoneResolver | null;
  /** Why the last `parse` returned NaN. */
  problem: TimestampProblem = "bad-timestamp";
  /** Count of timestamps that carried their own offset (Z, +02:00). */
  explicitOffsets = 0;
  /** Count of local times that fell in a repeated (autumn) hour. */
  ambiguousLocalTimes = 0;
  private foldKey = NaN;
  private foldLatestLocal = -Infinity;
  private foldUseLater = false;

  constructor(format: ConcreteTimestampFormat, timezone = "UTC") {
    this.format = format;
    this.order = format === "dmy" ? "dmy" : format === "mdy" ? "mdy" : "ymd";
    this.zone = isUtcZone(timezone) ? null : zoneResolver(timezone);
  }

  /**
   * Epoch seconds (UTC), or NaN with `problem` set. A readable time outside the accepted
   * years (time-range.ts) is NaN with problem "out-of-range-timestamp"; `lastOutOfRange`
   * keeps its value for the message.
   */
  parse(text: string): number {
    return this.parseAt(text, 0, text.length);
  }

  /** `parse` of `text.slice(from, to)`; the usual formats are read straight from the text. */
  parseAt(text: string, from: number, to: number): number {
    const t = this.parseUnchecked(text, from, to);
    if (t !== t || inTimeRange(t)) return t;
    this.lastOutOfRange = t;
    return this.fail("out-of-range-timestamp");
  }

  /** The last readable value refused as out of range (epoch seconds). */
  lastOutOfRange = NaN;

  private parseUnchecked(source: string, from: number, to: number): number {
    switch (this.format) {
      case "epoch-s": {
        const v = parsePlainNumber(source.slice(from, to));
        return v === v ? Math.round(v * 1000) / 1000 : this.fail("bad-timestamp");
      }
      case "epoch-ms": {
        const v = parsePlainNumber(source.slice(from, to));
        return v === v ? Math.round(v) / 1000 : this.fail("bad-timestamp");
      }
      case "serial-days": {
        const v = parsePlainNumber(source.slice(from, to));
        if (!(v >= 1 && v < 2958466)) return this.fail("bad-timestamp");
        return this.fromLocal(Math.round((v - SERIAL_DAY_OF_UNIX_EPOCH) * DAY * 1000) / 1000);
      }
      default: {
        if (!parseCivil(source, from, to, this.order)) return this.fail("bad-timestamp");
        if (civil.offsetSeconds === civil.offsetSeconds) {
          this.explicitOffsets++;
          return civil.localSeconds - civil.offsetSeconds; // an offset in the data wins over the zone
        }
        return this.fromLocal(civil.localSeconds);
      }
    }
  }

  private fail(problem: TimestampProblem): number {
    this.problem = problem;
    return NaN;
  }

  private fromLocal(local: number): number {
    if (!this.zone) return local;
    const uniform = this.zone.uniformOffset(local);
    if (uniform === uniform) return local - uniform;
    const r = this.zone.resolve(local);
    if (r.kind === "single") return local - r.offset;
    if (r.kind === "nonexistent") return this.fail("nonexistent-local-time");
    this.ambiguousLocalTimes++;
    const key = Math.floor(local / DAY); // one fold per local day
    if (key !== this.foldKey) {
      this.foldKey = key;
      this.foldLatestLocal = -Infinity;
      this.foldUseLater = false;
    }
    if (!this.foldUseLater && local <= this.foldLatestLocal) this.foldUseLater = true;
    if (local > this.foldLatestLocal) this.foldLatestLocal = local;
    return local - (this.foldUseLater ? r.later : r.earlier);
  }
}

// ---------------------------------------------------------------------------------------
// Format detection from sample values
// ---------------------------------------------------------------------------------------

export interface TimestampDetection {
  /** Best concrete format, or null when the values are not timestamps. */
  format: ConcreteTimestampFormat | null;
  /** Values are d/m/y or m/d/y and none settles which: ask the user. */
  dayMonthAmbiguous: boolean;
  /** Share of the non-empty values the chosen format parses. */
  parsedShare: number;
}

const DAY_MONTH_PATTERN = /^\s*(\d{1,2})[-/.](\d{1,2})[-/.](\d{2}|\d{4})(?:$|[\sT,])/;
const YEAR_FIRST_PATTERN = /^\s*\d{4}[-/.]\d{1,2}[-/.]\d{1,2}(?:$|[\sTt])/;

/**
 * Evidence for day-first or month-first order: a first field above 12 means d/m/y,
 * a second field above 12 means m/d/y.
 */
export function dayMonthEvidence(values: readonly string[]): { dayFirst: number; monthFirst: number; matched: number } {
  let dayFirst = 0;
  let monthFirst = 0;
  let matched = 0;
  for (const v of values) {
    const m = DAY_MONTH_PATTERN.exec(v);
    if (!m) continue;
    matched++;
    if (Number(m[1]) > 12) dayFirst++;
    if (Number(m[2]) > 12) monthFirst++;
  }
  return { dayFirst, monthFirst, matched };
}

/** Guess the timestamp format of a column from a few of its values. */
export function detectTimestampFormat(values: readonly string[]): TimestampDetection {
  const present = values.map((v) => v.trim()).filter((v) => v !== "");
  const none: TimestampDetection = { format: null, dayMonthAmbiguous: false, parsedShare: 0 };
  if (present.length === 0) return none;
  const share = (format: ConcreteTimestampFormat) => {
    const parser = new TimestampParser(format, "UTC");
    let ok = 0;
    for (const v of present) if (parser.parse(v) === parser.parse(v)) ok++;
    return ok / present.length;
  };
  // The family most values look like wins (a minority may be garbage; the ingester counts it).
  const yearFirst = present.filter((v) => YEAR_FIRST_PATTERN.test(v)).length;
  const dayMonth = present.filter((v) => DAY_MONTH_PATTERN.test(v)).length;
  const numbers = present.map(parsePlainNumber);
  const numeric = numbers.filter((x) => x === x).length;

  if (yearFirst > 0 && yearFirst >= dayMonth && yearFirst >= numeric) {
    const format = present.some((v) => /^\s*\d{4}-\d{1,2}-\d{1,2}/.test(v)) ? "iso" : "ymd";
    return { format, dayMonthAmbiguous: false, parsedShare: share(format) };
  }
  if (dayMonth > 0 && dayMonth >= numeric) {
    const e = dayMonthEvidence(present);
    if (e.dayFirst > 0 && e.monthFirst === 0) return { format: "dmy", dayMonthAmbiguous: false, parsedShare: share("dmy") };
    if (e.monthFirst > 0 && e.dayFirst === 0) return { format: "mdy", dayMonthAmbiguous: false, parsedShare: share("mdy") };
    if (e.monthFirst > 0 && e.dayFirst > 0) return { ...none, parsedShare: 0 }; // contradictory: not one format
    return { format: "dmy", dayMonthAmbiguous: true, parsedShare: share("dmy") };
  }
  if (numeric > 0) {
    const valid = numbers.filter((x) => x === x);
    valid.sort((a, b) => a - b);
    const median = valid[valid.length >> 1];
    // Magnitudes: serial days for 1927…2119, epoch seconds for 1973…5138, epoch ms after 1973.
    let format: ConcreteTimestampFormat | null = null;
    if (median >= 1e11) format = "epoch-ms";
    else if (median >= 1e8) format = "epoch-s";
    else if (median >= 10000 && median < 80000) format = "serial-days";
    if (format) return { format, dayMonthAmbiguous: false, parsedShare: share(format) };
  }
  return none;
}
