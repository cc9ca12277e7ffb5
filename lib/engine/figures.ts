// Turns a simulation's raw totals into the JSON result of docs/computation.md "Results":
// whole-period, monthly and yearly figures, the hour × month grid, the worst week of storage,
// the annualised figures and the verdict. Plain numbers, strings and arrays only.
import type { PeriodFigures, StudyResult } from "../../shared/study-schemas";
import { calendarYearBounds, lowerBound, upperBound, type PreparedStudy, type StudyContext } from "./prepare";
import type { SimulationTotals } from "./simulate";
import { studyVerdict, type YearFigures } from "./verdict";
import { nightCalendar } from "./nights";

/**
 * 2: exceeded-p currents, hours above the circuit rating, required unknown hours per period.
 * 3: months and years by the circuit's local calendar when the study has a time zone.
 */
export const ENGINE_VERSION = 3;
const HOUR_S = 3600;
const DAY_S = 86_400;
const TOP_STRETCHES = 50;
const WORST_WEEK_POINTS = 500;

const iso = (sec: number) => new Date(sec * 1000).toISOString();

/** Sum of months [from, to) into one set of figures. */
function figuresFor(p: PreparedStudy, s: SimulationTotals, from: number, to: number): PeriodFigures {
  let total = 0, known = 0, above = 0, aboveMax = 0, required = 0, requiredKnown = 0, lit = 0, dark = 0;
  let longest = 0, events = 0, reportable = 0;
  for (let m = from; m < to; m++) {
    total += p.monthTotalSeconds[m];
    known += s.known[m];
    above += s.atOrAboveMin[m];
    aboveMax += s.aboveMax[m];
    required += p.monthRequiredSeconds[m];
    requiredKnown += s.requiredKnown[m];
    lit += s.lit[m];
    dark += s.dark[m];
    if (s.longestDark[m] > longest) longest = s.longestDark[m];
    events += s.darkEvents[m];
    reportable += s.reportable[m];
  }
  return {
    totalHours: total / HOUR_S,
    knownHours: known / HOUR_S,
    unknownHours: Math.max(0, total - known) / HOUR_S,
    coverage: total > 0 ? known / total : null,
    hoursAtOrAboveMin: above / HOUR_S,
    hoursBelowMin: Math.max(0, known - above) / HOUR_S,
    hoursAboveMax: aboveMax / HOUR_S,
    requiredHours: required / HOUR_S,
    requiredKnownHours: requiredKnown / HOUR_S,
    requiredUnknownHours: Math.max(0, required - requiredKnown) / HOUR_S,
    litHours: lit / HOUR_S,
    darkHours: dark / HOUR_S,
    availability: requiredKnown > 0 ? Math.min(1, lit / requiredKnown) : null,
    longestDarkStretchHours: longest / HOUR_S,
    darkEvents: events,
    reportableOutages: reportable,
  };
}

export interface FigureSet {
  whole: PeriodFigures;
  monthly: (PeriodFigures & { month: string })[];
  yearly: (PeriodFigures & { year: number; complete: boolean })[];
}

export function figureSet(p: PreparedStudy, s: SimulationTotals): FigureSet {
  const M = p.months.labels.length;
  const whole = figuresFor(p, s, 0, M);
  const monthly = p.months.labels.map((month, m) => ({ month, ...figuresFor(p, s, m, m + 1) }));
  const yearly: FigureSet["yearly"] = [];
  let from = 0;
  while (from < M) {
    const year = p.months.years[from];
    let to = from;
    while (to < M && p.months.years[to] === year) to++;
    const bounds = calendarYearBounds(p.months, year);
    const complete = bounds !== null && p.periodStart <= bounds.start && p.periodEnd >= bounds.end;
    yearly.push({ year, complete, ...figuresFor(p, s, from, to) });
    from = to;
  }
  return { whole, monthly, yearly };
}

/** The verdict alone (what the solvers need). */
export function verdictOf(context: StudyContext, s: SimulationTotals) {
  const { whole, yearly } = figureSet(context.prepared, s);
  return studyVerdict(whole, yearly as YearFigures[], { start: context.prepared.periodStart, end: context.prepared.periodEnd }, context.policy, (year) => calendarYearBounds(context.prepared.months, year));
}

export function buildStudyResult(context: StudyContext, s: SimulationTotals): StudyResult {
  const p = context.prepared;
  const dev = context.device.device;
  const { whole, monthly, yearly } = figureSet(p, s);
  const verdict = studyVerdict(whole, yearly, { start: p.periodStart, end: p.periodEnd }, context.policy, (year) => calendarYearBounds(p.months, year));

  const stretchCount = s.stretches.length / 2;
  const order = Array.from({ length: stretchCount }, (_, i) => i);
  order.sort((a, b) => s.stretches[2 * b + 1] - s.stretches[2 * b] - (s.stretches[2 * a + 1] - s.stretches[2 * a]) || a - b);
  const darkStretches = order.slice(0, TOP_STRETCHES).map((i) => ({
    start: iso(s.stretches[2 * i]),
    end: iso(s.stretches[2 * i + 1]),
    hours: (s.stretches[2 * i + 1] - s.stretches[2 * i]) / HOUR_S,
  }));

  const share: (number | null)[][] = [];
  for (let h = 0; h < 24; h++) {
    const row: (number | null)[] = [];
    for (let mo = 0; mo < 12; mo++) {
      const k = s.cellKnown[mo * 24 + h];
      row.push(k > 0 ? s.cellBelowMin[mo * 24 + h] / k : null);
    }
    share.push(row);
  }
  const timeBasis = p.gridClock.basis;

  const totalHours = whole.totalHours;
  const isWholeYear = totalHours >= 365 * 24 - 24 && totalHours <= 366 * 24 + 24;
  const annualised =
    !isWholeYear && whole.knownHours > 0
      ? {
          label: `Scaled to one year: × 8760 / ${whole.knownHours.toFixed(1)} known hours (the period is ${(totalHours / 24).toFixed(1)} days, not a whole year)`,
          factor: 8760 / whole.knownHours,
          darkHours: (whole.darkHours * 8760) / whole.knownHours,
          darkEvents: (whole.darkEvents * 8760) / whole.knownHours,
          reportableOutages: (whole.reportableOutages * 8760) / whole.knownHours,
          hoursBelowMin: (whole.hoursBelowMin * 8760) / whole.knownHours,
        }
      : null;

  return {
    engineVersion: ENGINE_VERSION,
    settings: {
      interpolation: p.interpolation,
      maxGapSeconds: p.maxGapSeconds,
      maxGapSource: p.maxGapSource,
      medianIntervalSeconds: p.medianIntervalSeconds,
      loadScale: p.loadScale,
      plausibilityCapA: p.plausibilityCapA,
      samplesUsed: p.samplesUsed,
      samplesAboveCap: p.samplesAboveCap,
      schedule: p.schedule,
      location: p.location,
    },
    period: {
      start: iso(p.periodStart),
      end: iso(p.periodEnd),
      totalHours: whole.totalHours,
      knownHours: whole.knownHours,
      unknownHours: whole.unknownHours,
      coverage: whole.coverage,
    },
    current: {
      hoursAtOrAboveMin: whole.hoursAtOrAboveMin,
      hoursBelowMin: whole.hoursBelowMin,
      hoursAboveMax: whole.hoursAboveMax,
      exceeded: p.exceeded,
      rating: p.rating,
    },
    lighting: {
      requiredHours: whole.requiredHours,
      requiredKnownHours: whole.requiredKnownHours,
      litHours: whole.litHours,
      darkHours: whole.darkHours,
      availability: whole.availability,
      longestDarkStretchHours: whole.longestDarkStretchHours,
      darkEvents: whole.darkEvents,
      reportableOutages: whole.reportableOutages,
      darkStretches,
    },
    monthly,
    yearly,
    hourMonthBelowMin: { timeBasis, share },
    loadDuration: p.loadDuration,
    storage: dev.storageWh > 0 ? storageSummary(p, s, dev.storageWh) : null,
    annualised,
    verdict,
    // Nights run noon to noon in local mean solar time (longitude / 15 h), whatever the grid clock.
    nights: nightCalendar({ ...p, solarOffsetSeconds: p.location.lon * 240, stretches: s.stretches }),
  };
}

/**
 * The worst week: the 7 days (from one day before a dark stretch starts) holding the most dark
 * hours; when nothing goes dark, the 7 days around the lowest charge (5 days before, 2 after).
 */
function storageSummary(p: PreparedStudy, s: SimulationTotals, storageWh: number): NonNullable<StudyResult["storage"]> {
  let start: number;
  let basis: string;
  const st = s.stretches;
  if (st.length > 0) {
    const count = st.length / 2;
    // prefix[k] = total length of stretches 0..k−1; stretches are disjoint and in order, so only the
    // last one a window reaches can stick out of it.
    const prefix = new Float64Array(count + 1);
    for (let k = 0; k < count; k++) prefix[k + 1] = prefix[k] + st[2 * k + 1] - st[2 * k];
    let best = -1;
    let bestStart = st[0] - DAY_S;
    let j = 0; // first stretch starting at or after the window end
    for (let i = 0; i < count; i++) {
      const ws = st[2 * i] - DAY_S;
      const we = ws + 7 * DAY_S;
      if (j < i + 1) j = i + 1;
      while (j < count && st[2 * j] < we) j++;
      const last = j - 1;
      const sum = prefix[last] - prefix[i] + Math.min(st[2 * last + 1], we) - st[2 * last];
      if (sum > best) {
        best = sum;
        bestStart = ws;
      }
    }
    start = bestStart;
    basis = `The 7 days with the most dark hours (${(best / HOUR_S).toFixed(1)} h)`;
  } else {
    start = s.minChargeAt - 5 * DAY_S;
    basis = "The 7 days around the lowest storage charge (no dark time)";
  }
  start = Math.max(p.periodStart, Math.min(start, p.periodEnd - 7 * DAY_S));
  const end = Math.min(p.periodEnd, start + 7 * DAY_S);
  return {
    storageWh,
    minChargeWh: s.minChargeWh,
    minChargeAt: Number.isFinite(s.minChargeAt) ? iso(s.minChargeAt) : null,
    worstWeek: { start: iso(start), end: iso(end), basis, points: chargePoints(p, s, start, end) },
  };
}

/** Storage charge at the sample times in [start, end], thinned to at most ~500 points (min and max per bucket). */
function chargePoints(p: PreparedStudy, s: SimulationTotals, start: number, end: number) {
  const trace = s.chargeTrace;
  const points: { t: string; chargeWh: number }[] = [];
  if (!trace) return points;
  const buckets = WORST_WEEK_POINTS / 2;
  const width = (end - start) / buckets;
  let bucket = -1;
  let lo = -1;
  let hi = -1;
  const flush = () => {
    if (lo < 0) return;
    const [a, b] = lo < hi ? [lo, hi] : [hi, lo];
    points.push({ t: iso(p.t[a]), chargeWh: trace[a] });
    if (b !== a) points.push({ t: iso(p.t[b]), chargeWh: trace[b] });
  };
  // Only the samples in [start, end] (t ascends): binary search rather than a pass over the year.
  const last = upperBound(p.t, end);
  for (let i = lowerBound(p.t, start); i < last; i++) {
    const t = p.t[i];
    if (Number.isNaN(trace[i])) continue;
    const k = Math.min(buckets - 1, Math.floor((t - start) / width));
    if (k !== bucket) {
      flush();
      bucket = k;
      lo = hi = i;
    } else {
      if (trace[i] < trace[lo]) lo = i;
      if (trace[i] > trace[hi]) hi = i;
    }
  }
  flush();
  return points;
}
