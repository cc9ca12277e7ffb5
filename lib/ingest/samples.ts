// Samples sent as JSON ([time, amps] pairs, e.g. by the feasibility API) get the same
// cleaning rules as a CSV upload (docs/computation.md "Samples"): invalid values dropped and
// counted, duplicates keep the first, unsorted input sorted and counted.
import type { ProfileSeries } from "../series";
import { IngestError } from "./errors";
import { buildQualityReport, type InvalidReason, type QualityReport } from "./quality";
import { inTimeRange, outOfRangeText, spanProblem } from "./time-range";

export interface SampleIngest {
  series: ProfileSeries;
  quality: QualityReport;
}

export function ingestSamples(samples: readonly (readonly [string, number | null])[], options: { plausibilityCapA?: number; maxGapSeconds?: number } = {}): SampleIngest {
  const cap = options.plausibilityCapA ?? Infinity;
  const invalid: Partial<Record<InvalidReason, number>> = {};
  const count = (reason: InvalidReason) => (invalid[reason] = (invalid[reason] ?? 0) + 1);
  const rows: { t: number; a: number; order: number }[] = [];
  let outOfOrder = 0;
  let previous = -Infinity;
  samples.forEach(([time, amps], order) => {
    const t = Date.parse(time) / 1000;
    if (!Number.isFinite(t)) return void count("bad-timestamp");
    if (!inTimeRange(t)) {
      const why = outOfRangeText(t);
      throw new IngestError(422, "Timestamp out of range", `samples[${order}]: ${String(time).slice(0, 40)} ${why}.`, [{ line: order + 1, text: String(time).slice(0, 60), problem: `timestamp ${why}` }], `samples.${order}.0`);
    }
    if (t < previous) outOfOrder++;
    previous = t;
    if (amps === null || amps === undefined) return void count("missing");
    if (!Number.isFinite(amps)) return void count("not-a-number");
    if (amps < 0) return void count("negative");
    if (amps > cap) return void count("above-cap");
    rows.push({ t, a: amps, order });
  });
  // Stable by time, then file order: the first of equal timestamps is the one kept.
  rows.sort((x, y) => x.t - y.t || x.order - y.order);
  const t = new Float64Array(rows.length);
  const a = new Float32Array(rows.length);
  let n = 0;
  let duplicates = 0;
  for (const r of rows) {
    if (n > 0 && t[n - 1] === r.t) {
      duplicates++;
      continue;
    }
    t[n] = r.t;
    a[n] = r.a;
    n++;
  }
  const tooLong = n ? spanProblem(t[0], t[n - 1]) : null;
  if (tooLong) throw new IngestError(422, "Period too long", tooLong, [], "samples");
  const series: ProfileSeries = { t: t.slice(0, n), phases: { A: a.slice(0, n) } };
  const quality = buildQualityReport(series, { rowsRead: samples.length, invalid, duplicates, outOfOrder }, { maxGapSeconds: options.maxGapSeconds });
  return { series, quality };
}
