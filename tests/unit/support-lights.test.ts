// Support-structure (catenary) lights: three levels on each support — top, the catenary's lowest
// point, midway — flashing middle, top, bottom at about 60 a minute [published: Aeronautical
// Information Manual 2-2-3]. Light type per rule set: FAA L-857 / L-866 flashing white and
// ICAO high-intensity Type B [from memory: shipped as unconfirmed rules].
import { describe, expect, it } from "vitest";
import { crossingPlan, type CrossingPlanInput } from "../../lib/crossings/plan";
import { supportStructureLighting } from "../../lib/markers";
import { statusWords } from "../../shared/rule-book";
import { minimumClearance } from "../../lib/span";
import { emptyCrossingDetails, type CrossingDetails } from "../../shared/crossing-details-schemas";

const input = (details: Partial<CrossingDetails>): CrossingPlanInput => ({
  spanLength: { value: 1000, unit: "ft" },
  voltageKv: 138,
  details: { ...emptyCrossingDetails(), ...details },
});

describe("support-structure lights on a drawn span", () => {
  it("sit at the top, the catenary's lowest point and midway on each support", () => {
    // Supports 100 ft and 120 ft, conductor attached at 90 ft and 110 ft, lowest clearance 40 ft.
    const plan = crossingPlan(input({ supportHeightA: 100, supportHeightB: 120, attachmentHeightA: 90, attachmentHeightB: 110, sagKind: "lowest-clearance", sagValue: 40, surfaceLevel: 0 }));
    if (!plan.ok) throw new Error(JSON.stringify(plan.errors));
    const low = minimumClearance(plan.curve).height;
    expect(low).toBeCloseTo(40, 6);
    const at = (support: "A" | "B", level: string) => plan.supportLights.lights.find((l) => l.support === support && l.level === level)!.height;
    expect(at("A", "top")).toBe(100);
    expect(at("A", "bottom")).toBeCloseTo(40, 6);
    expect(at("A", "middle")).toBeCloseTo(70, 6);
    expect(at("B", "top")).toBe(120);
    expect(at("B", "middle")).toBeCloseTo(80, 6);
    expect(plan.supportLights.lights).toHaveLength(6);
  });

  it("flash middle, then top, then bottom, about 60 times a minute", () => {
    const lighting = supportStructureLighting({ supportTopA: 100, supportTopB: 100, lowestPoint: 30, unit: "ft" }, "faa");
    expect(lighting.sequence).toEqual(["middle", "top", "bottom"]);
    expect(lighting.flashesPerMinute).toBe(60);
    const orderA = lighting.lights.filter((l) => l.support === "A").sort((a, b) => a.flashOrder - b.flashOrder).map((l) => l.level);
    expect(orderA).toEqual(["middle", "top", "bottom"]);
    expect(lighting.references.map((r) => [r.key, r.status])).toEqual([
      ["faa.support-lights", "published"],
      ["faa.support-light-type", "unconfirmed"],
      ["faa.support-light-levels", "unconfirmed"],
    ]);
  });

  it("take the light type of the rule set (ICAO Type B: an unconfirmed rule, from memory)", () => {
    const icao = supportStructureLighting({ supportTopA: 60, supportTopB: 60, lowestPoint: 20, unit: "m" }, "icao");
    expect(icao.lightType).toContain("Type B");
    expect(icao.references.map((r) => [r.key, r.status])).toEqual([
      ["icao.support-lights", "unconfirmed"],
      ["icao.support-light-type", "unconfirmed"],
      ["icao.support-light-levels", "unconfirmed"],
    ]);
    // Shown to users as unconfirmed, with the way to confirm it.
    expect(statusWords(icao.references[1])).toBe("unconfirmed: not yet checked against the text of Annex 14 Vol. I ch. 6; confirm it in the rule book");
  });
});
