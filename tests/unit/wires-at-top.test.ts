// Several wires at the highest point. FAA: markers may go alternately on each wire if the
// distance between adjacent markers meets the spacing standard [from memory (AC 70/7460-1K
// ¶34.a(2)(a)): shipped as the unconfirmed rule faa.top-wires]. ICAO: Duskline's working rule marks
// each wire at the layout's positions [unconfirmed: icao.top-wires]. Spacing 200 ft (FAA) and 30 m
// at 60 cm spheres (ICAO) [published: AC 70/7460-1K ¶34.a(2)(a); Annex 14 Vol. I ch. 6].
import { describe, expect, it } from "vitest";
import { layoutMarkers } from "../../lib/markers";

const faa = (wiresAtTop?: { count: number; separation?: { value: number; unit: "ft" | "m" } }) =>
  layoutMarkers({ ruleSet: "faa", spanLength: { value: 1000, unit: "ft" }, ...(wiresAtTop ? { wiresAtTop } : {}) });

describe("several wires at the highest point (unconfirmed rules, from memory)", () => {
  it("one wire: 1,000 ft at ≤ 200 ft is 5 intervals, 4 markers, all on wire 1", () => {
    const layout = faa();
    expect(layout.count).toBe(4);
    expect(layout.wiresAtTop).toEqual({ count: 1, method: "single", markersPerWire: [4] });
    expect(layout.references.map((r) => r.key)).not.toContain("faa.top-wires");
  });

  it("FAA alternates between two wires 40 ft apart, adding a marker so wire-to-wire distances stay within 200 ft", () => {
    const layout = faa({ count: 2, separation: { value: 40, unit: "ft" } });
    // Along the span at most √(200² − 40²) = √38,400 = 195.96 ft: ⌈1000 / 195.96⌉ = 6 intervals → 5 markers
    // 166.67 ft apart along the span, √(166.67² + 40²) = 171.40 ft from wire to wire.
    expect(layout.count).toBe(5);
    expect(layout.intervals).toBe(6);
    expect(layout.positions.map((p) => p.wire)).toEqual([1, 2, 1, 2, 1]);
    expect(layout.wiresAtTop).toEqual({ count: 2, method: "alternate", markersPerWire: [3, 2] });
    expect(layout.wire).toBe("the 2 wires at the highest point, alternately");
    expect(layout.notes.join(" ")).toContain("Adjacent markers are 171.4 ft apart from wire to wire (166.7 ft along the span, 40 ft across), within the 200 ft maximum.");
    const rule = layout.references.find((r) => r.key === "faa.top-wires")!;
    expect(rule.status).toBe("unconfirmed");
  });

  it("FAA without a stated separation alternates at the single-wire count and says the check is along the span only", () => {
    const layout = faa({ count: 2 });
    expect(layout.count).toBe(4);
    expect(layout.wiresAtTop.markersPerWire).toEqual([2, 2]);
    expect(layout.notes.join(" ")).toContain("separation is not stated");
  });

  it("FAA marks every wire when they are as far apart as the maximum spacing (markers cannot alternate)", () => {
    const layout = faa({ count: 3, separation: { value: 61, unit: "m" } }); // 61 m = 200.13 ft ≥ 200 ft
    expect(layout.count).toBe(12); // 4 positions × 3 wires
    expect(layout.wiresAtTop).toEqual({ count: 3, method: "each", markersPerWire: [4, 4, 4] });
    expect(layout.positions.slice(0, 3).map((p) => [p.wire, p.distanceFromSupportA.value])).toEqual([
      [1, 200],
      [2, 200],
      [3, 200],
    ]);
  });

  it("ICAO marks each of the wires at the same positions with the same colours", () => {
    // 600 m at ≤ 30 m: 20 intervals → 19 markers per wire, 38 on two wires.
    const layout = layoutMarkers({ ruleSet: "icao", spanLength: { value: 600, unit: "m" }, wiresAtTop: { count: 2, separation: { value: 12, unit: "m" } } });
    expect(layout.count).toBe(38);
    expect(layout.intervals).toBe(20);
    expect(layout.wiresAtTop).toEqual({ count: 2, method: "each", markersPerWire: [19, 19] });
    const onWire = (w: number) => layout.positions.filter((p) => p.wire === w).map((p) => p.colour);
    expect(onWire(2)).toEqual(onWire(1));
    expect(layout.references.find((r) => r.key === "icao.top-wires")?.status).toBe("unconfirmed");
  });

  it("refuses a wire count out of range, naming the field", () => {
    expect(() => faa({ count: 0 })).toThrow(/wiresAtTop\.count: At least one wire/);
  });
});

describe("ICAO placement (unconfirmed rule, from memory: not lower than the highest wire at the point marked)", () => {
  it("is a rule-book entry of its own that every ICAO layout cites", () => {
    const layout = layoutMarkers({ ruleSet: "icao", spanLength: { value: 300, unit: "m" } });
    const placement = layout.references.find((r) => r.key === "icao.placement")!;
    expect(placement.rule).toBe("Markers are placed not lower than the highest wire at the point marked");
    expect([placement.document, placement.status]).toEqual(["Annex 14 Vol. I", "unconfirmed"]);
  });
});
