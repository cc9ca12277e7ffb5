import { describe, expect, it } from "vitest";
import { DEMO_PROFILES, generateLoadCsv, mulberry32 } from "../../lib/demo/load-generator";
import { ingestCsvText } from "../../lib/ingest/ingest";
import { selectPhase } from "../../lib/series";

const profile = (key: string) => DEMO_PROFILES.find((p) => p.key === key)!;
const generated = new Map(DEMO_PROFILES.map((p) => [p.key, generateLoadCsv(p.spec)]));
const ingested = new Map(DEMO_PROFILES.map((p) => [p.key, ingestCsvText(generated.get(p.key)!, p.mapping)]));

/** Smallest valid current (any phase) during 22:00–04:00 UTC in the given UTC months (0-based). */
function nightMinimum(key: string, months: number[]): number {
  const s = selectPhase(ingested.get(key)!.series, "min");
  let lowest = Infinity;
  for (let i = 0; i < s.t.length; i++) {
    const d = new Date(s.t[i] * 1000);
    const h = d.getUTCHours();
    if ((h >= 22 || h < 4) && months.includes(d.getUTCMonth()) && s.amps[i] > 0) lowest = Math.min(lowest, s.amps[i]);
  }
  return lowest;
}

describe("demo load generator", () => {
  it("is deterministic for a seed and differs between seeds", () => {
    const spec = { ...profile("saltbrook-115").spec, days: 3 };
    expect(generateLoadCsv(spec)).toBe(generateLoadCsv(spec));
    expect(generateLoadCsv({ ...spec, seed: 2 })).not.toBe(generateLoadCsv(spec));
    const r = mulberry32(7);
    const draws = Array.from({ length: 1000 }, r);
    expect(Math.min(...draws)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...draws)).toBeLessThan(1);
  });

  it("writes a historian-style export of at most about 3 MB per profile", () => {
    for (const p of DEMO_PROFILES) {
      const text = generated.get(p.key)!;
      expect(text.length).toBeLessThanOrEqual(3_000_000);
      expect(text.startsWith("# ")).toBe(true);
      expect(text).toContain("\nTimestamp,IA [A],IB [A],IC [A],Quality\n");
    }
  });

  it("the healthy 138 kV crossing: a year of 15-minute data, night load well above 40 A all year", () => {
    const r = ingested.get("glimmerford-138")!;
    expect(r.quality.medianIntervalSeconds).toBe(900);
    expect(r.quality.monthlyCoverage).toHaveLength(12);
    expect(nightMinimum("glimmerford-138", [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11])).toBeGreaterThan(80);
    // The invented defects show up in the quality report.
    expect(r.quality.gaps.count).toBe(2);
    expect(r.quality.zeroStretches).toHaveLength(1);
    expect(r.quality.zeroStretches[0].hours).toBeGreaterThanOrEqual(2.5);
    expect(r.quality.flatlines.length).toBeGreaterThanOrEqual(1);
    expect(r.quality.flatlines.every((f) => f.hours >= 2 && f.start.startsWith("2024-05-30"))).toBe(true);
  });

  it("the 69 kV crossing's night load falls below 40 A in spring only", () => {
    for (const spring of [2, 3, 4]) expect(nightMinimum("hollowmere-69", [spring])).toBeLessThan(40); // March–May
    expect(nightMinimum("hollowmere-69", [0, 1, 5, 6, 7, 8, 9, 10, 11])).toBeGreaterThan(40);
  });

  it("the short history covers only 60 days", () => {
    const r = ingested.get("saltbrook-115")!;
    const days = (Date.parse(r.end) - Date.parse(r.start)) / 86_400_000;
    expect(days).toBeGreaterThan(59);
    expect(days).toBeLessThan(60);
  });
});
