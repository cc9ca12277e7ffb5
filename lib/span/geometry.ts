// Conductor shape across one span: an exact catenary and the usual parabolic approximation.
// x runs horizontally from support A (0) to support B (spanLength); heights are above the
// ground or water surface under the span, taken as level at 0. One length unit throughout.
import type { SagSpec, SpanGeometryInput } from "../../shared/marker-schemas";
import { convertLength, type DistanceUnit } from "../../shared/units";

interface SpanBase {
  unit: DistanceUnit;
  spanLength: number;
  attachmentHeightA: number;
  attachmentHeightB: number;
  /** Vertical distance at mid-span from the chord joining the attachments down to the conductor. */
  midspanSag: number;
}

/** y(x) = vertexHeight + parameter·(cosh((x − vertexX)/parameter) − 1); the vertex may lie outside the span. */
export interface CatenarySpan extends SpanBase {
  model: "catenary";
  /** Catenary parameter a = horizontal tension / weight per unit length, in the span's unit. */
  parameter: number;
  vertexX: number;
  vertexHeight: number;
}

/** y(x) = hA + (hB − hA)·t − 4·sag·t·(1 − t), t = x / spanLength. */
export interface ParabolaSpan extends SpanBase {
  model: "parabola";
}

export type SpanCurve = CatenarySpan | ParabolaSpan;
export type SpanModel = SpanCurve["model"];

/** cosh(u) − 1 without cancellation for small u. */
function coshMinusOne(u: number): number {
  const s = Math.sinh(u / 2);
  return 2 * s * s;
}

function catenaryShape(spanLength: number, heightA: number, heightB: number, parameter: number) {
  const a = parameter;
  const rise = heightB - heightA;
  const vertexX = spanLength / 2 - a * Math.asinh(rise / (2 * a * Math.sinh(spanLength / (2 * a))));
  const vertexHeight = heightA - a * coshMinusOne(vertexX / a);
  return { vertexX, vertexHeight };
}

function catenaryHeight(a: number, vertexX: number, vertexHeight: number, x: number): number {
  return vertexHeight + a * coshMinusOne((x - vertexX) / a);
}

/**
 * Find x in (lo, hi) with f(x) = 0 for f monotone, by bisection on a logarithmic scale
 * (both bounds positive). The bracket is widened first until it holds the root.
 */
function solveMonotoneLog(f: (x: number) => number, guess: number): number {
  let lo = guess;
  let hi = guess;
  const signAt = (x: number) => Math.sign(f(x));
  const target = -signAt(guess);
  if (target === 0) return guess;
  // Walk outwards in both directions until the sign changes.
  for (let i = 0; i < 200 && signAt(hi) !== target && signAt(lo) !== target; i++) {
    lo /= 2;
    hi *= 2;
  }
  if (signAt(hi) === target) lo = hi / 2;
  else if (signAt(lo) === target) hi = lo * 2;
  else throw new RangeError("No solution found for the span's sag");
  const signLo = signAt(lo);
  for (let i = 0; i < 200 && hi / lo - 1 > 1e-14; i++) {
    const mid = Math.sqrt(lo * hi);
    if (signAt(mid) === signLo) lo = mid;
    else hi = mid;
  }
  return Math.sqrt(lo * hi);
}

function lowestPoint(span: SpanCurve): { x: number; height: number } {
  if (span.model === "catenary") {
    const x = Math.min(Math.max(span.vertexX, 0), span.spanLength);
    return { x, height: catenaryHeight(span.parameter, span.vertexX, span.vertexHeight, x) };
  }
  const rise = span.attachmentHeightB - span.attachmentHeightA;
  const sag = span.midspanSag;
  const t = sag > 0 ? Math.min(Math.max((4 * sag - rise) / (8 * sag), 0), 1) : rise >= 0 ? 0 : 1;
  return { x: t * span.spanLength, height: conductorHeightAt(span, t * span.spanLength) };
}

function baseOf(input: SpanGeometryInput): Omit<SpanBase, "midspanSag"> {
  return {
    unit: input.unit,
    spanLength: input.spanLength,
    attachmentHeightA: input.attachmentHeightA,
    attachmentHeightB: input.attachmentHeightB,
  };
}

function chordMidHeight(input: Omit<SpanBase, "midspanSag">): number {
  return (input.attachmentHeightA + input.attachmentHeightB) / 2;
}

/** Solve the catenary through both attachments with the given mid-span sag or lowest clearance. */
export function solveCatenary(input: SpanGeometryInput): CatenarySpan {
  const base = baseOf(input);
  const { spanLength: L, attachmentHeightA: hA, attachmentHeightB: hB } = base;
  const build = (parameter: number): CatenarySpan => {
    const { vertexX, vertexHeight } = catenaryShape(L, hA, hB, parameter);
    const midspanSag = chordMidHeight(base) - catenaryHeight(parameter, vertexX, vertexHeight, L / 2);
    return { model: "catenary", ...base, midspanSag, parameter, vertexX, vertexHeight };
  };
  const residual = residualFor(input.sag, build);
  const guessSag = input.sag.kind === "midspan-sag" ? input.sag.value : Math.min(hA, hB) - input.sag.value;
  const parameter = solveMonotoneLog(residual, (L * L) / (8 * Math.max(guessSag, 1e-9 * L)));
  return build(parameter);
}

/** Parabolic approximation through both attachments with the given mid-span sag or lowest clearance. */
export function solveParabola(input: SpanGeometryInput): ParabolaSpan {
  const base = baseOf(input);
  const build = (midspanSag: number): ParabolaSpan => ({ model: "parabola", ...base, midspanSag });
  if (input.sag.kind === "midspan-sag") return build(input.sag.value);
  // Lowest clearance falls as the sag grows: solve for the sag.
  const clearance = input.sag.value;
  const sag = solveMonotoneLog(
    (s) => clearance - lowestPoint(build(s)).height,
    Math.min(base.attachmentHeightA, base.attachmentHeightB) - clearance,
  );
  return build(sag);
}

/** Residual that changes sign at the catenary parameter meeting the sag specification. */
function residualFor(spec: SagSpec, build: (parameter: number) => CatenarySpan): (parameter: number) => number {
  if (spec.kind === "midspan-sag") return (parameter) => build(parameter).midspanSag - spec.value;
  return (parameter) => spec.value - lowestPoint(build(parameter)).height;
}

export function solveSpan(input: SpanGeometryInput, model: SpanModel = "catenary"): SpanCurve {
  return model === "catenary" ? solveCatenary(input) : solveParabola(input);
}

/** Conductor height above the ground/water surface at horizontal distance x from support A. */
export function conductorHeightAt(span: SpanCurve, x: number): number {
  if (span.model === "catenary") return catenaryHeight(span.parameter, span.vertexX, span.vertexHeight, x);
  const t = x / span.spanLength;
  const rise = span.attachmentHeightB - span.attachmentHeightA;
  return span.attachmentHeightA + rise * t - 4 * span.midspanSag * t * (1 - t);
}

/** The lowest conductor point within the span and its clearance above the ground/water surface. */
export function minimumClearance(span: SpanCurve): { x: number; height: number } {
  return lowestPoint(span);
}

export interface MarkerHeight {
  index: number;
  distanceFromSupportA: number;
  height: number;
}

/**
 * Heights of markers on the conductor. Positions are distances from support A with their
 * unit (as `layoutMarkers` returns them) and are converted to the span's unit.
 */
export function markerHeights(
  span: SpanCurve,
  positions: ReadonlyArray<{ index: number; distanceFromSupportA: { value: number; unit: DistanceUnit } }>,
): MarkerHeight[] {
  return positions.map((position) => {
    const x = convertLength(position.distanceFromSupportA, span.unit).value;
    return { index: position.index, distanceFromSupportA: x, height: conductorHeightAt(span, x) };
  });
}
