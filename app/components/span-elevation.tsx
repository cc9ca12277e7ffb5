import { useId } from "react";
import type { SpanFigures } from "../../lib/crossings/plan";
import { conductorHeightAt, minimumClearance, spanDrawing, type SpanCurve } from "../../lib/span";
import type { SupportLighting } from "../../lib/markers/support-lights";
import type { MarkerColour, MarkerLayout } from "../../shared/marker-schemas";
import { convertLength, formatLength } from "../../shared/units";

// Sphere colours as painted (aviation orange, white, yellow, red); markers are drawn at a fixed
// size, not to scale, so they stay visible on long spans.
export const SPHERE_FILL: Record<MarkerColour, string> = { orange: "#ff7a1a", white: "#f4f4f4", yellow: "#ffd21f", red: "#e0302b" };

const WIDTH = 800;
const HEIGHT = 300;
const PADDING = 56;
const MARKER_RADIUS = 7;

// Dark on screen, black on white when printed.
const STYLE = `
.se-bg{fill:#0c1328}.se-line{stroke:#c3cbe6}.se-text{fill:#c3cbe6;font:12px Inter,ui-sans-serif,sans-serif}
.se-dim{stroke:#8d97b8}.se-dim-text{fill:#e3e7f5;font:600 12px "JetBrains Mono",ui-monospace,monospace}
.se-ground{fill:#1d2a52}.se-water{fill:#1f4f7a}.se-tower{stroke:#8d97b8;fill:none}.se-shield{stroke:#6f7fb0}
.se-sphere{stroke:#070b1a}.se-glow{stroke:#f5b342;fill:#f5b342;fill-opacity:.18}
@media print{.se-bg{fill:#fff}.se-line{stroke:#000}.se-text,.se-dim-text{fill:#000}.se-dim{stroke:#333}
.se-ground{fill:#ddd}.se-water{fill:#cfe3f5}.se-tower{stroke:#333}.se-shield{stroke:#555}.se-sphere{stroke:#000}}
`;

export interface SpanElevationProps {
  curve: SpanCurve;
  figures: SpanFigures;
  layout: MarkerLayout;
  /** Water under the span (river, lake) or ground. */
  surface: "water" | "ground";
  /** Lights on the supports (catenary lighting), drawn at their heights with their flash order. */
  supportLights?: SupportLighting | null;
}

/** Side view of the span: supports, conductor, surface, markers in their colours, lit ones ringed, dimensions. */
export function SpanElevation({ curve, figures, layout, surface, supportLights }: SpanElevationProps) {
  const titleId = useId();
  const unit = figures.unit;
  const xs = layout.positions.map((p) => convertLength(p.distanceFromSupportA, unit).value);
  const d = spanDrawing(curve, { width: WIDTH, height: HEIGHT, padding: PADDING, markerDistances: xs });
  const toX = (x: number) => d.supports.a.x + x * d.scale.x;
  const toY = (h: number) => d.surface.y - h * d.scale.y;
  const offset = figures.markedWireOffset;
  const len = (value: number) => formatLength({ value, unit });

  const topHeight = Math.max(figures.supportTopA, figures.supportTopB, figures.attachmentA + offset, figures.attachmentB + offset);
  const top = toY(topHeight) - 34;
  const bottom = Math.max(HEIGHT, d.surface.y + 64);
  const baseY = Math.min(toY(figures.baseHeight), d.surface.y);
  const xA = d.supports.a.x;
  const xB = d.supports.b.x;

  // Where the supports stand above the water or canyon floor, banks slope down inside the span.
  const bank = figures.baseHeight > 0 ? Math.min(0.06 * (xB - xA), 50) : 0;
  const groundPath =
    bank > 0
      ? `M0,${baseY} L${xA + bank},${baseY} L${xA + 2 * bank},${d.surface.y} L${xB - 2 * bank},${d.surface.y} L${xB - bank},${baseY} L${WIDTH},${baseY} L${WIDTH},${bottom} L0,${bottom} Z`
      : `M0,${d.surface.y} L${WIDTH},${d.surface.y} L${WIDTH},${bottom} L0,${bottom} Z`;

  const markedWire = d.conductor.map((p) => `${p.x},${(p.y - offset * d.scale.y).toFixed(2)}`).join(" ");
  // Several wires side by side at the top coincide in a side view: a marker on a further wire is
  // drawn a little up and to the right, behind the first, and labelled with its wire.
  const severalWires = layout.wiresAtTop.count > 1;
  const wireShift = (wire: number) => (wire - 1) * 5;
  const spheres = layout.positions
    .map((p, i) => ({
      position: p,
      x: d.markers[i].x + wireShift(p.wire),
      y: toY(conductorHeightAt(curve, xs[i]) + offset) - wireShift(p.wire),
      conductorY: d.markers[i].y,
    }))
    .sort((a, b) => b.position.wire - a.position.wire);
  const alongSpan = spheres.filter((s) => layout.wiresAtTop.method !== "each" || s.position.wire === 1).sort((a, b) => a.position.index - b.position.index);
  const litOnConductor = offset > 0;

  const low = minimumClearance(curve);
  const lowX = toX(low.x);
  const lowY = toY(low.height);
  const spacingFrom = alongSpan.length > 1 ? alongSpan[0] : { x: xA, y: toY(figures.attachmentA + offset) };
  const spacingTo = alongSpan.length > 1 ? alongSpan[1] : alongSpan[0];
  const spacingY = Math.min(spacingFrom.y, spacingTo.y) - 22;
  const exaggeration = d.scale.y / d.scale.x;

  const towerHeightA = figures.supportTopA - figures.baseHeight;
  const towerHeightB = figures.supportTopB - figures.baseHeight;
  const lowestLabelX = Math.min(Math.max(lowX + 8, xA + 40), xB - 150);

  return (
    <svg
      viewBox={`0 ${top} ${WIDTH} ${bottom - top}`}
      role="img"
      aria-labelledby={titleId}
      className="span-elevation h-auto w-full"
      data-testid="span-elevation"
      data-marker-count={layout.count}
    >
      <title id={titleId}>
        {`Span elevation: ${len(figures.spanLength)} span, ${layout.count} marker${layout.count === 1 ? "" : "s"} every ${len(layout.spacing.value)}, lowest conductor ${len(low.height)} above the ${surface}.`}
      </title>
      <style>{STYLE}</style>
      <rect className="se-bg" x={0} y={top} width={WIDTH} height={bottom - top} />
      <path d={groundPath} className="se-ground" />
      {surface === "water" && (
        <rect className="se-water" x={xA + 2 * bank} y={d.surface.y} width={Math.max(0, xB - xA - 4 * bank)} height={Math.max(6, (bottom - d.surface.y) * 0.35)} />
      )}
      <line className="se-line" x1={bank > 0 ? xA + 2 * bank : 0} x2={bank > 0 ? xB - 2 * bank : WIDTH} y1={d.surface.y} y2={d.surface.y} strokeWidth={1} />

      {[
        { x: xA, top: toY(figures.supportTopA), attach: d.supports.a.top, label: `A ${len(towerHeightA)}`, anchor: "end" as const, dx: -10 },
        { x: xB, top: toY(figures.supportTopB), attach: d.supports.b.top, label: `B ${len(towerHeightB)}`, anchor: "start" as const, dx: 10 },
      ].map((s) => (
        <g key={s.label} data-support={s.label[0]}>
          <polygon className="se-tower" strokeWidth={1.5} points={`${s.x - 9},${baseY} ${s.x - 2},${s.top} ${s.x + 2},${s.top} ${s.x + 9},${baseY}`} />
          <line className="se-tower" strokeWidth={1.5} x1={s.x - 12} x2={s.x + 12} y1={s.attach} y2={s.attach} />
          <text className="se-text" x={s.x + s.dx} y={s.top + 4} textAnchor={s.anchor}>
            {s.label}
          </text>
        </g>
      ))}

      <polyline className="se-line" fill="none" strokeWidth={2} points={d.conductorPoints} data-wire="conductor" />
      {offset > 0 && <polyline className="se-shield" fill="none" strokeWidth={1.5} strokeDasharray="6 3" points={markedWire} data-wire="shield" />}

      {/* Clearance: lowest conductor point down to the ground or water. */}
      <g data-dimension="clearance">
        <line className="se-dim" x1={lowX} x2={lowX} y1={lowY + 4} y2={d.surface.y - 1} strokeWidth={1} strokeDasharray="3 3" />
        <text className="se-dim-text" x={lowestLabelX} y={(lowY + d.surface.y) / 2 + 4}>
          {`clearance ${len(low.height)}`}
        </text>
      </g>

      {spacingTo && (
        <g data-dimension="spacing">
          <line className="se-dim" x1={spacingFrom.x} x2={spacingTo.x} y1={spacingY} y2={spacingY} strokeWidth={1} />
          <line className="se-dim" x1={spacingFrom.x} x2={spacingFrom.x} y1={spacingY - 5} y2={spacingY + 5} strokeWidth={1} />
          <line className="se-dim" x1={spacingTo.x} x2={spacingTo.x} y1={spacingY - 5} y2={spacingY + 5} strokeWidth={1} />
          <text className="se-dim-text" x={Math.min((spacingFrom.x + spacingTo.x) / 2, WIDTH - 90)} y={spacingY - 6} textAnchor="middle">
            {`spacing ${len(layout.spacing.value)}`}
          </text>
        </g>
      )}

      {spheres.map(({ position, x, y, conductorY }) => (
        <g key={position.index}>
          {position.lit && litOnConductor && (
            <g data-lit-device={position.index}>
              <circle className="se-glow" cx={x} cy={conductorY} r={9} strokeWidth={1.5} />
              <circle cx={x} cy={conductorY} r={3} fill="#e0302b" />
            </g>
          )}
          {position.lit && !litOnConductor && <circle className="se-glow" cx={x} cy={y} r={MARKER_RADIUS + 5} strokeWidth={2} data-lit-ring={position.index} />}
          <circle
            className="se-sphere"
            cx={x}
            cy={y}
            r={MARKER_RADIUS}
            fill={SPHERE_FILL[position.colour]}
            strokeWidth={1}
            data-marker={position.index}
            data-colour={position.colour}
            data-lit={position.lit ? "true" : "false"}
            data-wire={position.wire}
          >
            <title>{`Marker ${position.index}: ${position.colour}${position.lit ? ", lit" : ""}, ${len(position.distanceFromSupportA.value)} from support A${severalWires ? `, on wire ${position.wire} of ${layout.wiresAtTop.count} at the top` : ""}`}</title>
          </circle>
          {severalWires && (
            <text className="se-text" x={x} y={y - MARKER_RADIUS - 4} textAnchor="middle" fontSize={9}>
              {`w${position.wire}`}
            </text>
          )}
        </g>
      ))}

      {supportLights?.lights.map((light, i) => {
        const x = light.support === "A" ? xA : xB;
        const dx = light.support === "A" ? 12 : -12;
        return (
          <g key={`${light.support}-${i}`} data-support-light={`${light.support}-${light.level}`} data-flash-order={light.flashOrder}>
            <circle cx={x} cy={toY(light.height)} r={4.5} fill="#ff5a4f" stroke="#fff" strokeWidth={1} />
            <text className="se-text" x={x + dx} y={toY(light.height) + 4} textAnchor={light.support === "A" ? "start" : "end"} fontSize={10}>
              {light.flashOrder}
            </text>
            <title>{`Support ${light.support}, ${light.level} light at ${len(light.height)}, flashes ${light.flashOrder} of 3`}</title>
          </g>
        );
      })}

      <g data-dimension="span">
        <line className="se-dim" x1={xA} x2={xB} y1={d.surface.y + 26} y2={d.surface.y + 26} strokeWidth={1} />
        <line className="se-dim" x1={xA} x2={xA} y1={d.surface.y + 18} y2={d.surface.y + 34} strokeWidth={1} />
        <line className="se-dim" x1={xB} x2={xB} y1={d.surface.y + 18} y2={d.surface.y + 34} strokeWidth={1} />
        <text className="se-dim-text" x={(xA + xB) / 2} y={d.surface.y + 48} textAnchor="middle">
          {`span ${len(figures.spanLength)}`}
        </text>
      </g>
      {exaggeration > 1.5 && (
        <text className="se-text" x={WIDTH - 8} y={bottom - 6} textAnchor="end" fontSize={11}>
          {`vertical scale × ${exaggeration.toFixed(1)}; markers not to scale`}
        </text>
      )}
    </svg>
  );
}
