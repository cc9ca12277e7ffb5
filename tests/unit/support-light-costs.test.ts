// The "lights on the supports" option is costed for the support-light layout's count:
// structures × levels × lights per level. Levels: top, catenary low point and midway
// [published: Aeronautical Information Manual 2-2-3], with intermediate levels where adjacent ones
// would be more than 105 m apart under ICAO / 350 ft under FAA, one light per level
// [from memory: shipped as the unconfirmed rules icao/faa.support-light-levels].
import { describe, expect, it } from "vitest";
import { crossingPlan, type CrossingPlanInput } from "../../lib/crossings/plan";
import { presentValueOfOption } from "../../lib/costs";
import { layoutCounts, unitsOf } from "../../lib/costs/units";
import { supportLevelCount, supportStructureLighting } from "../../lib/markers";
import { emptyCrossingDetails } from "../../shared/crossing-details-schemas";
import type { LightingOption } from "../../shared/cost-schemas";

// A tall ICAO river crossing: towers 300 m, conductors attached at 290 m, sag not stated (3 % of
// the span, at most 80 % of the attachment height above the water).
const tallCrossing = (span: number): CrossingPlanInput => ({
  spanLength: { value: span, unit: "m" },
  voltageKv: 400,
  details: { ...emptyCrossingDetails(), ruleSet: "icao", supportHeightA: 300, supportHeightB: 300, attachmentHeightA: 290, attachmentHeightB: 290 },
});

function planOf(input: CrossingPlanInput) {
  const plan = crossingPlan(input);
  if (!plan.ok) throw new Error(JSON.stringify(plan.errors));
  return plan;
}

describe("support-light levels (unconfirmed rule, from memory: at most 105 m / 350 ft between levels)", () => {
  it("keeps three levels up to twice the gap and adds levels beyond", () => {
    expect(supportLevelCount(100, 30, 105)).toBe(3); // 70 m: one gap would do, three levels is the minimum
    expect(supportLevelCount(300, 90, 105)).toBe(3); // 210 m: exactly two gaps of 105 m
    expect(supportLevelCount(300, 58, 105)).toBe(4); // 242 m: ⌈242 / 105⌉ = 3 gaps → 4 levels
    expect(supportLevelCount(1000, 0, 350)).toBe(4); // 1,000 ft: ⌈1000 / 350⌉ = 3 gaps → 4 levels
  });

  it("spaces the levels equally between the top and the catenary's low point", () => {
    const lighting = supportStructureLighting({ supportTopA: 300, supportTopB: 300, lowestPoint: 58, unit: "m" }, "icao");
    const a = lighting.lights.filter((l) => l.support === "A");
    // 242 m in 3 equal gaps of 80.67 m: 300, 219.33, 138.67, 58.
    expect(a.map((l) => l.level)).toEqual(["top", "middle", "middle", "bottom"]);
    expect(a.map((l) => Math.round(l.height * 100) / 100)).toEqual([300, 219.33, 138.67, 58]);
    expect(lighting.count).toMatchObject({ structures: 2, levels: 4, lightsPerLevel: 1, total: 8 });
    expect(lighting.count.basis).toMatch(/^2 structures × 4 levels × 1 light per level = 8/);
  });

  it("converts the FAA gap in feet to a span in metres", () => {
    // 350 ft = 106.68 m: 213 m between top and low point is just under two gaps → 3 levels; 214 m → 4.
    expect(supportStructureLighting({ supportTopA: 250, supportTopB: 250, lowestPoint: 37, unit: "m" }, "faa").count.total).toBe(6);
    expect(supportStructureLighting({ supportTopA: 250, supportTopB: 250, lowestPoint: 36, unit: "m" }, "faa").count.total).toBe(8);
  });
});

describe("the support-light count costs the lights-on-the-supports option", () => {
  // Invented option figures for the arithmetic (not demo defaults).
  const option = (units: number): LightingOption => ({
    name: "Lights on the supports",
    kind: "structure-supply",
    units,
    unitPrice: 2_500,
    installation: { method: "crane", mobilisation: 3_000, ratePerHour: 240, minutesPerUnit: 45 },
    outage: { needed: false, cost: 0 },
    annualMaintenance: 400,
    serviceLifeYears: 20,
    horizonYears: 20,
    discountRate: 0,
    feasibility: { status: "go", justification: "test" },
  });

  it("follows the span: a longer span sags lower, adds a level and raises equipment and installation", () => {
    // Span 3,000 m: sag 3 % = 90 m, low point 290 − 90 = 200 m, 100 m below the tops → 3 levels, 2 × 3 × 1 = 6 lights.
    const short = layoutCounts(planOf(tallCrossing(3000)));
    // Span 8,000 m: sag min(240, 0.8 × 290 = 232) = 232 m, low point 58 m, 242 m below the tops → 4 levels, 8 lights.
    const long = layoutCounts(planOf(tallCrossing(8000)));
    const a = unitsOf("structure-supply", null, short);
    const b = unitsOf("structure-supply", null, long);
    expect([a.units, a.source]).toEqual([6, "support lights"]);
    expect([b.units, b.source]).toEqual([8, "support lights"]);
    expect(b.basis).toMatch(/^support-light layout: 2 structures × 4 levels × 1 light per level = 8/);

    const costA = presentValueOfOption(option(a.units));
    const costB = presentValueOfOption(option(b.units));
    // Equipment 6 × 2,500 = 15,000; installation 3,000 + 240 × (6 × 45 / 60 = 4.5 h) = 4,080.
    expect(costA.capital).toBe(15_000);
    expect(costA.installation).toBe(4_080);
    // Equipment 8 × 2,500 = 20,000; installation 3,000 + 240 × (8 × 45 / 60 = 6 h) = 4,440.
    expect(costB.capital).toBe(20_000);
    expect(costB.installation).toBe(4_440);
  });

  it("keeps a stated count, and marker options keep following the marker layout", () => {
    const counts = layoutCounts(planOf(tallCrossing(3000)));
    expect(unitsOf("structure-supply", 10, counts)).toEqual({ units: 10, source: "stated", basis: "stated for this option" });
    // ICAO 60 cm spheres at most 30 m apart [published: Annex 14 Vol. I ch. 6]: 3,000 m → 100 intervals → 99 markers.
    expect(unitsOf("solar", null, counts)).toMatchObject({ units: 99, source: "marker layout" });
  });

  it("costs one light, and says why, when the span gives no plan", () => {
    const none = layoutCounts({ ok: false, errors: [] });
    expect(unitsOf("structure-supply", null, none)).toMatchObject({ units: 1, basis: expect.stringContaining("not available") });
  });
});
