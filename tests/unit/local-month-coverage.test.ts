import { describe, expect, it } from "vitest";
import { buildQualityReport } from "../../lib/ingest/quality";
import { localMonthBuckets, localMonthlyCoverage } from "../../lib/engine/local-months";
import { defaultMaxGapSeconds } from "../../lib/series";

const HOUR = 3600;
const at = (iso: string) => Date.parse(iso) / 1000;

describe("coverage by month of the circuit's calendar", () => {
  // Hourly samples 31 Jan 2024 12:00 UTC → 1 Feb 12:00 UTC with 20:00–22:00 missing: a 4 h hole
  // (19:00 → 23:00 UTC), longer than 3 × the 1 h median interval, so unknown.
  const times: number[] = [];
  for (let k = 0; k <= 24; k++) if (k < 8 || k > 10) times.push(at("2024-01-31T12:00:00Z") + k * HOUR);
  const t = Float64Array.from(times);
  const maxGap = defaultMaxGapSeconds(t);

  it("UTC months (the stored report): January 12 h of span with 8 h known, February fully known", () => {
    const utc = buildQualityReport({ t, phases: { A: Float32Array.from(times, () => 100) } }).monthlyCoverage;
    // Worked by hand: known 12:00–19:00 (7 h) and 23:00–24:00 (1 h) of 12:00–24:00.
    expect(utc.map((m) => m.month)).toEqual(["2024-01", "2024-02"]);
    expect(utc[0].coverage).toBeCloseTo(8 / 12, 12);
    expect(utc[1].coverage).toBeCloseTo(1, 12);
    expect(localMonthlyCoverage(t, maxGap, "UTC")).toEqual(utc);
  });

  it("Berlin months (UTC+1 in winter): February begins at 23:00 UTC on 31 January", () => {
    const berlin = localMonthlyCoverage(t, maxGap, "Europe/Berlin");
    // Worked by hand: January is 12:00–23:00 UTC (11 h) with 7 h known; February 23:00–12:00 (13 h), all known.
    expect(berlin.map((m) => m.month)).toEqual(["2024-01", "2024-02"]);
    expect(berlin[0].coverage).toBeCloseTo(7 / 11, 12);
    expect(berlin[1].coverage).toBeCloseTo(1, 12);
  });

  it("a zone west of UTC moves a month boundary the other way; too few samples give no months", () => {
    // New York (UTC−5): local February begins 1 Feb 05:00 UTC; January is 12:00 → 05:00 (17 h), 7 + 6 known.
    const ny = localMonthlyCoverage(t, maxGap, "America/New_York");
    expect(ny[0].coverage).toBeCloseTo(13 / 17, 12);
    expect(ny[1].coverage).toBeCloseTo(1, 12);
    expect(localMonthlyCoverage(Float64Array.of(at("2024-01-31T12:00:00Z")), maxGap, "Europe/Berlin")).toEqual([]);
  });

  it("local month buckets follow daylight saving: Berlin's April begins at 22:00 UTC on 31 March", () => {
    const buckets = localMonthBuckets(at("2024-03-15T00:00:00Z"), at("2024-04-15T00:00:00Z"), "Europe/Berlin");
    expect(buckets.map((b) => b.month)).toEqual(["2024-03", "2024-04"]);
    expect(new Date(buckets[0].end * 1000).toISOString()).toBe("2024-03-31T22:00:00.000Z");
  });
});
