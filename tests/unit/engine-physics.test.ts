// Physics added for issue 13 (lib/engine/simulate.ts, prepare.ts, device.ts): harvester
// hysteresis, cold-weather storage derating and switched-out periods, by worked cases and
// properties. Sources are named beside the check values; docs/computation.md has the definitions.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { Series } from "../../lib/series";
import { runStudy } from "../../lib/engine/simulate";
import { usableFractionAt } from "../../lib/engine/device";
import { lastYearLoadScale } from "../../lib/optimise/optimise";
import { deviceSchema } from "../../shared/study-schemas";

const HOUR = 3600;
const DAY = 86_400;
const T0 = Date.UTC(2025, 0, 6) / 1000; // a Monday in January, 00:00 UTC

function series(n: number, stepSeconds: number, amps: (t: number) => number, start = T0): Series {
  const t = new Float64Array(n);
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = start + i * stepSeconds;
    a[i] = amps(t[i] - start);
  }
  return { t, amps: a };
}

const always = { kind: "always" as const };
const origin = { lat: 0, lon: 0 };

describe("hysteresis: triangle wave (worked by hand)", () => {
  // The current rises linearly 0 → 100 A over an hour and falls back over the next: samples at the
  // corners, linear interpolation. The harvester gives a flat 10 W while on; the light draws 2 W; no
  // storage, so it is lit exactly while the harvester is on (docs/computation.md "Hysteresis").
  const cycles = 10;
  const triangle = series(2 * cycles + 1, HOUR, (t) => ((t / HOUR) % 2 === 0 ? 0 : 100));
  const device = { minCurrentA: 20, maxCurrentA: 1000, harvestW: "10 + 0 * I", loadW: 2 };

  it("switching on at 60 A and dropping out below 20 A lights 1.2 h of every 2 h", () => {
    // Rising: off until 60 A, reached 0.6 h into the rise. Falling: on until 20 A, reached 0.8 h into
    // the fall. Lit 0.6 h → 1.8 h of each cycle: 1.2 h of 2 h = 60 % (worked by hand).
    const r = runStudy(triangle, { device: { ...device, turnOnCurrentA: 60 }, schedule: always, location: origin });
    expect(r.period.knownHours).toBeCloseTo(2 * cycles, 9);
    expect(r.lighting.availability!).toBeCloseTo(0.6, 9);
    expect(r.lighting.darkHours).toBeCloseTo(0.8 * cycles, 9);
    // Dark from 1.8 h of one cycle to 0.6 h of the next: 0.8 h, nine times; plus 0 → 0.6 h at the
    // start and 19.8 → 20 h at the end: 11 stretches, 0.6 + 9 × 0.8 + 0.2 = 8 h.
    expect(r.lighting.longestDarkStretchHours).toBeCloseTo(0.8, 9);
    expect(r.lighting.darkEvents).toBe(cycles + 1);
    // Hours at or above the minimum stay a figure of the current alone: 0.2 h → 1.8 h = 80 %.
    expect(r.current.hoursAtOrAboveMin).toBeCloseTo(1.6 * cycles, 9);
  });

  it("without a turn-on current it switches at the minimum: lit 1.6 h of every 2 h", () => {
    const r = runStudy(triangle, { device, schedule: always, location: origin });
    expect(r.lighting.availability!).toBeCloseTo(0.8, 9);
  });

  it("a turn-on current below the minimum is refused, naming the field", () => {
    const parsed = deviceSchema.safeParse({ ...device, turnOnCurrentA: 10 });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0].path).toEqual(["turnOnCurrentA"]);
  });

  it("properties: turn-on = minimum changes nothing to the bit; a higher turn-on never lights more", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 200, noNaN: true }), { minLength: 3, maxLength: 60 }),
        fc.double({ min: 0, max: 80, noNaN: true }),
        fc.double({ min: 0, max: 80, noNaN: true }),
        fc.constantFrom(0, 5, 50),
        (amps, minA, extra, storageWh) => {
          const s: Series = { t: Float64Array.from(amps, (_, i) => T0 + i * 600), amps: Float64Array.from(amps) };
          const base = { minCurrentA: minA, maxCurrentA: 1000, harvestW: "min(0.002 * I^2, 12)", loadW: 3, storageWh, chargeEfficiency: 0.9, initialCharge: 0.5 };
          const input = { schedule: always, location: origin, policy: { minKnownHours: 0 } };
          const plain = runStudy(s, { ...input, device: base });
          const same = runStudy(s, { ...input, device: { ...base, turnOnCurrentA: minA } });
          const higher = runStudy(s, { ...input, device: { ...base, turnOnCurrentA: minA + extra } });
          expect(same.lighting).toEqual(plain.lighting);
          // Within a millisecond of rounding, as the engine's other monotonicity properties.
          expect(higher.lighting.litHours).toBeLessThanOrEqual(plain.lighting.litHours + 1e-6);
        },
      ),
      { numRuns: 60 },
    );
  });
});

describe("cold-weather storage: a hand-worked January week", () => {
  // Every day: 12 h at 100 A, then 12 h at 0 A (15-minute samples, held). Flat 10 W harvest while on,
  // 2 W light, always required, lossless 20 Wh store starting full. Each dark half needs 12 h × 2 W =
  // 24 Wh; the lit half refills the store (12 h × 8 W × acceptance ≥ its usable size).
  const week = series(7 * 96 + 1, 900, (t) => ((t % DAY) < 12 * HOUR ? 100 : 0));
  const curve = [
    { tempC: -20, usableFraction: 0.5 },
    { tempC: 20, usableFraction: 1 },
  ];
  const device = { minCurrentA: 50, maxCurrentA: 1000, harvestW: "10 + 0 * I", loadW: 2, storageWh: 20, chargeEfficiency: 1, coldDerating: curve };
  const input = { schedule: always, location: origin, params: { interpolation: "step" as const }, policy: { minKnownHours: 0 } };
  const january = (tempC: number) => [tempC, 5, 5, 10, 15, 20, 25, 25, 20, 15, 10, 5];

  it("interpolates the usable fraction and holds it beyond the end points", () => {
    // Linear between (−20 °C, 0.5) and (20 °C, 1): 0 °C → 0.75 (worked by hand).
    expect(usableFractionAt(curve, 0)).toBeCloseTo(0.75, 12);
    expect(usableFractionAt(curve, -40)).toBe(0.5);
    expect(usableFractionAt(curve, 35)).toBe(1);
  });

  it("at 20 °C the whole 20 Wh is usable: (24 − 20) Wh / 2 W = 2 h dark a day", () => {
    const r = runStudy(week, { ...input, device, params: { ...input.params, monthlyTemperatureC: january(20) } });
    expect(r.lighting.darkHours).toBeCloseTo(7 * 2, 6);
  });

  it("at −20 °C half the store is usable: (24 − 10) Wh / 2 W = 7 h dark a day, 49 h in the week", () => {
    const r = runStudy(week, { ...input, device, params: { ...input.params, monthlyTemperatureC: january(-20) } });
    expect(r.lighting.darkHours).toBeCloseTo(49, 6);
    expect(r.lighting.longestDarkStretchHours).toBeCloseTo(7, 6);
  });

  it("at 0 °C three quarters: (24 − 15) / 2 = 4.5 h a day, 31.5 h in the week", () => {
    const r = runStudy(week, { ...input, device, params: { ...input.params, monthlyTemperatureC: january(0) } });
    expect(r.lighting.darkHours).toBeCloseTo(31.5, 6);
  });

  it("the study says what the cold costs: 49 − 14 = 35 dark hours in the January week", () => {
    const r = runStudy(week, { ...input, device, params: { ...input.params, monthlyTemperatureC: january(-20) } });
    expect(r.coldCost!.darkHours).toBeCloseTo(49, 6);
    expect(r.coldCost!.darkHoursWithoutDerating).toBeCloseTo(14, 6); // 2 h a day, as at 20 °C above
    expect(r.coldCost!.extraDarkHours).toBeCloseTo(35, 6);
    expect(r.coldCost!.byMonth).toEqual([{ month: "2025-01", temperatureC: -20, extraDarkHours: expect.closeTo(35, 6) }]);
    // Without derating each day is dark 2 h of 24: lit 7 × 22 h of the 168 h required (by hand).
    expect(r.coldCost!.availabilityWithoutDerating!).toBeCloseTo((7 * 22) / 168, 9);
  });

  it("a recorded monthly mean (the load CSV's temperature column) wins over the normal for its month", () => {
    // Recorded January −20 °C against a normal of 20 °C: the January week is judged at −20 °C, 49 h dark (above).
    const r = runStudy(week, { ...input, device, params: { ...input.params, monthlyTemperatureC: january(20), recordedTemperatureC: { "2025-01": -20 } } });
    expect(r.lighting.darkHours).toBeCloseTo(49, 6);
    // A recorded month outside the period changes nothing: the January normal of 0 °C applies, 31.5 h.
    const other = runStudy(week, { ...input, device, params: { ...input.params, monthlyTemperatureC: january(0), recordedTemperatureC: { "2024-12": -20 } } });
    expect(other.lighting.darkHours).toBeCloseTo(31.5, 6);
  });

  it("recorded January, nothing for February: derated in January only (hand-worked across the month end)", () => {
    // 29 Jan – 3 Feb 2025: five whole days. Each dark half ends at midnight with the store empty
    // (it needs 24 Wh, holds at most 20), so each day stands alone: January days at −20 °C are dark
    // (24 − 10) / 2 = 7 h, February days with no temperature known keep the whole store, 2 h.
    const days = series(5 * 96 + 1, 900, (t) => ((t % DAY) < 12 * HOUR ? 100 : 0), Date.UTC(2025, 0, 29) / 1000);
    const r = runStudy(days, { ...input, device, params: { ...input.params, recordedTemperatureC: { "2025-01": -20 } } });
    expect(r.lighting.darkHours).toBeCloseTo(3 * 7 + 2 * 2, 6);
    expect(r.coldCost!.byMonth).toEqual([
      { month: "2025-01", temperatureC: -20, extraDarkHours: expect.closeTo(3 * 5, 6) },
      { month: "2025-02", temperatureC: null, extraDarkHours: expect.closeTo(0, 6) },
    ]);
  });

  it("without monthly temperatures the curve is not applied", () => {
    const r = runStudy(week, { ...input, device });
    expect(r.lighting.darkHours).toBeCloseTo(14, 6);
    expect(r.coldCost).toBeNull();
  });
});

describe("switched-out periods and load growth", () => {
  it("a line switched out for 6 h leaves a storage-less light dark for exactly those 6 h", () => {
    const steady = series(4 * 24 + 1, HOUR, () => 100);
    const start = new Date((T0 + 30 * HOUR) * 1000).toISOString();
    const end = new Date((T0 + 36 * HOUR) * 1000).toISOString();
    const device = { minCurrentA: 50, maxCurrentA: 1000, harvestW: "10 + 0 * I", loadW: 2 };
    const r = runStudy(steady, { device, schedule: always, location: origin, params: { interpolation: "step", switchedOut: [{ name: "Maintenance", start, end }] } });
    expect(r.lighting.darkHours).toBeCloseTo(6, 9);
    expect(r.lighting.longestDarkStretchHours).toBeCloseTo(6, 9);
  });

  it("the last year of a 20-year life at −2 %/yr carries 0.98^19 of today's load", () => {
    // Compound growth over 19 years (the first year is today's): 0.98^19 = 0.68123 (worked by hand).
    expect(lastYearLoadScale(1, -2, 20)).toBeCloseTo(0.68123, 5);
    expect(lastYearLoadScale(1.5, 3, 1)).toBe(1.5);
  });
});
