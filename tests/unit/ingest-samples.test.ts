import { describe, expect, it } from "vitest";
import { ingestSamples } from "../../lib/ingest/samples";

describe("JSON samples get the same cleaning rules as a CSV (docs/computation.md Samples)", () => {
  it("drops and counts invalid values, keeps the first duplicate, sorts and counts out-of-order rows", () => {
    const r = ingestSamples([
      ["2025-01-01T00:10:00Z", 30],
      ["2025-01-01T00:00:00Z", 10],
      ["2025-01-01T00:05:00Z", 20],
      ["2025-01-01T00:05:00Z", 99], // duplicate: first kept
      ["2025-01-01T00:15:00Z", null],
      ["2025-01-01T00:20:00Z", -1],
      ["2025-01-01T00:25:00Z", 5000],
      ["not a time", 1],
      ["2025-01-01T00:30:00Z", 40],
    ], { plausibilityCapA: 1000 });
    expect(Array.from(r.series.t)).toEqual([0, 300, 600, 1800].map((s) => Date.UTC(2025, 0, 1) / 1000 + s));
    expect(Array.from(r.series.phases.A!)).toEqual([10, 20, 30, 40]);
    expect(r.quality.invalid).toEqual({ missing: 1, negative: 1, "above-cap": 1, "bad-timestamp": 1 });
    expect(r.quality.duplicates).toBe(1);
    expect(r.quality.outOfOrder).toBe(1);
    expect(r.quality.rowsRead).toBe(9);
    expect(r.quality.validSamples).toBe(4);
  });
});
