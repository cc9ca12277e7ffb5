import { describe, expect, it } from "vitest";
import { buildQualityReport } from "../../lib/ingest/quality";
import { defaultMaxGapSeconds, type ProfileSeries } from "../../lib/series";

const T0 = Date.UTC(2024, 0, 31, 0, 0) / 1000; // 31 January 2024, so months are crossed

function series(times: number[], values: number[] | Record<string, number[]>): ProfileSeries {
  const phases = Array.isArray(values) ? { A: values } : values;
  return {
    t: Float64Array.from(times),
    phases: Object.fromEntries(Object.entries(phases).map(([k, v]) => [k, Float32Array.from(v)])),
  };
}

describe("gaps and coverage", () => {
  // 15-minute samples for 48 h with two holes: 2 h (8 samples missing) and 5 h (20 missing).
  const times: number[] = [];
  for (let k = 0; k <= 192; k++) if (!(k > 40 && k < 49) && !(k > 100 && k < 121)) times.push(T0 + k * 900);
  const s = series(times, times.map(() => 100));
  const r = buildQualityReport(s);

  it("counts intervals longer than 3 × the median interval and sums their hours", () => {
    expect(r.medianIntervalSeconds).toBe(900);
    expect(r.gaps.count).toBe(2);
    expect(r.gaps.hours).toBe(2.25 + 5.25);
    expect(r.gaps.longest.map((g) => g.hours)).toEqual([5.25, 2.25]);
    expect(r.gaps.longest[1].start).toBe(new Date((T0 + 40 * 900) * 1000).toISOString());
  });

  it("coverage = known time / (end − start), overall and per UTC month", () => {
    expect(r.coverage).toBeCloseTo((48 - 7.5) / 48, 12);
    expect(r.monthlyCoverage.map((m) => m.month)).toEqual(["2024-01", "2024-02"]);
    expect(r.monthlyCoverage[0].coverage).toBeCloseTo((24 - 2.25) / 24, 12); // 31 Jan: the 2 h hole
    expect(r.monthlyCoverage[1].coverage).toBeCloseTo((24 - 5.25) / 24, 12); // 1 Feb: the 5 h hole
  });

  it("uses the same default max gap as lib/series, and a given one when set", () => {
    expect(defaultMaxGapSeconds(s.t)).toBe(2700);
    const wide = buildQualityReport(s, {}, { maxGapSeconds: 3 * 3600 });
    expect(wide.gaps.count).toBe(1);
    expect(wide.coverage).toBeCloseTo((48 - 5.25) / 48, 12);
  });

  it("passes counts through", () => {
    const c = buildQualityReport(s, { rowsRead: 200, invalid: { negative: 3 }, duplicates: 2, outOfOrder: 1 });
    expect(c).toMatchObject({ rowsRead: 200, validSamples: times.length, invalid: { negative: 3 }, duplicates: 2, outOfOrder: 1 });
  });
});

describe("flatlines and zero stretches", () => {
  const times = Array.from({ length: 40 }, (_, k) => T0 + k * 900);

  it("a non-zero value repeated over 2 h or more is a flatline (stuck sensor)", () => {
    const values = times.map((_, k) => (k >= 10 && k <= 19 ? 123.5 : 100 + k)); // 10 samples, 2.25 h
    const r = buildQualityReport(series(times, values));
    expect(r.flatlines).toEqual([
      { start: new Date((T0 + 10 * 900) * 1000).toISOString(), end: new Date((T0 + 19 * 900) * 1000).toISOString(), hours: 2.25, valueA: 123.5, phase: "A" },
    ]);
  });

  it("a repeat shorter than 2 h is not a flatline; zero repeats are not flatlines", () => {
    const short = times.map((_, k) => (k >= 10 && k <= 17 ? 50 : 100 + k)); // 8 samples, 1.75 h
    expect(buildQualityReport(series(times, short)).flatlines).toEqual([]);
    const zeros = times.map((_, k) => (k >= 10 && k <= 30 ? 0 : 100 + k));
    expect(buildQualityReport(series(times, zeros)).flatlines).toEqual([]);
  });

  it("current 0 on every phase for 1 h or more is a zero stretch; one live phase is not", () => {
    const a = times.map((_, k) => (k >= 5 && k <= 9 ? 0 : 100)); // 5 samples, exactly 1 h
    const b = times.map((_, k) => (k >= 5 && k <= 9 ? 0 : 90));
    const r = buildQualityReport(series(times, { A: a, B: b }));
    expect(r.zeroStretches).toEqual([
      { start: new Date((T0 + 5 * 900) * 1000).toISOString(), end: new Date((T0 + 9 * 900) * 1000).toISOString(), hours: 1 },
    ]);
    const live = times.map(() => 80);
    expect(buildQualityReport(series(times, { A: a, B: live })).zeroStretches).toEqual([]);
    const shortZero = times.map((_, k) => (k >= 5 && k <= 8 ? 0 : 100)); // 0.75 h
    expect(buildQualityReport(series(times, shortZero)).zeroStretches).toEqual([]);
  });

  it("a gap splits a zero stretch (unknown time is never zero current)", () => {
    const gapped = times.filter((_, k) => k !== 7);
    const values = gapped.map((t) => (t >= T0 + 2 * 900 && t <= T0 + 12 * 900 ? 0 : 100));
    const r = buildQualityReport(series(gapped, values), {}, { maxGapSeconds: 900 });
    expect(r.zeroStretches.map((z) => z.hours)).toEqual([1, 1]);
    const whole = times.map((t) => (t >= T0 + 2 * 900 && t <= T0 + 12 * 900 ? 0 : 100));
    expect(buildQualityReport(series(times, whole)).zeroStretches.map((z) => z.hours)).toEqual([2.5]);
  });

  it("reports per-phase valid counts for several phases", () => {
    const r = buildQualityReport(series(times.slice(0, 3), { A: [1, NaN, 3], B: [1, 2, 3] }), { perPhaseInvalid: { A: { missing: 1 } } });
    expect(r.perPhase).toEqual({ A: { validSamples: 2, invalid: { missing: 1 } }, B: { validSamples: 3, invalid: {} } });
  });
});
