import { CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { decadeTicks } from "../../../lib/engine/harvest-points";
import { formatNumber } from "../../../shared/format";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./chart-frame";

export interface HarvestCurveSeries {
  name: string;
  rows: { currentA: number; watts: number }[];
  colour?: string;
}

/** Colours for curves drawn together, in order. */
export const CURVE_COLOURS = [CHART_COLOURS.current, CHART_COLOURS.go, CHART_COLOURS.amber, "#b58cf0", CHART_COLOURS.nogo, "#5cc8e0"];

/**
 * Harvest power against line current for one or more devices. On the log axis each decade gets the
 * same width, so the region near the minimum current is as readable as the saturated top. The
 * reference labels sit apart: the minimum current's above the plot, the load's at its right end.
 */
export function HarvestCurves({ curves, scale, loadW, minA }: { curves: HarvestCurveSeries[]; scale: "log" | "linear"; loadW?: number; minA?: number }) {
  const all = curves.flatMap((c) => c.rows).filter((r) => scale === "linear" || r.currentA > 0);
  if (all.length === 0) return null;
  const lo = Math.min(...all.map((r) => r.currentA));
  const hi = Math.max(...all.map((r) => r.currentA));
  const ticks = scale === "log" ? decadeTicks(lo, hi) : undefined;
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart margin={{ top: 22, right: 20, bottom: 4, left: 8 }}>
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis
          dataKey="currentA"
          type="number"
          scale={scale}
          domain={scale === "log" ? [lo, hi] : [0, hi]}
          allowDataOverflow
          ticks={ticks}
          tickFormatter={(v: number) => `${formatNumber(v, v < 1 ? 1 : 0)} A`}
          minTickGap={16}
          {...axisProps}
        />
        <YAxis dataKey="watts" unit=" W" width={56} {...axisProps} />
        <Tooltip {...tooltipStyle} formatter={(v, name) => [`${Number(v).toFixed(2)} W`, name]} labelFormatter={(v) => `${formatNumber(Number(v), 1)} A`} />
        {curves.length > 1 && <Legend wrapperStyle={{ fontSize: 12 }} />}
        {loadW !== undefined && Number.isFinite(loadW) && (
          <ReferenceLine y={loadW} stroke={CHART_COLOURS.amber} strokeDasharray="6 3" label={{ value: `load ${loadW} W`, fill: CHART_COLOURS.amber, fontSize: 11, position: "insideBottomRight" }} />
        )}
        {minA !== undefined && Number.isFinite(minA) && minA > 0 && (
          <ReferenceLine x={minA} stroke={CHART_COLOURS.nogo} strokeDasharray="4 3" label={{ value: `min ${minA} A`, fill: CHART_COLOURS.nogo, fontSize: 11, position: "top" }} />
        )}
        {curves.map((c, k) => (
          <Line key={c.name} name={c.name} data={c.rows} dataKey="watts" stroke={c.colour ?? CURVE_COLOURS[k % CURVE_COLOURS.length]} dot={false} isAnimationActive={false} />
        ))}
      </LineChart>
    </ResponsiveContainer>
  );
}

/** Log or linear current axis, as two pressed/unpressed buttons. */
export function AxisScaleToggle({ scale, onChange }: { scale: "log" | "linear"; onChange: (s: "log" | "linear") => void }) {
  return (
    <div className="flex gap-1" role="group" aria-label="Current axis">
      {(["log", "linear"] as const).map((s) => (
        <button key={s} type="button" className="btn-quiet text-xs aria-pressed:border-amber-glow aria-pressed:text-amber-glow" aria-pressed={scale === s} onClick={() => onChange(s)}>
          {s === "log" ? "Log current axis" : "Linear current axis"}
        </button>
      ))}
    </div>
  );
}
