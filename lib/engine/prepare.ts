// Everything about a study that does not depend on the device: the capped and scaled samples, the
// analysis period, known/unknown intervals, the required windows, the month calendar and the
// load-duration curve. Done once per study, so the solvers only re-run the simulation.
import { z } from "zod";
import { defaultMaxGapSeconds, selectPhase, type ProfileSeries, type Series } from "../series";
import {
  locationSchema,
  policySchema,
  scheduleSchema,
  studyParamsSchema,
  type DeviceInput,
  type Interpolation,
  type Location,
  type Policy,
  type Schedule,
  type StudyParams,
} from "../../shared/study-schemas";
import { compileDevice, PLAUSIBILITY_CAP_FACTOR, type CompiledDevice } from "./device";
import { requiredWindows } from "./sun";
import { offsetAt, solarClock, zoneClock, type GridClock } from "./clock";
import { loadDistribution, type ExceededCurrents, type KnownSpan, type LoadDurationPoint } from "./load-duration";
import { inTimeRange, outOfRangeText, spanProblem } from "../ingest/time-range";

export interface StudyInput {
  device: DeviceInput;
  schedule?: z.input<typeof scheduleSchema>;
  location: Location;
  params?: z.input<typeof studyParamsSchema>;
  policy?: z.input<typeof policySchema>;
}

/** Invalid study input (other than the device, which throws DeviceError). */
export class StudyInputError extends Error {
  constructor(
    message: string,
    readonly issues: { path: string[]; message: string }[] = [{ path: [], message }],
  ) {
    super(message);
    this.name = "StudyInputError";
  }
}

export interface MonthCalendar {
  /**
   * Start (UTC second) of each month touched by the period, plus the start of the month after the
   * last. Months are the circuit's local calendar months when the study has a time zone, UTC
   * months otherwise.
   */
  starts: Float64Array;
  labels: string[];
  years: Int32Array;
}

export interface PreparedStudy {
  /** Valid samples after the plausibility cap and load scale, with one neighbour either side of the period. */
  t: Float64Array;
  amps: Float64Array;
  periodStart: number;
  periodEnd: number;
  interpolation: Interpolation;
  maxGapSeconds: number;
  maxGapSource: "given" | "3 × median interval";
  medianIntervalSeconds: number;
  loadScale: number;
  plausibilityCapA: number;
  samplesUsed: number;
  samplesAboveCap: number;
  schedule: Schedule;
  location: Location;
  params: StudyParams;
  /** Required windows [start, end, …] within the period, epoch seconds. */
  windows: Float64Array;
  months: MonthCalendar;
  monthTotalSeconds: Float64Array;
  monthRequiredSeconds: Float64Array;
  knownSeconds: number;
  /** The clock of the hour × month grid: the circuit's zone, else local mean solar time. */
  gridClock: GridClock;
  loadDuration: LoadDurationPoint[];
  /** Currents exceeded 10 / 50 / 90 % of the known time; null when no time is known. */
  exceeded: ExceededCurrents | null;
  /** The circuit's normal rating and the known hours above it, when the study was given one. */
  rating: { ratingA: number; hoursAbove: number } | null;
  /**
   * Mean temperature (°C) of each month of the calendar: the recorded mean of that month when the
   * profile has one, else the monthly normal; NaN for a month with neither (no derating there);
   * null when the study has no temperatures at all.
   */
  monthTemperatureC: Float64Array | null;
}

export interface StudyContext {
  prepared: PreparedStudy;
  device: CompiledDevice;
  policy: Policy;
}

/** The channel a study runs on: the profile's phase named in the study parameters (default A). */
export function studySeries(profile: ProfileSeries, params: z.input<typeof studyParamsSchema> = {}): Series {
  return selectPhase(profile, params.phase ?? "A");
}

/**
 * Validate the input, compile the device and do the device-independent work once. With a `cache`
 * (the optimiser's), devices that share the plausibility cap reuse the prepared series of the
 * first: it depends only on the series, schedule, location, parameters and cap.
 */
export function prepareStudy(series: Series, input: StudyInput, cache?: Map<string, PreparedStudy>): StudyContext {
  const schedule = parseOrThrow(scheduleSchema, input.schedule ?? { kind: "night" }, "schedule");
  const location = parseOrThrow(locationSchema, input.location, "location");
  const params = parseOrThrow(studyParamsSchema, input.params ?? {}, "params");
  const policy = parseOrThrow(policySchema, input.policy ?? {}, "policy");
  const maxCurrentA = Number((input.device as { maxCurrentA?: unknown }).maxCurrentA);
  const capA = params.plausibilityCapA ?? PLAUSIBILITY_CAP_FACTOR * maxCurrentA;
  // The table must cover every current the simulation can meet: the cap, scaled.
  const device = compileDevice(input.device, { tableMaxA: Number.isFinite(capA) && capA > 0 ? capA * Math.max(1, params.loadScale) : undefined });
  const key = cache ? JSON.stringify([capA, schedule, location, params]) : "";
  const prepared = cache?.get(key) ?? prepareSeries(series, { schedule, location, params, plausibilityCapA: capA });
  cache?.set(key, prepared);
  return { prepared, device, policy };
}

function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown, root: string): z.output<S> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const issues = result.error.issues.map((i) => ({ path: [root, ...i.path.map(String)], message: i.message }));
  throw new StudyInputError(issues[0].message, issues);
}

export function prepareSeries(
  series: Series,
  options: { schedule: Schedule; location: Location; params: StudyParams; plausibilityCapA: number },
): PreparedStudy {
  const { schedule, location, params, plausibilityCapA } = options;
  const { t: rawT, amps: rawAmps } = series;
  // Plausibility cap on the measured values, then the what-if load scale (copies only when needed).
  let aboveCap = 0;
  for (let i = 0; i < rawT.length; i++) if (rawAmps[i] > plausibilityCapA) aboveCap++;
  let allT = rawT;
  let allA = rawAmps;
  const switchedOut = (params.switchedOut ?? []).map((o) => [Date.parse(o.start) / 1000, Date.parse(o.end) / 1000] as const);
  if (aboveCap > 0 || params.loadScale !== 1 || switchedOut.length > 0) {
    allT = new Float64Array(rawT.length - aboveCap);
    allA = new Float64Array(rawT.length - aboveCap);
    let k = 0;
    for (let i = 0; i < rawT.length; i++) {
      const a = rawAmps[i];
      if (a <= plausibilityCapA) {
        allT[k] = rawT[i];
        allA[k] = a * params.loadScale;
        k++;
      }
    }
    // What-if switching: samples timed inside a switched-out period read 0 A.
    for (const [from, to] of switchedOut) {
      for (let j = lowerBound(allT, from); j < allT.length && allT[j] < to; j++) allA[j] = 0;
    }
  }
  const samplesAboveCap = aboveCap;
  const n = allT.length;
  if (n < 2) {
    throw new StudyInputError(
      samplesAboveCap > 0
        ? `Fewer than two samples remain below the plausibility cap of ${plausibilityCapA} A (${samplesAboveCap} dropped).`
        : "At least two valid samples are needed for a study.",
    );
  }
  // One median search, not two: the default gap is 3 × the median by definition.
  const defaultGap = defaultMaxGapSeconds(allT);
  const median = defaultGap / 3;
  const maxGapSeconds = params.maxGapMinutes !== undefined ? params.maxGapMinutes * 60 : defaultGap;

  const periodStart = params.periodStart ? Date.parse(params.periodStart) / 1000 : allT[0];
  const periodEnd = params.periodEnd ? Date.parse(params.periodEnd) / 1000 : allT[n - 1];
  if (!(periodEnd > periodStart)) {
    throw new StudyInputError("The analysis period is empty: its end must be after its start.", [
      { path: ["params", "periodEnd"], message: "Period end must be after period start." },
    ]);
  }
  // The engine's month, year and night loops run over the period: bound it (docs/input-limits.md).
  for (const [key, value] of [["periodStart", periodStart], ["periodEnd", periodEnd]] as const) {
    if (!inTimeRange(value)) {
      const message = `The ${key === "periodStart" ? "period start" : "period end"} ${outOfRangeText(value)}.`;
      throw new StudyInputError(message, [{ path: ["params", key], message }]);
    }
  }
  const tooLong = spanProblem(periodStart, periodEnd);
  if (tooLong) throw new StudyInputError(tooLong, [{ path: ["params", "periodEnd"], message: tooLong }]);
  // Keep one sample either side of the period so intervals crossing its edges can be clipped.
  let first = upperBound(allT, periodStart) - 1;
  if (first < 0) first = 0;
  let last = lowerBound(allT, periodEnd);
  if (last >= n) last = n - 1;
  const t = allT.subarray(first, last + 1);
  const amps = allA.subarray(first, last + 1);
  // Samples inside [periodStart, periodEnd]: t ascends, so two binary searches count them.
  const samplesUsed = Math.max(0, upperBound(allT, periodEnd) - lowerBound(allT, periodStart));

  const windows = requiredWindows(schedule, location.lat, location.lon, periodStart, periodEnd);
  const gridClock = params.timeZone ? zoneClock(params.timeZone, periodStart, periodEnd) : solarClock(location.lon);
  // Months (and so the monthly table, the years and the verdict's calendar year) follow the
  // circuit's calendar when it has a zone, so they agree with the local times on the pages.
  const months = monthCalendar(periodStart, periodEnd, params.timeZone ? (t) => offsetAt(gridClock, t) : undefined);
  const monthTotalSeconds = new Float64Array(months.labels.length);
  const monthRequiredSeconds = new Float64Array(months.labels.length);
  for (let m = 0; m < months.labels.length; m++) {
    monthTotalSeconds[m] = overlap(months.starts[m], months.starts[m + 1], periodStart, periodEnd);
  }
  let m = 0;
  for (let k = 0; k < windows.length; k += 2) {
    let a = windows[k];
    const b = windows[k + 1];
    while (a < b) {
      while (months.starts[m + 1] <= a) m++;
      const cut = Math.min(b, months.starts[m + 1]);
      monthRequiredSeconds[m] += cut - a;
      a = cut;
    }
  }

  const prepared: PreparedStudy = {
    t,
    amps,
    periodStart,
    periodEnd,
    interpolation: params.interpolation,
    maxGapSeconds,
    maxGapSource: params.maxGapMinutes !== undefined ? "given" : "3 × median interval",
    medianIntervalSeconds: median,
    loadScale: params.loadScale,
    plausibilityCapA,
    samplesUsed,
    samplesAboveCap,
    schedule,
    location,
    params,
    windows,
    months,
    monthTotalSeconds,
    monthRequiredSeconds,
    knownSeconds: 0,
    gridClock,
    loadDuration: [],
    exceeded: null,
    rating: null,
    monthTemperatureC: monthTemperatures(months, params),
  };
  const span: KnownSpan = { t, amps, periodStart, periodEnd, maxGapSeconds, linear: params.interpolation === "linear" };
  const duration = loadDistribution(span, params.ratingA);
  prepared.knownSeconds = duration.knownSeconds;
  prepared.loadDuration = duration.points;
  prepared.exceeded = duration.exceeded;
  if (params.ratingA !== undefined) prepared.rating = { ratingA: params.ratingA, hoursAbove: duration.secondsAboveRating! / 3600 };
  return prepared;
}

/**
 * Each month's temperature for the cold derating (docs/computation.md "Cold-weather storage"): the
 * recorded mean of the month of that label, else the normal of its calendar month, else NaN.
 */
function monthTemperatures(months: MonthCalendar, params: StudyParams): Float64Array | null {
  const recorded = params.recordedTemperatureC;
  const normals = params.monthlyTemperatureC;
  if (!normals && !(recorded && Object.keys(recorded).length)) return null;
  return Float64Array.from(months.labels, (label) => recorded?.[label] ?? normals?.[Number(label.slice(5, 7)) - 1] ?? NaN);
}

/**
 * The calendar months touched by [startSec, endSec]. `offsetAt(t)` (local − UTC seconds at UTC
 * second t) makes them local months; without it they are UTC months.
 */
export function monthCalendar(startSec: number, endSec: number, offsetAt: (t: number) => number = () => 0): MonthCalendar {
  const starts: number[] = [];
  const labels: string[] = [];
  const years: number[] = [];
  const d = new Date((startSec + offsetAt(startSec)) * 1000);
  let y = d.getUTCFullYear();
  let mo = d.getUTCMonth();
  if (!Number.isFinite(y) || !(endSec >= startSec)) throw new StudyInputError("The analysis period is not a valid time range.");
  const monthStart = new Date(0);
  for (;;) {
    monthStart.setTime(0);
    monthStart.setUTCFullYear(y, mo, 1); // not Date.UTC, which reads years below 100 as 19xx
    // Local midnight of the 1st as a UTC second: the offset is looked up where that instant is.
    const local = monthStart.getTime() / 1000;
    const s = local - offsetAt(local - offsetAt(local));
    if (s >= endSec && starts.length > 0) {
      starts.push(s);
      break;
    }
    starts.push(s);
    labels.push(`${y}-${String(mo + 1).padStart(2, "0")}`);
    years.push(y);
    mo++;
    if (mo === 12) {
      mo = 0;
      y++;
    }
  }
  return { starts: Float64Array.from(starts), labels, years: Int32Array.from(years) };
}

/**
 * Where a calendar year of the month calendar begins and ends (UTC seconds), or null when the
 * calendar does not hold the whole year (January to December).
 */
export function calendarYearBounds(months: MonthCalendar, year: number): { start: number; end: number } | null {
  const jan = months.labels.indexOf(`${year}-01`);
  const dec = months.labels.indexOf(`${year}-12`);
  return jan < 0 || dec < 0 ? null : { start: months.starts[jan], end: months.starts[dec + 1] };
}

function overlap(a0: number, a1: number, b0: number, b1: number): number {
  return Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));
}

/** First index with t[i] ≥ x. */
export function lowerBound(t: Float64Array, x: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index with t[i] > x. */
export function upperBound(t: Float64Array, x: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
