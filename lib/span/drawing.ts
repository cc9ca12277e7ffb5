// SVG-ready coordinates for a span elevation: conductor polyline, supports, surface, markers.
// Pure numbers in viewBox units (y grows downwards, as in SVG); the page draws them.
import { conductorHeightAt, type SpanCurve } from "./geometry";

export interface SpanDrawingOptions {
  /** viewBox width and height (default 800 × 300). */
  width?: number;
  height?: number;
  /** Margin kept clear on every side (default 24). */
  padding?: number;
  /** Points along the conductor (default 101, at least 2). */
  samples?: number;
  /**
   * `fit` (default) scales each axis to fill the box, which exaggerates sag on long, tight spans;
   * `equal` uses one scale for both axes (a true-proportion elevation).
   */
  aspect?: "fit" | "equal";
  /** Marker distances from support A, in the span's unit. */
  markerDistances?: readonly number[];
}

export interface SvgPoint {
  x: number;
  y: number;
}

export interface SpanDrawing {
  viewBox: string;
  width: number;
  height: number;
  /** Conductor polyline from support A to support B. */
  conductor: SvgPoint[];
  /** The same points as an SVG `points` attribute ("x,y x,y …"). */
  conductorPoints: string;
  /** Ground/water line at height 0. */
  surface: { x1: number; x2: number; y: number };
  supports: { a: { x: number; top: number; base: number }; b: { x: number; top: number; base: number } };
  markers: SvgPoint[];
  /** viewBox units per span length unit, horizontally and vertically. */
  scale: { x: number; y: number };
}

const round = (value: number) => Math.round(value * 100) / 100;

export function spanDrawing(span: SpanCurve, options: SpanDrawingOptions = {}): SpanDrawing {
  const width = options.width ?? 800;
  const height = options.height ?? 300;
  const padding = options.padding ?? 24;
  const samples = Math.max(2, Math.floor(options.samples ?? 101));
  const innerWidth = width - 2 * padding;
  const innerHeight = height - 2 * padding;

  const xs = Array.from({ length: samples }, (_, i) => (span.spanLength * i) / (samples - 1));
  const heights = xs.map((x) => conductorHeightAt(span, x));
  // The box spans from the surface (or a conductor dipping below it) to the highest point.
  const top = Math.max(span.attachmentHeightA, span.attachmentHeightB, ...heights);
  const bottom = Math.min(0, ...heights);
  let scaleX = innerWidth / span.spanLength;
  let scaleY = innerHeight / (top - bottom);
  if (options.aspect === "equal") scaleX = scaleY = Math.min(scaleX, scaleY);
  const offsetX = padding + (innerWidth - span.spanLength * scaleX) / 2;

  const toX = (x: number) => round(offsetX + x * scaleX);
  const toY = (h: number) => round(height - padding - (h - bottom) * scaleY);

  const conductor = xs.map((x, i) => ({ x: toX(x), y: toY(heights[i]) }));
  const markers = (options.markerDistances ?? []).map((x) => ({ x: toX(x), y: toY(conductorHeightAt(span, x)) }));
  return {
    viewBox: `0 0 ${width} ${height}`,
    width,
    height,
    conductor,
    conductorPoints: conductor.map((p) => `${p.x},${p.y}`).join(" "),
    surface: { x1: toX(0), x2: toX(span.spanLength), y: toY(0) },
    supports: {
      a: { x: toX(0), top: toY(span.attachmentHeightA), base: toY(0) },
      b: { x: toX(span.spanLength), top: toY(span.attachmentHeightB), base: toY(0) },
    },
    markers,
    scale: { x: scaleX, y: scaleY },
  };
}
