// Data for the current-over-time chart (the study page): min and max current per time bucket, the
// unknown stretches to shade and the required windows, for any zoom (a year, a month, a week).
import { defaultMaxGapSeconds, type Series } from "../series";
import type { Location, Schedule } from "../../shared/study-schemas";
import { lowerBound, upperBound } from "./prepare";
import { requiredWindows } from "./sun";

export interface ChartRange {
  /** Epoch seconds. */
  start: number;
  end: number;
  /** Number of time buckets (e.g. the chart's width in pixels / 2); default 500. */
  buckets?: number;
  /** Longer gaps between samples are unknown; default 3 × the median interval of the whole series. */
  maxGapSeconds?: number;
  /** With both, the required windows in the range are included. */
  schedule?: Schedule;
  location?: Location;
}

export interface ChartData {
  start: string;
  end: string;
  bucketSeconds: number;
  /** One entry per bucket; null where the bucket holds no sample. */
  points: { t: string; minA: number | null; maxA: number | null }[];
  unknown: { start: string; end: string }[];
  required: { start: string; end: string }[];
}

const iso = (sec: number) => new Date(sec * 1000).toISOString();

export function decimateForChart(series: Series, range: ChartRange): ChartData {
  const { t, amps } = series;
  const start = range.start;
  const end = range.end > range.start ? range.end : range.start + 1;
  const buckets = Math.max(1, Math.floor(range.buckets ?? 500));
  const width = (end - start) / buckets;
  const mins = new Float64Array(buckets).fill(Infinity);
  const maxs = new Float64Array(buckets).fill(-Infinity);
  const first = lowerBound(t, start);
  const last = upperBound(t, end); // exclusive
  for (let i = first; i < last; i++) {
    const k = Math.min(buckets - 1, Math.floor((t[i] - start) / width));
    const a = amps[i];
    if (a < mins[k]) mins[k] = a;
    if (a > maxs[k]) maxs[k] = a;
  }
  const points: ChartData["points"] = [];
  for (let k = 0; k < buckets; k++) {
    const has = mins[k] !== Infinity;
    points.push({ t: iso(start + k * width), minA: has ? mins[k] : null, maxA: has ? maxs[k] : null });
  }

  const maxGap = range.maxGapSeconds ?? defaultMaxGapSeconds(t);
  const unknown: ChartData["unknown"] = [];
  // Before the first sample in range, the interval from the previous sample counts too.
  const from = Math.max(0, first - 1);
  const to = Math.min(t.length - 1, last);
  if (t.length === 0 || t[0] > end || t[t.length - 1] < start) {
    unknown.push({ start: iso(start), end: iso(end) });
  } else {
    if (t[0] > start) unknown.push({ start: iso(start), end: iso(t[0]) });
    for (let i = from; i < to; i++) {
      if (t[i + 1] - t[i] > maxGap) {
        const a = Math.max(start, t[i]);
        const b = Math.min(end, t[i + 1]);
        if (b > a) unknown.push({ start: iso(a), end: iso(b) });
      }
    }
    if (t[t.length - 1] < end) unknown.push({ start: iso(t[t.length - 1]), end: iso(end) });
  }

  const required: ChartData["required"] = [];
  if (range.schedule && range.location) {
    const w = requiredWindows(range.schedule, range.location.lat, range.location.lon, start, end);
    for (let k = 0; k < w.length; k += 2) required.push({ start: iso(w[k]), end: iso(w[k + 1]) });
  }
  return { start: iso(start), end: iso(end), bucketSeconds: width, points, unknown, required };
}
