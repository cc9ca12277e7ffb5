// Coverage by month of the circuit's local calendar (docs/computation.md "Local time"): the
// stored quality report counts UTC months; pages that show months count them as the study engine
// does, by the circuit's clock (monthCalendar over the zone's offsets).
import { monthlyCoverage, type MonthBucket } from "../ingest/quality";
import type { MonthCoverage } from "../ingest/known-hours";
import { offsetAt, zoneClock } from "./clock";
import { monthCalendar } from "./prepare";

/** The local calendar months of `zone` touched by [startSec, endSec], as buckets of UTC seconds. */
export function localMonthBuckets(startSec: number, endSec: number, zone: string): MonthBucket[] {
  if (!(endSec > startSec)) return [];
  const clock = zoneClock(zone, startSec, endSec);
  const months = monthCalendar(startSec, endSec, (t) => offsetAt(clock, t));
  return months.labels.map((month, k) => ({ month, start: months.starts[k], end: months.starts[k + 1] }));
}

/** Known time / time of each local month of `zone` inside the samples' span (`monthlyCoverage` on local months). */
export function localMonthlyCoverage(t: Float64Array, maxGapSeconds: number, zone: string): MonthCoverage[] {
  const n = t.length;
  return n < 2 ? [] : monthlyCoverage(t, maxGapSeconds, localMonthBuckets(t[0], t[n - 1], zone));
}
