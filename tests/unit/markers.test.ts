import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  faaColourSequence,
  icaoColourSequence,
  layoutMarkers,
  litMarkerSuitability,
  markerLayoutRequestRulesSchema,
  MarkerLayoutValidationError,
  minimumMarkerCount,
  parseMarkerLayoutRequest,
} from "../../lib/markers";
import { markerLayoutRequestSchema, markerLayoutResponseSchema } from "../../shared/marker-schemas";
import { convertLength, toMetres } from "../../shared/units";
import faaRules from "../../data/rules/faa.json";
import icaoRules from "../../data/rules/icao.json";

const colours = (layout: ReturnType<typeof layoutMarkers>) => layout.positions.map((p) => p.colour);

describe("worked marker checks (tests/reference/markers.md)", () => {
  // FAA spacing ≤ 200 ft [published: AC 70/7460-1K ¶34.a(2)(a)];
  // colour order and all-orange below four [from memory (AC 70/7460-1K ¶34.a(2)(b))].
  it("FAA 1,000 ft: 5 intervals, 4 markers orange–white–yellow–orange", () => {
    const layout = layoutMarkers({ ruleSet: "faa", spanLength: { value: 1000, unit: "ft" } });
    expect(layout.count).toBe(4);
    expect(layout.intervals).toBe(5);
    expect(colours(layout)).toEqual(["orange", "white", "yellow", "orange"]);
    expect(layout.positions.map((p) => p.distanceFromSupportA.value)).toEqual([200, 400, 600, 800]);
    expect(layout.markerDiameter).toEqual({ value: 36, unit: "in" });
  });

  it("FAA 450 ft: 3 intervals, 2 markers, both orange (fewer than four)", () => {
    const layout = layoutMarkers({ ruleSet: "faa", spanLength: { value: 450, unit: "ft" } });
    expect(layout.count).toBe(2);
    expect(layout.spacing.value).toBeCloseTo(150, 9);
    expect(colours(layout)).toEqual(["orange", "orange"]);
  });

  // 30–50 ft in critical areas near runway ends [published: AC 70/7460-1K ¶34.a(2)(a)].
  it("FAA 300 ft in a runway-end critical area (50 ft): 5 markers", () => {
    const layout = layoutMarkers({ ruleSet: "faa", spanLength: { value: 300, unit: "ft" }, runwayEndCriticalArea: true });
    expect(layout.maxSpacing).toEqual({ value: 50, unit: "ft" });
    expect(layout.count).toBe(5);
    expect(colours(layout)[0]).toBe("orange");
    expect(colours(layout)[4]).toBe("orange");
  });

  // 30 m at 60 cm [published: Annex 14 as transposed in French arrêté of 23 April 2018, §5.2.1];
  // 35 m at 80 cm and 40 m at ≥ 130 cm [from memory (Annex 14 Vol. I ch. 6)].
  it.each([
    [60, 9, 30],
    [80, 8, 35],
    [130, 7, 40],
  ])("ICAO 300 m with %i cm spheres: %i markers (max %i m)", (diameterCm, expectedCount, expectedMax) => {
    const layout = layoutMarkers({
      ruleSet: "icao",
      spanLength: { value: 300, unit: "m" },
      markerDiameter: { value: diameterCm, unit: "cm" },
    });
    expect(layout.count).toBe(expectedCount);
    expect(layout.maxSpacing.value).toBeCloseTo(expectedMax, 9);
    expect(layout.maxSpacingInterpolated).toBe(false);
  });
});

describe("rule tables", () => {
  it("carry a document, a paragraph and a status from docs/check-values.md beside every value", () => {
    const entries = [
      faaRules.markerDiameter.standard,
      faaRules.markerDiameter.reduced,
      faaRules.maxSpacing.standard,
      faaRules.maxSpacing.runwayEndCriticalArea,
      faaRules.placement,
      faaRules.colours,
      faaRules.colourSequence,
      faaRules.litMarkers,
      icaoRules.markerDiameter.minimum,
      ...icaoRules.maxSpacingByDiameter,
      icaoRules.interpolation,
      icaoRules.colours,
    ];
    for (const entry of entries) {
      expect(entry.document.length).toBeGreaterThan(0);
      expect(["published", "unconfirmed", "common practice"]).toContain(entry.status);
    }
    expect(new Set(entries.map((e) => e.key)).size).toBe(entries.length);
    // Recalled values ship as "unconfirmed", never as published.
    expect(faaRules.colourSequence.status).toBe("unconfirmed");
    expect(faaRules.litMarkers.status).toBe("unconfirmed");
    // ICAO 30 / 35 / 40 m checked against the published text (issue 11: Annex 14 Vol. I ch. 6).
    expect(icaoRules.maxSpacingByDiameter.map((row) => row.status)).toEqual(["published", "published", "published"]);
  });
});

describe("ICAO interpolation", () => {
  it("interpolates linearly between tabulated diameters and says so", () => {
    const layout = layoutMarkers({
      ruleSet: "icao",
      spanLength: { value: 300, unit: "m" },
      markerDiameter: { value: 105, unit: "cm" },
    });
    // Halfway between 80 cm (35 m) and 130 cm (40 m).
    expect(layout.maxSpacing.value).toBeCloseTo(37.5, 9);
    expect(layout.maxSpacingInterpolated).toBe(true);
    expect(layout.notes.some((note) => note.includes("interpolated"))).toBe(true);
  });

  it("holds 40 m above 130 cm and defaults to 60 cm spheres", () => {
    const big = layoutMarkers({ ruleSet: "icao", spanLength: { value: 300, unit: "m" }, markerDiameter: { value: 150, unit: "cm" } });
    expect(big.maxSpacing.value).toBeCloseTo(40, 9);
    const standard = layoutMarkers({ ruleSet: "icao", spanLength: { value: 300, unit: "m" } });
    expect(standard.markerDiameter).toEqual({ value: 60, unit: "cm" });
    expect(standard.count).toBe(9);
  });

  it("alternates white with the chosen colour", () => {
    const orange = layoutMarkers({ ruleSet: "icao", spanLength: { value: 100, unit: "m" }, icaoColour: "orange" });
    expect(colours(orange)).toEqual(["orange", "white", "orange"]);
    expect(icaoColourSequence(4, "red")).toEqual(["red", "white", "red", "white"]);
  });
});

describe("validation", () => {
  it("refuses a user maximum looser than the rule, with a clear message on maxSpacing", () => {
    const result = parseMarkerLayoutRequest({
      ruleSet: "faa",
      spanLength: { value: 1000, unit: "ft" },
      maxSpacing: { value: 250, unit: "ft" },
    });
    expect(result.success).toBe(false);
    if (result.success) return;
    expect(result.errors[0].path).toBe("maxSpacing");
    expect(result.errors[0].message).toMatch(/looser than the rule's 200 ft/);
    expect(() =>
      layoutMarkers({ ruleSet: "faa", spanLength: { value: 1000, unit: "ft" }, maxSpacing: { value: 250, unit: "ft" } }),
    ).toThrow(MarkerLayoutValidationError);
  });

  it("refuses 60 ft in a runway-end critical area but accepts a tighter 40 ft", () => {
    const loose = parseMarkerLayoutRequest({
      ruleSet: "faa",
      spanLength: { value: 300, unit: "ft" },
      runwayEndCriticalArea: true,
      maxSpacing: { value: 60, unit: "ft" },
    });
    expect(loose.success).toBe(false);
    const tight = layoutMarkers({
      ruleSet: "faa",
      spanLength: { value: 300, unit: "ft" },
      runwayEndCriticalArea: true,
      maxSpacing: { value: 40, unit: "ft" },
    });
    expect(tight.maxSpacingSource).toBe("user");
    expect(tight.count).toBe(7); // 300 / 40 = 7.5 → 8 intervals
  });

  it("accepts a tighter limit in the other unit system and reports it in the span's unit", () => {
    const layout = layoutMarkers({
      ruleSet: "faa",
      spanLength: { value: 1000, unit: "ft" },
      maxSpacing: { value: 30, unit: "m" },
    });
    expect(layout.maxSpacing.unit).toBe("ft");
    expect(layout.maxSpacing.value).toBeCloseTo(30 / 0.3048, 9);
    expect(layout.count).toBe(10); // 1000 ft / 98.43 ft = 10.16 → 11 intervals
  });

  it("accepts a limit equal to the rule's after unit conversion", () => {
    const layout = layoutMarkers({ ruleSet: "faa", spanLength: { value: 1000, unit: "ft" }, maxSpacing: { value: 60.96, unit: "m" } });
    expect(layout.count).toBe(4);
  });

  it("refuses spheres below the rule's minimum", () => {
    const icao = parseMarkerLayoutRequest({ ruleSet: "icao", spanLength: { value: 300, unit: "m" }, markerDiameter: { value: 50, unit: "cm" } });
    expect(icao.success).toBe(false);
    if (!icao.success) expect(icao.errors[0]).toMatchObject({ path: "markerDiameter" });
    const faa = parseMarkerLayoutRequest({ ruleSet: "faa", spanLength: { value: 300, unit: "ft" }, markerDiameter: { value: 18, unit: "in" } });
    expect(faa.success).toBe(false);
  });

  it("notes where 20 in spheres are allowed", () => {
    const layout = layoutMarkers({ ruleSet: "faa", spanLength: { value: 600, unit: "ft" }, markerDiameter: { value: 20, unit: "in" } });
    expect(layout.markerDiameter).toEqual({ value: 20, unit: "in" });
    expect(layout.notes.join(" ")).toMatch(/less extensive lines/);
  });

  it("rejects bad structure through the shared schema and the rules schema alike", () => {
    const bad = { ruleSet: "faa", spanLength: { value: -5, unit: "yd" } };
    expect(markerLayoutRequestSchema.safeParse(bad).success).toBe(false);
    expect(markerLayoutRequestRulesSchema.safeParse(bad).success).toBe(false);
  });

  it("produces responses that match the published response schema", () => {
    const layout = layoutMarkers({
      ruleSet: "faa",
      spanLength: { value: 2000, unit: "ft" },
      lit: true,
      litConditions: { highestWireEnergized: true, voltageKv: 138 },
    });
    expect(markerLayoutResponseSchema.safeParse(layout).success).toBe(true);
  });
});

describe("FAA colour sequence", () => {
  it("is all orange below four markers", () => {
    expect(faaColourSequence(1)).toEqual(["orange"]);
    expect(faaColourSequence(3)).toEqual(["orange", "orange", "orange"]);
  });

  it("keeps orange at both ends and never repeats a colour side by side from four markers up", () => {
    for (let count = 4; count <= 40; count++) {
      const sequence = faaColourSequence(count);
      expect(sequence[0]).toBe("orange");
      expect(sequence[count - 1]).toBe("orange");
      for (let i = 1; i < count; i++) expect(sequence[i]).not.toBe(sequence[i - 1]);
      expect(new Set(sequence)).toEqual(new Set(["orange", "white", "yellow"]));
    }
    expect(faaColourSequence(5)).toEqual(["orange", "white", "yellow", "white", "orange"]);
    expect(faaColourSequence(7)).toEqual(["orange", "white", "yellow", "orange", "white", "yellow", "orange"]);
  });
});

describe("lit markers", () => {
  // About 20 ft (6 m) from the highest wire [from memory (AC 70/7460-1L)]: an unconfirmed rule.
  it("are suitable on an energized highest wire (unconfirmed rule)", () => {
    const result = litMarkerSuitability({ ruleSet: "faa", highestWireEnergized: true, voltageKv: 230 });
    expect(result.suitable).toBe(true);
    expect(result.references[0].status).toBe("unconfirmed");
  });

  it("are suitable under a shield wire when the conductor is within about 20 ft", () => {
    const result = litMarkerSuitability({
      ruleSet: "faa",
      highestWireEnergized: false,
      verticalSeparation: { value: 15, unit: "ft" },
    });
    expect(result.suitable).toBe(true);
    expect(result.reasons.join(" ")).toMatch(/unlit spheres stay on it/);
  });

  it("are not suitable under FAA when the energized conductor is further below the shield wire, and say why (unconfirmed rule)", () => {
    const result = litMarkerSuitability({
      ruleSet: "faa",
      highestWireEnergized: false,
      verticalSeparation: { value: 9, unit: "m" },
    });
    expect(result.suitable).toBe(false);
    expect(result.reasons.join(" ")).toMatch(/not suitable.*shield wire.*9 m/);
  });

  // Under ICAO the national rule: lights not lower than the highest live conductor, at most
  // 70 m apart [published: French arrêté of 23 April 2018 §5.2.2]; the FAA figures do not apply.
  it("follow the national rule under ICAO, not the FAA's 69 kV and 20 ft figures", () => {
    const result = litMarkerSuitability({ ruleSet: "icao", highestWireEnergized: false, verticalSeparation: { value: 9, unit: "m" }, voltageKv: 34.5 });
    expect(result.suitable).toBe(true);
    expect(result.references.map((r) => r.key)).toEqual(["icao.lit-markers"]);
    expect(result.reasons.join(" ")).toContain("not lower than the highest live conductor, at most 70 m");
    expect(result.reasons.join(" ")).not.toMatch(/69 kV|20 ft/);
    const layout = layoutMarkers({ ruleSet: "icao", spanLength: { value: 300, unit: "m" }, lit: true, litConditions: { highestWireEnergized: true } });
    expect(layout.references.map((r) => r.key)).not.toContain("faa.lit-markers");
    expect(layout.positions.every((p) => p.lit)).toBe(true);
  });

  it("are not suitable when the separation under a shield wire is unknown, or below 69 kV under FAA", () => {
    expect(litMarkerSuitability({ ruleSet: "faa", highestWireEnergized: false }).suitable).toBe(false);
    const low = litMarkerSuitability({ ruleSet: "faa", highestWireEnergized: true, voltageKv: 34.5 });
    expect(low.suitable).toBe(false);
    expect(low.reasons.join(" ")).toMatch(/69 kV/);
  });

  it("light every position when requested and suitable, none when unsuitable", () => {
    const base = { ruleSet: "faa" as const, spanLength: { value: 1000, unit: "ft" as const }, lit: true };
    const suitable = layoutMarkers({ ...base, litConditions: { highestWireEnergized: true } });
    expect(suitable.positions.every((p) => p.lit)).toBe(true);
    const unsuitable = layoutMarkers({
      ...base,
      litConditions: { highestWireEnergized: false, verticalSeparation: { value: 40, unit: "ft" } },
    });
    expect(unsuitable.positions.some((p) => p.lit)).toBe(false);
    expect(unsuitable.litSuitability?.suitable).toBe(false);
    const unchecked = layoutMarkers(base);
    expect(unchecked.positions.every((p) => p.lit)).toBe(true);
    expect(unchecked.notes.join(" ")).toMatch(/not checked/);
    const unlit = layoutMarkers({ ...base, lit: false });
    expect(unlit.positions.some((p) => p.lit)).toBe(false);
  });
});

describe("layout properties", () => {
  const faaRequest = fc.record({
    ruleSet: fc.constant("faa" as const),
    spanLength: fc.record({ value: fc.double({ min: 1, max: 20_000, noNaN: true }), unit: fc.constant("ft" as const) }),
    runwayEndCriticalArea: fc.boolean(),
  });
  const icaoRequest = fc.record({
    ruleSet: fc.constant("icao" as const),
    spanLength: fc.record({ value: fc.double({ min: 1, max: 6_000, noNaN: true }), unit: fc.constant("m" as const) }),
    markerDiameter: fc.record({ value: fc.double({ min: 60, max: 200, noNaN: true }), unit: fc.constant("cm" as const) }),
  });
  const anyRequest = fc.oneof(faaRequest, icaoRequest);

  it("never lets an interval exceed the maximum spacing", () => {
    fc.assert(
      fc.property(anyRequest, (request) => {
        const layout = layoutMarkers(request);
        const stops = [0, ...layout.positions.map((p) => p.distanceFromSupportA.value), request.spanLength.value];
        for (let i = 1; i < stops.length; i++) {
          // Slack for float rounding only: lengths pass through unit conversion.
          expect(stops[i] - stops[i - 1]).toBeLessThanOrEqual(layout.maxSpacing.value * (1 + 1e-8));
          expect(stops[i] - stops[i - 1]).toBeGreaterThan(0);
        }
      }),
    );
  });

  it("uses the fewest markers: one fewer, equally spaced, would break the rule", () => {
    fc.assert(
      fc.property(anyRequest, (request) => {
        const layout = layoutMarkers(request);
        if (layout.count === 1) {
          // One marker is the floor; only then may the span fit in a single interval.
          expect(request.spanLength.value / 2).toBeLessThanOrEqual(layout.maxSpacing.value * (1 + 1e-8));
          return;
        }
        const fewerSpacing = request.spanLength.value / layout.count;
        expect(fewerSpacing).toBeGreaterThan(layout.maxSpacing.value * (1 - 1e-9));
      }),
    );
  });

  it("gives the same layout in feet and in metres", () => {
    fc.assert(
      fc.property(anyRequest, fc.boolean(), (request, lit) => {
        const inOwnUnit = layoutMarkers({ ...request, lit });
        const otherUnit = request.spanLength.unit === "ft" ? "m" : "ft";
        const converted = layoutMarkers({ ...request, lit, spanLength: convertLength(request.spanLength, otherUnit) });
        expect(converted.count).toBe(inOwnUnit.count);
        expect(converted.positions.map((p) => p.colour)).toEqual(inOwnUnit.positions.map((p) => p.colour));
        expect(converted.positions.map((p) => p.lit)).toEqual(inOwnUnit.positions.map((p) => p.lit));
        inOwnUnit.positions.forEach((position, i) => {
          const a = toMetres(position.distanceFromSupportA);
          const b = toMetres(converted.positions[i].distanceFromSupportA);
          expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * Math.max(1, a));
        });
        expect(toMetres(converted.markerDiameter)).toBeCloseTo(toMetres(inOwnUnit.markerDiameter), 9);
      }),
    );
  });

  it("minimumMarkerCount: k whole spacings need k − 1 markers, any part of one more needs k", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 100, noNaN: true }),
        fc.integer({ min: 1, max: 200 }),
        fc.option(fc.double({ min: 0.001, max: 0.999, noNaN: true }), { nil: 0 }),
        (max, wholeSpacings, part) => {
          const span = max * (wholeSpacings + part);
          const intervals = part === 0 ? wholeSpacings : wholeSpacings + 1;
          expect(minimumMarkerCount(span, max)).toBe(Math.max(1, intervals - 1));
        },
      ),
    );
  });
});
