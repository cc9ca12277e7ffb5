import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { layoutMarkers } from "../../lib/markers";
import {
  conductorHeightAt,
  markerHeights,
  minimumClearance,
  solveCatenary,
  solveParabola,
  solveSpan,
  spanDrawing,
  type SpanCurve,
} from "../../lib/span";
import { spanGeometryInputSchema, type SpanGeometryInput } from "../../shared/marker-schemas";

const grid = (span: SpanCurve, steps = 400) =>
  Array.from({ length: steps + 1 }, (_, i) => (span.spanLength * i) / steps);

function maxRelativeHeightDifference(a: SpanCurve, b: SpanCurve): number {
  return Math.max(...grid(a).map((x) => Math.abs(conductorHeightAt(a, x) - conductorHeightAt(b, x)) / conductorHeightAt(b, x)));
}

describe("catenary solver", () => {
  it("passes through both attachments and meets the mid-span sag", () => {
    const input: SpanGeometryInput = {
      unit: "m",
      spanLength: 420,
      attachmentHeightA: 55,
      attachmentHeightB: 90,
      sag: { kind: "midspan-sag", value: 12 },
    };
    const span = solveCatenary(input);
    expect(conductorHeightAt(span, 0)).toBeCloseTo(55, 9);
    expect(conductorHeightAt(span, 420)).toBeCloseTo(90, 9);
    expect((55 + 90) / 2 - conductorHeightAt(span, 210)).toBeCloseTo(12, 9);
  });

  it("matches the closed form of a level span: sag = a(cosh(L/2a) − 1)", () => {
    const span = solveCatenary({ unit: "ft", spanLength: 1000, attachmentHeightA: 150, attachmentHeightB: 150, sag: { kind: "midspan-sag", value: 40 } });
    expect(span.parameter * (Math.cosh(1000 / (2 * span.parameter)) - 1)).toBeCloseTo(40, 9);
    expect(span.vertexX).toBeCloseTo(500, 9);
    expect(minimumClearance(span).height).toBeCloseTo(110, 9);
  });

  it("solves for a given lowest clearance, catenary and parabola alike", () => {
    const input: SpanGeometryInput = {
      unit: "m",
      spanLength: 600,
      attachmentHeightA: 70,
      attachmentHeightB: 45,
      sag: { kind: "lowest-clearance", value: 30 },
    };
    for (const span of [solveCatenary(input), solveParabola(input)]) {
      const lowest = minimumClearance(span);
      expect(lowest.height).toBeCloseTo(30, 6);
      const sampledMinimum = Math.min(...grid(span, 2000).map((x) => conductorHeightAt(span, x)));
      expect(sampledMinimum).toBeGreaterThanOrEqual(30 - 1e-6);
      expect(sampledMinimum).toBeLessThan(30 + 0.01);
    }
  });

  it("puts the lowest point at the lower support when the span is steep and tight", () => {
    const span = solveCatenary({ unit: "m", spanLength: 300, attachmentHeightA: 20, attachmentHeightB: 120, sag: { kind: "midspan-sag", value: 2 } });
    expect(span.vertexX).toBeLessThan(0);
    expect(minimumClearance(span)).toEqual({ x: 0, height: expect.closeTo(20, 9) });
  });

  it("holds the sag and the endpoints for any plausible span", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 20, max: 3000, noNaN: true }),
        fc.double({ min: 10, max: 300, noNaN: true }),
        fc.double({ min: 10, max: 300, noNaN: true }),
        fc.double({ min: 0.002, max: 0.3, noNaN: true }),
        (spanLength, heightA, heightB, sagRatio) => {
          const sag = sagRatio * spanLength;
          const span = solveCatenary({ unit: "m", spanLength, attachmentHeightA: heightA, attachmentHeightB: heightB, sag: { kind: "midspan-sag", value: sag } });
          const tolerance = 1e-7 * Math.max(spanLength, heightA, heightB);
          expect(Math.abs(conductorHeightAt(span, 0) - heightA)).toBeLessThan(tolerance);
          expect(Math.abs(conductorHeightAt(span, spanLength) - heightB)).toBeLessThan(tolerance);
          expect(Math.abs(span.midspanSag - sag)).toBeLessThan(tolerance);
        },
      ),
    );
  });
});

describe("catenary versus parabola", () => {
  const base = { unit: "m" as const, spanLength: 500, attachmentHeightA: 80, attachmentHeightB: 95 };

  it("agree within 0.5 % in height at every point when sag/span = 2 %", () => {
    const input: SpanGeometryInput = { ...base, sag: { kind: "midspan-sag", value: 0.02 * base.spanLength } };
    const difference = maxRelativeHeightDifference(solveCatenary(input), solveParabola(input));
    expect(difference).toBeLessThan(0.005);
  });

  it("differ measurably when the sag is large", () => {
    const input: SpanGeometryInput = {
      ...base,
      attachmentHeightA: 250,
      attachmentHeightB: 260,
      sag: { kind: "midspan-sag", value: 0.3 * base.spanLength },
    };
    const catenary = solveCatenary(input);
    const parabola = solveParabola(input);
    const largestGap = Math.max(...grid(catenary).map((x) => Math.abs(conductorHeightAt(catenary, x) - conductorHeightAt(parabola, x))));
    expect(largestGap).toBeGreaterThan(2); // metres, on 150 m of sag
    expect(maxRelativeHeightDifference(catenary, parabola)).toBeGreaterThan(0.005);
  });

  it("solveSpan picks the model", () => {
    const input: SpanGeometryInput = { ...base, sag: { kind: "midspan-sag", value: 10 } };
    expect(solveSpan(input).model).toBe("catenary");
    expect(solveSpan(input, "parabola").model).toBe("parabola");
  });
});

describe("marker heights and drawing", () => {
  const span = solveCatenary({ unit: "ft", spanLength: 1000, attachmentHeightA: 180, attachmentHeightB: 140, sag: { kind: "midspan-sag", value: 30 } });

  it("gives each marker's conductor height, converting the layout's unit", () => {
    const layout = layoutMarkers({ ruleSet: "faa", spanLength: { value: 304.8, unit: "m" } });
    const heights = markerHeights(span, layout.positions);
    expect(heights.map((h) => h.distanceFromSupportA)).toEqual([200, 400, 600, 800].map((x) => expect.closeTo(x, 6)));
    heights.forEach((h) => expect(h.height).toBeCloseTo(conductorHeightAt(span, h.distanceFromSupportA), 9));
  });

  it("keeps every drawn point inside the viewBox, supports at the ends, surface at the bottom", () => {
    const drawing = spanDrawing(span, { width: 600, height: 200, padding: 10, samples: 50, markerDistances: [200, 400, 600, 800] });
    expect(drawing.viewBox).toBe("0 0 600 200");
    expect(drawing.conductor).toHaveLength(50);
    for (const point of [...drawing.conductor, ...drawing.markers]) {
      expect(point.x).toBeGreaterThanOrEqual(10);
      expect(point.x).toBeLessThanOrEqual(590);
      expect(point.y).toBeGreaterThanOrEqual(10);
      expect(point.y).toBeLessThanOrEqual(190);
    }
    expect(drawing.conductor[0]).toEqual({ x: drawing.supports.a.x, y: drawing.supports.a.top });
    expect(drawing.conductor[49]).toEqual({ x: drawing.supports.b.x, y: drawing.supports.b.top });
    expect(drawing.surface.y).toBe(190);
    // Higher support A is drawn higher (smaller y) than support B.
    expect(drawing.supports.a.top).toBeLessThan(drawing.supports.b.top);
    expect(drawing.conductorPoints.split(" ")).toHaveLength(50);
  });

  it("uses one scale for both axes when asked for a true-proportion elevation", () => {
    const drawing = spanDrawing(span, { aspect: "equal" });
    expect(drawing.scale.x).toBe(drawing.scale.y);
  });
});

describe("span input schema", () => {
  it("refuses a lowest clearance at or above the lower attachment", () => {
    const result = spanGeometryInputSchema.safeParse({
      unit: "m",
      spanLength: 300,
      attachmentHeightA: 40,
      attachmentHeightB: 60,
      sag: { kind: "lowest-clearance", value: 45 },
    });
    expect(result.success).toBe(false);
  });
});
