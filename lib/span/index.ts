// Span geometry (catenary and parabola) and the elevation drawing: the entry point of lib/span.
export {
  solveCatenary,
  solveParabola,
  solveSpan,
  conductorHeightAt,
  minimumClearance,
  markerHeights,
  type CatenarySpan,
  type ParabolaSpan,
  type SpanCurve,
  type SpanModel,
  type MarkerHeight,
} from "./geometry";
export { spanDrawing, type SpanDrawing, type SpanDrawingOptions, type SvgPoint } from "./drawing";
