// The load-duration curve, the exceeded-p currents and the hours above a rating
// (lib/engine/load-duration.ts), and the monthly lit + dark + unknown = required identity.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { Series } from "../../lib/series";
import { runStudy } from "../../lib/engine/simulate";
import { exceededCurrent, exceededFromCurve, secondsAbove, type KnownSpan } from "../../lib/engine/load-duration";
import { studyResultSchema } from "../../shared/study-schemas";

const DAY = 86_400;
const T0 = Date.UTC(2025, 0, 6) / 1000;

function series(n: number, stepSeconds: number, amps: (t: number, i: number) => number): Series {
  const t = new Float64Array(n);
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = T0 + i * stepSeconds;
    a[i] = amps(t[i] - T0, i);
  }
  return { t, amps: a };
}

function span(s: Series, linear = true): KnownSpan {
  return { t: s.t, amps: s.amps, periodStart: s.t[0], periodEnd: s.t[s.t.length - 1], maxGapSeconds: 3 * (s.t[1] - s.t[0]), linear };
}

const device = { minCurrentA: 80, maxCurrentA: 2000, harvestW: "0.1 * I", loadW: 4 };
const always = { kind: "always" as const };
const origin = { lat: 0, lon: 0 };

describe("exceeded-p currents: closed form of a sinusoid", () => {
  // For I(t) = a + b·sin(2πt/T) over whole periods, the current exceeded a share p of the time is
  // a + b·sin(π(½ − p)) (closed form: invert ½ + asin((a − x)/b)/π = p; docs/computation.md).
  const a = 100;
  const b = 50;
  const closed = (p: number) => a + b * Math.sin(Math.PI * (0.5 - p));
  const days = 30;
  const oneMinute = series(days * 1440 + 1, 60, (t) => a + b * Math.sin((2 * Math.PI * t) / DAY));

  it("the engine reports p10, p50 and p90 of 100 + 50·sin within 0.01 A of the closed form", () => {
    const r = runStudy(oneMinute, { device, schedule: always, location: origin });
    const x = r.current.exceeded!;
    expect(closed(0.1)).toBeCloseTo(147.553, 3); // worked: 100 + 50·sin(0.4π) = 100 + 50 × 0.951057
    expect(Math.abs(x.p10A - closed(0.1))).toBeLessThan(0.01);
    expect(Math.abs(x.p50A - 100)).toBeLessThan(0.01); // the median of a + b·sin is a, not (a + b) / 2
    expect(Math.abs(x.p90A - closed(0.9))).toBeLessThan(0.01);
    expect(studyResultSchema.safeParse(r).success).toBe(true);
  });

  it("holds for other shares and for step interpolation at 1-minute sampling", () => {
    const s = span(oneMinute, false);
    for (const p of [0.01, 0.25, 0.75, 0.99]) expect(Math.abs(exceededCurrent(s, p)! - closed(p))).toBeLessThan(0.05);
  });

  it("reading the stored 201-point curve agrees to within one level step (results saved before engine 2)", () => {
    const r = runStudy(oneMinute, { device, schedule: always, location: origin });
    const step = r.loadDuration[1].currentA - r.loadDuration[0].currentA;
    for (const p of [0.1, 0.5, 0.9]) expect(Math.abs(exceededFromCurve(r.loadDuration, p)! - closed(p))).toBeLessThan(step);
  });
});

describe("exceeded-p currents: edge cases and properties", () => {
  it("a constant current is exceeded-p at its own value for every p", () => {
    const s = span(series(100, 60, () => 321.5));
    for (const p of [0.1, 0.5, 0.9]) expect(exceededCurrent(s, p)).toBe(321.5);
  });

  it("a current held at its top for 30 % of the time has p10 at the top", () => {
    // 70 steps at 100 A then 30 at 400 A (step interpolation: held values).
    const s = span(series(101, 60, (_t, i) => (i < 70 ? 100 : 400)), false);
    expect(exceededCurrent(s, 0.1)).toBeCloseTo(400, 6);
    expect(exceededCurrent(s, 0.9)).toBeGreaterThanOrEqual(100);
    expect(exceededCurrent(s, 0.9)).toBeLessThan(100.1);
  });

  it("no known time gives null", () => {
    const s: KnownSpan = { ...span(series(3, 3600, () => 10)), maxGapSeconds: 60 };
    expect(exceededCurrent(s, 0.5)).toBeNull();
  });

  it("property: p10 ≥ p50 ≥ p90, and the time above p_x is x of the known time", () => {
    fc.assert(
      // Currents to 0.01 A (a SCADA resolution): the curve treats ramps under 10⁻¹² A as held values.
      fc.property(fc.array(fc.integer({ min: 0, max: 200_000 }).map((x) => x / 100), { minLength: 3, maxLength: 200 }), fc.boolean(), (values, linear) => {
        const s = span(series(values.length, 60, (_t, i) => values[i]), linear);
        const p10 = exceededCurrent(s, 0.1)!;
        const p50 = exceededCurrent(s, 0.5)!;
        const p90 = exceededCurrent(s, 0.9)!;
        expect(p10).toBeGreaterThanOrEqual(p50 - 1e-9);
        expect(p50).toBeGreaterThanOrEqual(p90 - 1e-9);
        const known = (values.length - 1) * 60;
        // Within the refined level step (range / 200²): above p50 + step at most ½ of the time,
        // above p50 − step at least ½ (a held value can straddle ½ as a jump in the curve).
        const tol = 2 * ((Math.max(...values) - Math.min(...values)) / 200 ** 2) + 1e-9 * (1 + p50);
        expect(secondsAbove(s, p50 + tol) / known).toBeLessThanOrEqual(0.5 + 1e-9);
        expect(secondsAbove(s, p50 - tol) / known).toBeGreaterThanOrEqual(0.5 - 1e-9);
      }),
      { numRuns: 300 },
    );
  });
});

describe("hours above the circuit's rating", () => {
  it("80 + 40·sin is above 100 A one third of the time (½ − asin(20/40)/π = 1/3)", () => {
    const s = series(30 * 1440 + 1, 60, (t) => 80 + 40 * Math.sin((2 * Math.PI * t) / DAY));
    const r = runStudy(s, { device, schedule: always, location: origin, params: { ratingA: 100 } });
    expect(r.current.rating!.ratingA).toBe(100);
    expect(r.current.rating!.hoursAbove / r.period.knownHours).toBeCloseTo(1 / 3, 4);
    // The device maximum (2000 A) is a different threshold: never exceeded here.
    expect(r.current.hoursAboveMax).toBe(0);
  });

  it("is null when the study has no rating", () => {
    const r = runStudy(series(100, 60, () => 120), { device, schedule: always, location: origin });
    expect(r.current.rating).toBeNull();
  });
});

describe("monthly figures add up", () => {
  it("lit + dark + unknown = required in every month, with gaps in the data and a night schedule", () => {
    // 75 days of 5-minute data with a 2-day hole and a 6-hour hole, around a month end.
    const base = series(75 * 288, 300, (t, i) => 60 + 50 * Math.sin((2 * Math.PI * t) / DAY) + 10 * Math.sin(i * 0.7));
    const keep = (t: number) => !(t > T0 + 20 * DAY && t < T0 + 22 * DAY) && !(t > T0 + 40.3 * DAY && t < T0 + 40.55 * DAY);
    const idx = Array.from(base.t.keys()).filter((i) => keep(base.t[i]));
    const holed: Series = { t: Float64Array.from(idx, (i) => base.t[i]), amps: Float64Array.from(idx, (i) => base.amps[i]) };
    const r = runStudy(holed, { device: { ...device, storageWh: 20 }, schedule: { kind: "night" }, location: { lat: 48.1, lon: 11.6 }, params: { maxGapMinutes: 15 } });
    expect(r.monthly.length).toBeGreaterThanOrEqual(3);
    let unknownSeen = 0;
    for (const m of [...r.monthly, r.yearly[0]]) {
      expect(m.litHours + m.darkHours + m.requiredUnknownHours).toBeCloseTo(m.requiredHours, 6);
      unknownSeen += m.requiredUnknownHours;
    }
    expect(unknownSeen).toBeGreaterThan(10); // the 2-day hole holds about a night and a half of required time per day
  });
});
