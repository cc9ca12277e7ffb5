import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { crossingLayoutRequest, crossingPlan, type CrossingPlanInput } from "../../lib/crossings/plan";
import { conductorHeightAt, minimumClearance } from "../../lib/span";
import { safeParseForm } from "../../shared/form-decode";
import { crossingDetailsFormToInput, crossingDetailsSchema, emptyCrossingDetails, type CrossingDetails } from "../../shared/crossing-details-schemas";

const input = (details: Partial<CrossingDetails>, span = 1000, unit: "ft" | "m" = "ft", voltageKv = 138): CrossingPlanInput => ({
  spanLength: { value: span, unit },
  voltageKv,
  details: { ...emptyCrossingDetails(), ...details },
});

function planOf(i: CrossingPlanInput, options = {}) {
  const plan = crossingPlan(i, options);
  if (!plan.ok) throw new Error(JSON.stringify(plan.errors));
  return plan;
}

describe("crossing layout request", () => {
  it("carries the rule set, critical area, diameter and wire arrangement", () => {
    const request = crossingLayoutRequest(
      input({ ruleSet: "faa", runwayEndCriticalArea: true, markerDiameter: { value: 20, unit: "in" }, highestWire: "shield", wireSeparation: 12, icaoColour: "orange" }, 300),
    );
    expect(request).toEqual({
      ruleSet: "faa",
      spanLength: { value: 300, unit: "ft" },
      markerDiameter: { value: 20, unit: "in" },
      runwayEndCriticalArea: true,
      lit: true,
      litConditions: { highestWireEnergized: false, verticalSeparation: { value: 12, unit: "ft" }, voltageKv: 138 },
    });
    // The ICAO colour choice only goes with ICAO; no wire arrangement, no suitability check.
    expect(crossingLayoutRequest(input({ ruleSet: "icao", icaoColour: "orange" }, 300, "m"), { lit: false })).toEqual({
      ruleSet: "icao",
      spanLength: { value: 300, unit: "m" },
      runwayEndCriticalArea: false,
      icaoColour: "orange",
      lit: false,
    });
  });
});

describe("crossing plan", () => {
  // FAA 1,000 ft at ≤ 200 ft → 4 markers [published: AC 70/7460-1K ¶34.a(2)(a)];
  // a what-if 2,000 ft → 10 intervals → 9 markers, same source.
  it("lays out the saved span and a what-if span", () => {
    expect(planOf(input({})).layout.count).toBe(4);
    expect(planOf(input({}), { spanLength: 2000 }).layout.count).toBe(9);
  });

  it("fills unstated heights and sag with stated assumptions and a conductor above the ground", () => {
    const plan = planOf(input({}, 380));
    // A tenth of the span is 38 ft, below the 12 m floor (39.37 ft), rounded to 39 ft.
    expect(plan.figures.attachmentA).toBe(39);
    expect(plan.figures.sag).toEqual({ kind: "midspan-sag", value: 11.4 });
    expect(plan.assumed.join(" ")).toMatch(/heights not stated.*Sag not stated.*Highest wire not stated/s);
    expect(minimumClearance(plan.curve).height).toBeGreaterThan(0);
  });

  it("measures heights from the support bases and turns them into heights above a lower river", () => {
    const plan = planOf(input({ attachmentHeightA: 166, attachmentHeightB: 151, supportHeightA: 180, supportHeightB: 165, surfaceLevel: -12, sagKind: "midspan-sag", sagValue: 55 }, 1450));
    expect(plan.figures.baseHeight).toBe(12);
    expect(conductorHeightAt(plan.curve, 0)).toBeCloseTo(178, 9);
    expect(conductorHeightAt(plan.curve, 1450)).toBeCloseTo(163, 9);
    expect(plan.figures.supportTopA).toBe(192);
    expect((178 + 163) / 2 - conductorHeightAt(plan.curve, 725)).toBeCloseTo(55, 6);
    expect(plan.assumed).toEqual(["Highest wire not stated: markers drawn on the conductor, lit-marker suitability not checked."]);
  });

  it("scales a stated sag with the square of a what-if span, never below the ground", () => {
    const details = { attachmentHeightA: 100, attachmentHeightB: 100, sagKind: "midspan-sag" as const, sagValue: 20, surfaceLevel: 0 };
    expect(planOf(input(details), { spanLength: 1500 }).figures.sag.value).toBeCloseTo(45, 9);
    const capped = planOf(input(details), { spanLength: 5000 });
    expect(capped.figures.sag.value).toBeCloseTo(80, 9);
    expect(capped.assumed.join(" ")).toContain("capped");
  });

  // The energized conductor must be within about 20 ft (6 m) of a shield wire [from memory (AC 70/7460-1L)].
  it("lights the markers only where the wires suit lit markers", () => {
    const near = planOf(input({ highestWire: "shield", wireSeparation: 15 }));
    expect(near.layout.positions.every((p) => p.lit)).toBe(true);
    expect(near.figures.markedWireOffset).toBe(15);
    const far = planOf(input({ highestWire: "shield", wireSeparation: 30 }));
    expect(far.layout.positions.some((p) => p.lit)).toBe(false);
    expect(far.layout.litSuitability?.suitable).toBe(false);
  });

  it("reports rule violations instead of a layout", () => {
    const plan = crossingPlan(input({ markerDiameter: { value: 10, unit: "in" } }));
    expect(plan.ok).toBe(false);
    if (!plan.ok) expect(plan.errors[0].path).toBe("markerDiameter");
  });

  it("keeps the conductor above the ground for any span with assumed heights and sag", () => {
    fc.assert(
      fc.property(fc.double({ min: 20, max: 20_000, noNaN: true }), fc.constantFrom("ft" as const, "m" as const), (span, unit) => {
        const plan = planOf(input({}, span, unit));
        return minimumClearance(plan.curve).height > 0 && plan.layout.count >= 1;
      }),
      { numRuns: 60 },
    );
  });
});

describe("span and marking details form", () => {
  it("reads empty fields as not stated and checks heights against each other", () => {
    const ok = safeParseForm(crossingDetailsSchema, crossingDetailsFormToInput({ supportHeightA: "120", attachmentHeightA: "110,5", sagKind: "", sagValue: "", markerDiameterUnit: "in", ruleSet: "faa" }));
    expect(ok.success && ok.data).toMatchObject({ supportHeightA: 120, attachmentHeightA: 110.5, runwayEndCriticalArea: false, costCurrency: "USD" });
    expect(ok.success && "markerDiameterUnit" in ok.data).toBe(false);

    const bad = crossingDetailsSchema.safeParse(
      crossingDetailsFormToInput({ supportHeightA: "100", attachmentHeightA: "120", attachmentHeightB: "90", surfaceLevel: "95", sagKind: "lowest-clearance", sagValue: "" }),
    );
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["attachmentHeightA", "sagValue", "surfaceLevel"]));
  });
});
