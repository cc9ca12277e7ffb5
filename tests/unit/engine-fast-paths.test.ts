// The engine's shortcuts for speed must give exactly what the plain definitions give:
// the median interval without a full sort (lib/series.ts), reused harvest tables
// (lib/engine/device.ts), and the simulation's running totals kept in locals (lib/engine/simulate.ts).
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { defaultMaxGapSeconds, medianIntervalSeconds, type Series } from "../../lib/series";
import { compileDevice, DeviceError } from "../../lib/engine/device";
import { prepareStudy } from "../../lib/engine/prepare";
import { simulate } from "../../lib/engine/simulate";

/** docs/computation.md taken literally: sort the intervals, take the middle (mean of the two middles). */
function medianBySorting(t: Float64Array): number {
  if (t.length < 2) return 0;
  const d = new Float64Array(t.length - 1);
  for (let i = 1; i < t.length; i++) d[i - 1] = t[i] - t[i - 1];
  d.sort();
  const m = d.length >> 1;
  return d.length % 2 ? d[m] : (d[m - 1] + d[m]) / 2;
}

function timesFromIntervals(intervals: number[], start = 1_700_000_000): Float64Array {
  const t = new Float64Array(intervals.length + 1);
  t[0] = start;
  for (let i = 0; i < intervals.length; i++) t[i + 1] = t[i] + intervals[i];
  return t;
}

describe("median sampling interval", () => {
  it("is 0 below two samples and the single interval for two", () => {
    expect(medianIntervalSeconds(new Float64Array(0))).toBe(0);
    expect(medianIntervalSeconds(Float64Array.of(5))).toBe(0);
    expect(medianIntervalSeconds(Float64Array.of(5, 65))).toBe(60);
  });

  it("regular sampling with gaps and a few odd steps: the common interval", () => {
    const intervals = Array.from({ length: 10_001 }, (_, i) => (i % 97 === 0 ? 3600 : i % 13 === 0 ? 59.5 : 60));
    const t = timesFromIntervals(intervals);
    expect(medianIntervalSeconds(t)).toBe(60);
    expect(defaultMaxGapSeconds(t)).toBe(180);
  });

  it("exactly half one value and half another (no majority): the mean of the two middles", () => {
    const intervals = Array.from({ length: 1000 }, (_, i) => (i % 2 ? 30 : 60));
    expect(medianIntervalSeconds(timesFromIntervals(intervals))).toBe(45);
    expect(medianIntervalSeconds(timesFromIntervals([...intervals, 60]))).toBe(60);
  });

  it("ordered, reversed and organ-pipe intervals (hard cases for pivot choice) match the sorted median", () => {
    const n = 20_001;
    const ascending = Array.from({ length: n }, (_, i) => 1 + i);
    const descending = [...ascending].reverse();
    const organ = Array.from({ length: n }, (_, i) => 1 + Math.min(i, n - 1 - i));
    const sawtooth = Array.from({ length: n }, (_, i) => 1 + (i % 7) * 10 + (i % 3));
    for (const intervals of [ascending, descending, organ, sawtooth, ascending.slice(1), organ.slice(1)]) {
      const t = timesFromIntervals(intervals);
      expect(medianIntervalSeconds(t)).toBe(medianBySorting(t));
    }
  });

  it("zero and negative intervals, and NaN times, match the sorted median", () => {
    const cases = [
      timesFromIntervals([0, 0, 0, 60, 60]),
      timesFromIntervals([0, 0, 60, 60]),
      timesFromIntervals([60, -30, 60, -30, 10]),
      Float64Array.of(0, 60, NaN, 180, 240),
      Float64Array.of(0, NaN, NaN, NaN, 240),
    ];
    for (const t of cases) expect(Object.is(medianIntervalSeconds(t), medianBySorting(t))).toBe(true);
  });

  it("property: equals the sorted median for any intervals", () => {
    const interval = fc.oneof(
      fc.constantFrom(60, 60, 60, 300, 900, 0.5),
      fc.integer({ min: 0, max: 5 }),
      fc.double({ min: -100, max: 10_000, noNaN: true, noDefaultInfinity: true }),
    );
    fc.assert(
      fc.property(fc.array(interval, { minLength: 0, maxLength: 400 }), (intervals) => {
        const t = timesFromIntervals(intervals, 0);
        expect(Object.is(medianIntervalSeconds(t), medianBySorting(t))).toBe(true);
      }),
      { numRuns: 400 },
    );
  });
});

describe("harvest table reuse", () => {
  const device = { minCurrentA: 60, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4 };

  it("a reused table holds the same nodes as a freshly built one", () => {
    const first = compileDevice(device, { tableMaxA: 12_345 });
    const again = compileDevice({ ...device, loadW: 2 }, { tableMaxA: 12_345 });
    const fresh = compileDevice(device, { tableMaxA: 12_345, reuseTable: false });
    expect(again.table).toBe(first.table);
    expect(fresh.table).not.toBe(first.table);
    expect(Array.from(fresh.table.currentA)).toEqual(Array.from(first.table.currentA));
    expect(Array.from(fresh.table.powerW)).toEqual(Array.from(first.table.powerW));
    expect(Array.from(fresh.table.cumulative)).toEqual(Array.from(first.table.cumulative));
  });

  it("another range or expression gets its own table", () => {
    const a = compileDevice(device, { tableMaxA: 5000 });
    const b = compileDevice(device, { tableMaxA: 6000 });
    const c = compileDevice({ ...device, harvestW: "min(0.005 * I^2, 15)" }, { tableMaxA: 5000 });
    expect(b.table).not.toBe(a.table);
    expect(c.table).not.toBe(a.table);
    expect(b.table.maxA).toBe(6000);
    expect(c.harvestW(40)).toBeCloseTo(8, 3);
  });

  it("an expression that fails to tabulate fails every time (failures are not kept)", () => {
    const bad = { ...device, harvestW: "0.1 * I - 5" }; // negative below 50 A
    expect(() => compileDevice(bad)).toThrow(DeviceError);
    expect(() => compileDevice(bad)).toThrow(/negative/);
  });
});

describe("simulation totals kept in locals", () => {
  const DAY = 86_400;
  const start = Date.UTC(2024, 0, 20) / 1000; // crosses month boundaries at 1-minute steps
  const n = 80 * 1440;
  const t = new Float64Array(n);
  const amps = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = start + i * 60;
    amps[i] = 70 + 45 * Math.sin((2 * Math.PI * i * 60) / DAY) + 20 * Math.sin(i / 911);
  }
  // A gap of six hours, so unknown time sits inside the period.
  const keep = Array.from({ length: n }, (_, i) => i < 40_000 || i >= 40_360);
  const series: Series = { t: t.filter((_, i) => keep[i]), amps: amps.filter((_, i) => keep[i]) };
  const input = {
    device: { minCurrentA: 60, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 6, standbyW: 0.2, storageWh: 25, selfDischargePctPerDay: 2 },
    schedule: { kind: "night" as const, sunAltitudeDeg: -0.833 },
    location: { lat: 47.3, lon: 8.5 },
  };

  for (const storageWh of [0, 25]) {
    it(`hour × month cells add up to the monthly totals (storage ${storageWh} Wh)`, () => {
      const context = prepareStudy(series, { ...input, device: { ...input.device, storageWh } });
      const s = simulate(context.prepared, context.device);
      const sum = (xs: Float64Array) => xs.reduce((a, b) => a + b, 0);
      const known = sum(s.known);
      const belowMin = known - sum(s.atOrAboveMin);
      expect(known).toBeGreaterThan(70 * DAY);
      expect(belowMin).toBeGreaterThan(DAY);
      expect(sum(s.cellKnown)).toBeCloseTo(known, 3);
      expect(sum(s.cellBelowMin)).toBeCloseTo(belowMin, 3);
      // January to April touched (20 Jan + 80 days), each with its own totals; lit + dark = required known in each.
      expect(s.known.length).toBe(4);
      for (let m = 0; m < 4; m++) {
        expect(s.known[m]).toBeGreaterThan(0);
        expect(s.lit[m] + s.dark[m]).toBeCloseTo(s.requiredKnown[m], 3);
      }
      expect(known).toBeCloseTo(context.prepared.knownSeconds, 3);
    });
  }
});
