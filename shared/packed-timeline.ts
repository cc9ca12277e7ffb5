// The current-over-time chart's buckets as they travel to the page: two comma-separated strings
// (lowest and highest current per bucket) and the first bucket's time and the step, instead of
// an object with an ISO time per bucket. The page's data is encoded for hydration value by value,
// so 500 buckets × 3 values cost more to send than the rest of a study page together; two strings
// cost two values. Currents are rounded to 0.01 A (the chart shows 0.1 A).
import type { ChartData } from "../lib/engine/timeline";

export interface PackedTimeline {
  start: string;
  end: string;
  bucketSeconds: number;
  /** Bucket k starts at firstMs + k × stepMs (epoch ms). */
  firstMs: number;
  stepMs: number;
  buckets: number;
  /** Lowest / highest current per bucket in A, comma-separated; empty where the bucket holds no sample. */
  minA: string;
  maxA: string;
  unknown: { start: string; end: string }[];
  required: { start: string; end: string }[];
}

export interface TimelinePoint {
  t: number;
  minA: number | null;
  maxA: number | null;
}

const packValue = (a: number | null) => (a === null ? "" : String(Math.round(a * 100) / 100));
const unpackValue = (s: string) => (s === "" ? null : Number(s));

export function packTimeline(chart: ChartData): PackedTimeline {
  const { points, unknown, required, start, end, bucketSeconds } = chart;
  return {
    start,
    end,
    bucketSeconds,
    firstMs: Date.parse(start),
    stepMs: bucketSeconds * 1000,
    buckets: points.length,
    minA: points.map((p) => packValue(p.minA)).join(","),
    maxA: points.map((p) => packValue(p.maxA)).join(","),
    unknown,
    required,
  };
}

/** The buckets back, with their start times in epoch ms. */
export function unpackTimeline(packed: Pick<PackedTimeline, "firstMs" | "stepMs" | "buckets" | "minA" | "maxA">): TimelinePoint[] {
  const mins = packed.buckets > 0 ? packed.minA.split(",") : [];
  const maxs = packed.buckets > 0 ? packed.maxA.split(",") : [];
  return mins.map((m, k) => ({ t: Math.floor(packed.firstMs + k * packed.stepMs), minA: unpackValue(m), maxA: unpackValue(maxs[k]) }));
}
