// Data-quality report of a load profile: what was dropped and why, where the history has
// holes (unknown time, docs/computation.md), and stretches that look like a stuck sensor or a
// line out of service.
import { medianIntervalSeconds, type Phase, type ProfileSeries } from "../series";
import { MAX_EXAMPLES, type IngestExample } from "./errors";
import type { MonthCoverage } from "./known-hours";
import { MAX_SPAN_SECONDS, MAX_YEAR, MIN_YEAR } from "./time-range";

export type InvalidReason =
  | "missing"
  | "not-a-number"
  | "negative"
  | "above-cap"
  | "bad-quality"
  | "missing-timestamp"
  | "bad-timestamp"
  | "nonexistent-local-time";

export interface Stretch {
  start: string;
  end: string;
  hours: number;
}

export interface Flatline extends Stretch {
  valueA: number;
  /** The channel that stuck. */
  phase: Phase;
}

export interface PhaseQuality {
  validSamples: number;
  invalid: Partial<Record<InvalidReason, number>>;
}

export interface QualityReport {
  /** Data rows read (header, metadata, blank and comment lines excluded). */
  rowsRead: number;
  /** Timestamps kept: at least one mapped phase valid, duplicates removed. */
  validSamples: number;
  /** Rows dropped, by reason (a row is dropped when its time is bad or no phase is valid). */
  invalid: Partial<Record<InvalidReason, number>>;
  duplicates: number;
  /** Rows whose time is earlier than the row before them (the series is sorted). */
  outOfOrder: number;
  medianIntervalSeconds: number;
  gaps: { count: number; hours: number; longest: Stretch[] };
  flatlines: Flatline[];
  zeroStretches: Stretch[];
  /** Known time / (end − start). */
  coverage: number;
  /** Per UTC month (the stored report's meaning; pages show the circuit's local months, `localMonthlyCoverage`). */
  monthlyCoverage: MonthCoverage[];
  perPhase?: Partial<Record<Phase, PhaseQuality>>;
  /** How the file's power was converted to current (power units only), in words. */
  conversion?: string;
}

export interface QualityCounts {
  rowsRead: number;
  invalid: Partial<Record<InvalidReason, number>>;
  duplicates: number;
  outOfOrder: number;
  /** Invalid samples per phase at kept-or-dropped rows with a valid time. */
  perPhaseInvalid?: Partial<Record<Phase, Partial<Record<InvalidReason, number>>>>;
}

/** Words for each reason a row is dropped, in the examples of a problem. */
const PROBLEM_TEXT: Record<InvalidReason, string> = {
  missing: "no current value",
  "not-a-number": "current is not a number",
  negative: "current is negative",
  "above-cap": "current is above the plausibility cap",
  "bad-quality": "quality flag is not good",
  "missing-timestamp": "no timestamp",
  "bad-timestamp": "timestamp not readable",
  "nonexistent-local-time": "local time does not exist (skipped by the daylight-saving change)",
};

/**
 * Quality accumulation while a file streams in: rows read, rows dropped by reason (with up to
 * MAX_EXAMPLES examples of each kind), invalid samples per phase, and whether times come out of
 * order or repeated, which the report (buildQualityReport) and the storage step need.
 */
export class QualityTally {
  rowsRead = 0;
  /** Rows whose time or every current could not be read at all. */
  unreadable = 0;
  outOfOrder = 0;
  /** A time equal to the one before it (a duplicate next to its twin). */
  repeats = false;
  readonly invalid: Partial<Record<InvalidReason, number>> = {};
  readonly perPhaseInvalid: Partial<Record<Phase, Partial<Record<InvalidReason, number>>>> = {};
  readonly unreadableExamples: IngestExample[] = [];
  readonly invalidExamples: IngestExample[] = [];
  private previousTime = -Infinity;

  constructor(private readonly rowText: (row: string[]) => string) {}

  /** A dropped row. */
  dropped(reason: InvalidReason, row: string[], line: number, unreadable: boolean): void {
    this.invalid[reason] = (this.invalid[reason] ?? 0) + 1;
    const example = { line, text: this.rowText(row).slice(0, 500), problem: PROBLEM_TEXT[reason] };
    if (unreadable) {
      this.unreadable++;
      if (this.unreadableExamples.length < MAX_EXAMPLES) this.unreadableExamples.push(example);
    } else if (this.invalidExamples.length < MAX_EXAMPLES) this.invalidExamples.push(example);
  }

  /** An invalid sample of one phase at a row with a readable time. */
  phaseInvalid(phase: Phase, reason: InvalidReason): void {
    const tally = (this.perPhaseInvalid[phase] ??= {});
    tally[reason] = (tally[reason] ?? 0) + 1;
  }

  /** The time of a kept sample, in file order. */
  kept(time: number): void {
    if (time <= this.previousTime) {
      if (time < this.previousTime) this.outOfOrder++;
      else this.repeats = true;
    }
    this.previousTime = time;
  }

  counts(duplicates: number): QualityCounts {
    return { rowsRead: this.rowsRead, invalid: this.invalid, duplicates, outOfOrder: this.outOfOrder, perPhaseInvalid: this.perPhaseInvalid };
  }
}

export interface QualityOptions {
  /** Longest interval still counted as known; default 3 × the median interval. */
  maxGapSeconds?: number;
  /** Flatline: at least this many equal consecutive samples … */
  flatlineMinSamples?: number;
  /** … spanning at least this long. */
  flatlineMinHours?: number;
  /** Zero stretch: current at or below `zeroToleranceA` on every phase for at least this long. */
  zeroMinHours?: number;
  zeroToleranceA?: number;
}

export const QUALITY_DEFAULTS = {
  flatlineMinSamples: 5,
  flatlineMinHours: 2,
  zeroMinHours: 1,
  zeroToleranceA: 0,
} as const;

const LONGEST_GAPS = 10;
const iso = (t: number) => new Date(t * 1000).toISOString();

function stretch(startT: number, endT: number): Stretch {
  return { start: iso(startT), end: iso(endT), hours: (endT - startT) / 3600 };
}

export function buildQualityReport(
  series: ProfileSeries,
  counts: Partial<QualityCounts> = {},
  options: QualityOptions = {},
): QualityReport {
  const { t } = series;
  const n = t.length;
  const median = medianIntervalSeconds(t);
  // defaultMaxGapSeconds(t) is 3 × this median; computed here so the intervals are sorted once.
  const maxGap = options.maxGapSeconds ?? 3 * median;
  const flatlineMinSamples = options.flatlineMinSamples ?? QUALITY_DEFAULTS.flatlineMinSamples;
  const flatlineMinSeconds = (options.flatlineMinHours ?? QUALITY_DEFAULTS.flatlineMinHours) * 3600;
  const zeroMinSeconds = (options.zeroMinHours ?? QUALITY_DEFAULTS.zeroMinHours) * 3600;
  const zeroTolerance = options.zeroToleranceA ?? QUALITY_DEFAULTS.zeroToleranceA;
  const phases = Object.keys(series.phases) as Phase[];

  const channels = phases.map((p) => series.phases[p]!);

  // Gaps and known time in total; per month (UTC months, the stored report's meaning) below.
  const gapList: Stretch[] = [];
  let gapCount = 0;
  let gapSeconds = 0;
  let knownSeconds = 0;
  for (let i = 1; i < n; i++) {
    const a = t[i - 1];
    const b = t[i];
    const dt = b - a;
    if (dt > maxGap) {
      gapCount++;
      gapSeconds += dt;
      gapList.push(stretch(a, b));
      continue;
    }
    knownSeconds += dt;
  }
  gapList.sort((x, y) => y.hours - x.hours);
  const span = n ? t[n - 1] - t[0] : 0;

  // Stuck sensors: the same non-zero reading repeated over a long stretch, per channel.
  const flatlines: Flatline[] = [];
  for (let p = 0; p < phases.length; p++) {
    const amps = channels[p];
    let runStart = -1;
    let last = -1; // index of the previous valid sample of this phase
    for (let i = 0; i <= n; i++) {
      const v = i < n ? amps[i] : NaN;
      if (i < n && v !== v) continue;
      const continues = i < n && runStart >= 0 && v === amps[last] && t[i] - t[last] <= maxGap;
      if (continues) {
        last = i;
        continue;
      }
      if (runStart >= 0 && last - runStart + 1 >= flatlineMinSamples && t[last] - t[runStart] >= flatlineMinSeconds) {
        flatlines.push({ ...stretch(t[runStart], t[last]), valueA: amps[runStart], phase: phases[p] });
      }
      runStart = i < n && v !== 0 ? i : -1;
      last = i;
    }
  }
  flatlines.sort((x, y) => (x.start < y.start ? -1 : x.start > y.start ? 1 : 0));

  // Line out: every phase that has a reading reads zero.
  const zeroStretches: Stretch[] = [];
  let zeroStart = -1;
  let zeroLast = -1;
  for (let i = 0; i <= n; i++) {
    let zero = false;
    if (i < n) {
      let highest = -Infinity;
      for (let p = 0; p < channels.length; p++) {
        const v = channels[p][i];
        if (v > highest) highest = v; // NaN never compares greater
      }
      zero = highest !== -Infinity && highest <= zeroTolerance;
      if (zero && zeroStart >= 0 && t[i] - t[zeroLast] <= maxGap) {
        zeroLast = i;
        continue;
      }
    }
    if (zeroStart >= 0 && t[zeroLast] - t[zeroStart] >= zeroMinSeconds) zeroStretches.push(stretch(t[zeroStart], t[zeroLast]));
    zeroStart = zero ? i : -1;
    zeroLast = i;
  }

  const report: QualityReport = {
    rowsRead: counts.rowsRead ?? n,
    validSamples: n,
    invalid: { ...(counts.invalid ?? {}) },
    duplicates: counts.duplicates ?? 0,
    outOfOrder: counts.outOfOrder ?? 0,
    medianIntervalSeconds: median,
    gaps: { count: gapCount, hours: gapSeconds / 3600, longest: gapList.slice(0, LONGEST_GAPS) },
    flatlines,
    zeroStretches,
    coverage: span > 0 ? knownSeconds / span : 0,
    monthlyCoverage: monthlyCoverage(t, maxGap, monthBuckets(n ? t[0] : 0, n ? t[n - 1] : 0)),
  };
  if (phases.length > 1) {
    report.perPhase = {};
    for (const phase of phases) {
      const amps = series.phases[phase]!;
      let valid = 0;
      for (let i = 0; i < n; i++) if (amps[i] === amps[i]) valid++;
      report.perPhase[phase] = { validSamples: valid, invalid: { ...(counts.perPhaseInvalid?.[phase] ?? {}) } };
    }
  }
  return report;
}

/**
 * Known time / time of each month inside [t[0], t[n−1]], for the given month buckets (UTC months
 * from `monthBuckets`, or a circuit's local months): an interval no longer than `maxGapSeconds` is
 * known and is spread over the months it crosses.
 */
export function monthlyCoverage(t: Float64Array, maxGapSeconds: number, months: readonly MonthBucket[]): MonthCoverage[] {
  const n = t.length;
  const monthKnown = new Float64Array(months.length);
  let monthIndex = 0;
  let monthEnd = months.length ? months[0].end : Infinity;
  for (let i = 1; i < n && months.length; i++) {
    const a = t[i - 1];
    const b = t[i];
    if (b - a > maxGapSeconds) continue;
    if (b <= monthEnd) {
      monthKnown[monthIndex] += b - a;
      continue;
    }
    // The interval crosses into later months: spread it.
    let from = a;
    while (from < b) {
      while (monthIndex < months.length - 1 && from >= monthEnd) monthEnd = months[++monthIndex].end;
      const to = Math.min(b, monthEnd);
      monthKnown[monthIndex] += to - from;
      if (to === from) break; // past the last bucket: cannot happen, guards the loop
      from = to;
    }
  }
  return months.map((m, k) => {
    const overlap = Math.min(m.end, t[n - 1]) - Math.max(m.start, t[0]);
    return { month: m.month, coverage: overlap > 0 ? monthKnown[k] / overlap : 0 };
  });
}

export interface MonthBucket {
  month: string;
  start: number;
  end: number;
}

/** More months than any accepted history spans (time-range.ts): a guard, never reached by valid input. */
const MAX_MONTH_BUCKETS = (MAX_YEAR - MIN_YEAR + 2) * 12;

/**
 * UTC calendar months overlapping [from, to]. Defensive: a bound that is not a finite time
 * (NaN year) or a span beyond the accepted years yields no buckets rather than a loop that
 * never ends; the ingest refuses such times before they get here.
 */
export function monthBuckets(from: number, to: number): MonthBucket[] {
  if (!Number.isFinite(from) || !Number.isFinite(to) || !(to > from)) return [];
  if (to - from > MAX_SPAN_SECONDS + 31 * 86400) return [];
  const buckets: MonthBucket[] = [];
  const d = new Date(from * 1000);
  let year = d.getUTCFullYear();
  let month = d.getUTCMonth();
  if (!Number.isFinite(year)) return [];
  const day = new Date(0);
  const monthStart = (y: number, m: number) => {
    day.setTime(0);
    day.setUTCFullYear(y, m, 1); // not Date.UTC, which reads years below 100 as 19xx
    return day.getTime() / 1000;
  };
  while (buckets.length < MAX_MONTH_BUCKETS) {
    const start = monthStart(year, month);
    if (!(start < to)) break;
    const end = monthStart(year, month + 1);
    buckets.push({ month: `${String(year).padStart(4, "0")}-${String(month + 1).padStart(2, "0")}`, start, end });
    month++;
    if (month === 12) {
      month = 0;
      year++;
    }
  }
  return buckets;
}
