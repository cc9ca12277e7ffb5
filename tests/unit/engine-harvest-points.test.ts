// Harvest curves typed from a datasheet: linear between rows, from (0 A, 0 W) below the first
// row, held above the last (docs/computation.md "Harvest curve from a table"). Expected values are
// worked by hand from that rule, beside each check.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { compileDevice, DeviceError } from "../../lib/engine";
import { harvestDescription, harvestPointNodes, interpolateHarvest } from "../../lib/engine/harvest-points";
import { deviceSchema } from "../../shared/study-schemas";

const ROWS = [
  { currentA: 20, watts: 0.5 },
  { currentA: 50, watts: 2 },
  { currentA: 100, watts: 6 },
  { currentA: 400, watts: 12 },
];
const device = { minCurrentA: 20, maxCurrentA: 1000, harvestPoints: ROWS, loadW: 4 };

describe("interpolateHarvest", () => {
  it("is linear between rows", () => {
    // 35 A is halfway from 20 A (0.5 W) to 50 A (2 W): 0.5 + 0.5 × 1.5 = 1.25 W.
    expect(interpolateHarvest(ROWS, 35)).toBeCloseTo(1.25, 12);
    // 75 A: 2 + (6 − 2) × 25/50 = 4 W.
    expect(interpolateHarvest(ROWS, 75)).toBeCloseTo(4, 12);
    // 250 A: 6 + (12 − 6) × 150/300 = 9 W.
    expect(interpolateHarvest(ROWS, 250)).toBeCloseTo(9, 12);
  });

  it("meets every row exactly", () => {
    for (const r of ROWS) expect(interpolateHarvest(ROWS, r.currentA)).toBe(r.watts);
  });

  it("runs from (0 A, 0 W) to the first row below it and holds the last row above it", () => {
    // 10 A is half the first row's 20 A: 0.5 W × 10/20 = 0.25 W.
    expect(interpolateHarvest(ROWS, 10)).toBeCloseTo(0.25, 12);
    expect(interpolateHarvest(ROWS, 0)).toBe(0);
    // Above 400 A the last row's 12 W holds (no upward extrapolation).
    expect(interpolateHarvest(ROWS, 401)).toBe(12);
    expect(interpolateHarvest(ROWS, 5000)).toBe(12);
  });

  it("keeps a first row at 0 A as given", () => {
    expect(interpolateHarvest([{ currentA: 0, watts: 0.1 }, { currentA: 10, watts: 1.1 }], 0)).toBe(0.1);
    // 5 A: 0.1 + 1 × 5/10 = 0.6 W.
    expect(interpolateHarvest([{ currentA: 0, watts: 0.1 }, { currentA: 10, watts: 1.1 }], 5)).toBeCloseTo(0.6, 12);
  });

  it("stays between its neighbouring rows' watts (any rising rows)", () => {
    const rows = fc
      .uniqueArray(fc.integer({ min: 1, max: 5000 }), { minLength: 2, maxLength: 12 })
      .chain((cs) => fc.tuple(fc.constant([...cs].sort((a, b) => a - b)), fc.array(fc.float({ min: 0, max: 100, noNaN: true }), { minLength: cs.length, maxLength: cs.length })));
    fc.assert(
      fc.property(rows, fc.float({ min: 0, max: 6000, noNaN: true }), ([cs, ws], at) => {
        const pts = cs.map((c, i) => ({ currentA: c, watts: ws[i] }));
        const w = interpolateHarvest(pts, at);
        const k = pts.findIndex((p) => p.currentA >= at);
        if (k === -1) return w === pts[pts.length - 1].watts;
        const lo = k === 0 ? 0 : Math.min(pts[k - 1].watts, pts[k].watts);
        const hi = k === 0 ? pts[0].watts : Math.max(pts[k - 1].watts, pts[k].watts);
        return w >= lo - 1e-9 && w <= hi + 1e-9;
      }),
    );
  });
});

describe("a device with a harvest table", () => {
  it("harvests what the rows say through the engine's table", () => {
    const d = compileDevice(device);
    expect(d.harvestW(35)).toBeCloseTo(1.25, 12);
    expect(d.harvestW(250)).toBeCloseTo(9, 12);
    expect(d.harvestW(9000)).toBe(12);
    // Mean along a ramp 20 → 50 A is the mean of the straight piece: (0.5 + 2) / 2 = 1.25 W.
    expect(d.meanHarvestW(20, 50)).toBeCloseTo(1.25, 12);
    // Ramp 50 → 150 A: ∫ = (2 + 6)/2 × 50 + (6 + 7)/2 × 50 = 200 + 325 = 525 W·A over 100 A = 5.25 W.
    expect(d.meanHarvestW(50, 150)).toBeCloseTo(5.25, 12);
  });

  it("lays the rows out as nodes from 0 A to the table's end", () => {
    expect(harvestPointNodes(ROWS, 10000)).toEqual({ currentA: [0, 20, 50, 100, 400, 10000], powerW: [0, 0.5, 2, 6, 12, 12] });
  });

  it("names the row that breaks the rules", () => {
    const bad = deviceSchema.safeParse({ ...device, harvestPoints: [{ currentA: 20, watts: 1 }, { currentA: 60, watts: 2 }, { currentA: 60, watts: -3 }] });
    expect(bad.success).toBe(false);
    const issues = bad.error!.issues.map((i) => [i.path.join("."), i.message]);
    expect(issues).toContainEqual(["harvestPoints.2.currentA", "Row 3: currents must increase from one row to the next (60 A after 60 A)."]);
    expect(issues).toContainEqual(["harvestPoints.2.watts", "Row 3: the power cannot be negative (-3 W)."]);
    expect(() => compileDevice({ ...device, harvestPoints: [{ currentA: -1, watts: 0 }, { currentA: 5, watts: 1 }] })).toThrow(DeviceError);
  });

  it("takes an expression or a table, not both and not neither", () => {
    const both = deviceSchema.safeParse({ ...device, harvestW: "0.01*I" });
    expect(both.error?.issues[0]).toMatchObject({ path: ["harvestPoints"], message: expect.stringContaining("not both") });
    const { harvestPoints: _drop, ...none } = device;
    expect(deviceSchema.safeParse(none).error?.issues[0].path).toEqual(["harvestW"]);
  });

  it("describes itself in words", () => {
    expect(harvestDescription(device)).toBe("table of 4 rows, 20–400 A, up to 12 W");
    expect(harvestDescription({ harvestW: "min(0.004*I^2, 15)" })).toBe("min(0.004*I^2, 15)");
  });
});
