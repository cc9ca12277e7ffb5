// Device profiles (lib/engine/device.ts): the harvest table against direct mathjs evaluation, and
// the messages for invalid expressions.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { compileDevice, DeviceError, levelCrossings, meanHarvest } from "../../lib/engine/device";

const base = { minCurrentA: 40, maxCurrentA: 2000, loadW: 4 };

describe("harvest table", () => {
  const expressions = [
    "min(0.004 * I^2, 15)", // the API section of README.md example: saturating I² harvester
    "0.004 * I^2", // pure I² (ideal CT below saturation, docs/check-values.md "Physics")
    "I > 100 ? 12 : 0.0012 * I^2",
    "max(0, 5 * log10(I + 1) - 2)",
    "15 * tanh(I / 300) + 0.5 * sin(I / 40)^2",
  ];

  for (const harvestW of expressions) {
    it(`agrees with direct evaluation within 0.1 % for ${harvestW}`, () => {
      const device = compileDevice({ ...base, harvestW });
      fc.assert(
        fc.property(fc.double({ min: 0, max: 20_000, noNaN: true }), (current) => {
          const direct = device.evaluateDirect(current);
          const table = device.harvestW(current);
          // 0.1 % of the value; a microwatt absolute floor where the curve runs through zero.
          expect(Math.abs(table - direct)).toBeLessThanOrEqual(0.001 * Math.abs(direct) + 1e-6);
        }),
        { numRuns: 2000 },
      );
    });
  }

  it("the mean harvest along a ramp equals the average of the table over the ramp", () => {
    const device = compileDevice({ ...base, harvestW: "min(0.004 * I^2, 15)" });
    for (const [a, b] of [[0, 100], [30, 90], [200, 50], [61, 62]]) {
      let sum = 0;
      const n = 20_000;
      for (let k = 0; k < n; k++) sum += device.harvestW(a + ((k + 0.5) / n) * (b - a));
      expect(meanHarvest(device.table, a, b)).toBeCloseTo(sum / n, 6);
    }
  });

  it("finds where the harvest covers the load: 0.004·I² = 4 W at I = √1000 ≈ 31.62 A", () => {
    const device = compileDevice({ ...base, minCurrentA: 10, harvestW: "min(0.004 * I^2, 15)" });
    const { atFrom, crossingsA } = levelCrossings(device.table, 4, 10);
    expect(atFrom).toBe(false);
    expect(crossingsA).toHaveLength(1);
    expect(crossingsA[0]).toBeCloseTo(Math.sqrt(1000), 1);
  });

  it("applies defaults from the schema", () => {
    const d = compileDevice({ ...base, harvestW: "0.01 * I" }).device;
    expect(d).toMatchObject({ standbyW: 0, storageWh: 0, chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20 });
  });
});

describe("invalid device profiles", () => {
  const message = (harvestW: string, extra: object = {}) => {
    try {
      compileDevice({ ...base, harvestW, ...extra });
    } catch (err) {
      expect(err).toBeInstanceOf(DeviceError);
      return (err as DeviceError).message;
    }
    throw new Error(`expected ${harvestW} to be rejected`);
  };

  it("syntax error", () => {
    expect(message("min(0.004 * I^2, 15")).toMatch(/cannot be read.*Parenthesis \) expected/);
  });
  it("unknown symbol", () => {
    expect(message("0.004 * I^2 * k")).toMatch(/Unknown symbol "k"/);
    expect(message("0.004 * X^2")).toMatch(/Unknown symbol "X"/);
  });
  it("unknown or unsafe function", () => {
    expect(message("evaluate(\"1\") * I")).toMatch(/Unknown function "evaluate"|may only contain numbers/);
    expect(message("foo(I)")).toMatch(/Unknown function "foo"/);
  });
  it("assignments, matrices and units are refused", () => {
    expect(message("I = 3")).toMatch(/an assignment/);
    expect(message("[1, 2] * I")).toMatch(/list or matrix/);
    expect(message("0.004 * I^2 W")).toMatch(/Unknown symbol "W"/);
  });
  it("not a function of I", () => {
    expect(message("15")).toMatch(/does not depend on the line current I/);
    expect(message("min(pi, 15)")).toMatch(/does not depend on the line current I/);
  });
  it("negative power somewhere in the range", () => {
    expect(message("0.1 * I - 5")).toMatch(/negative \(-5 W\) at I = 0 A/);
    expect(message("10 - 0.01 * I")).toMatch(/negative/);
  });
  it("non-finite power", () => {
    expect(message("1 / I")).toMatch(/not a finite number at I = 0 A/);
    expect(message("sqrt(I - 100)")).toMatch(/not give a real number|not a finite number/);
  });
  it("minimum current not below maximum", () => {
    expect(() => compileDevice({ ...base, minCurrentA: 2000, harvestW: "0.01 * I" })).toThrow(
      /Maximum current must be above the minimum operating current/,
    );
    try {
      compileDevice({ ...base, minCurrentA: 2500, harvestW: "0.01 * I" });
    } catch (err) {
      expect((err as DeviceError).path).toEqual(["maxCurrentA"]);
    }
  });
});
