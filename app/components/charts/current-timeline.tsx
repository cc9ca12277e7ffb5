import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatUtc } from "../../../shared/format";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./chart-frame";

export interface TimelineData {
  points: { t: string; minA: number | null; maxA: number | null }[];
  unknown: { start: string; end: string }[];
  required?: { start: string; end: string }[];
}

const ms = (iso: string) => Date.parse(iso);
const dayLabel = (v: number) => new Date(v).toISOString().slice(0, 10);

/** Current over time as a min–max band per bucket; unknown stretches shaded grey, required (night) windows navy. */
export function CurrentTimeline({ data, thresholds = [] }: { data: TimelineData; thresholds?: { value: number; label: string; colour?: string }[] }) {
  const rows = data.points.map((p) => ({ t: ms(p.t), range: p.minA == null || p.maxA == null ? null : [p.minA, p.maxA], max: p.maxA }));
  // Too many night bands at a year's zoom add nothing but paint time: show them from a month down.
  const showRequired = (data.required?.length ?? 0) <= 120;
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis dataKey="t" type="number" domain={["dataMin", "dataMax"]} scale="time" tickFormatter={dayLabel} {...axisProps} />
        <YAxis unit=" A" width={64} {...axisProps} />
        <Tooltip
          {...tooltipStyle}
          labelFormatter={(v) => formatUtc(new Date(Number(v)).toISOString())}
          formatter={(v) => (Array.isArray(v) ? `${Number(v[0]).toFixed(1)} – ${Number(v[1]).toFixed(1)} A` : `${Number(v).toFixed(1)} A`)}
        />
        {showRequired && data.required?.map((w) => <ReferenceArea key={`r${w.start}`} x1={ms(w.start)} x2={ms(w.end)} fill={CHART_COLOURS.night} fillOpacity={0.35} ifOverflow="hidden" />)}
        {data.unknown.map((u) => (
          <ReferenceArea key={`u${u.start}`} x1={ms(u.start)} x2={ms(u.end)} fill={CHART_COLOURS.unknown} fillOpacity={0.35} ifOverflow="hidden" />
        ))}
        <Area dataKey="range" name="min–max" stroke={CHART_COLOURS.current} fill={CHART_COLOURS.band} fillOpacity={0.5} isAnimationActive={false} connectNulls={false} />
        <Line dataKey="max" hide />
        {thresholds.map((th) => (
          <ReferenceLine key={th.label} y={th.value} stroke={th.colour ?? CHART_COLOURS.amber} strokeDasharray="6 3" label={{ value: th.label, fill: th.colour ?? CHART_COLOURS.amber, fontSize: 11, position: "insideTopRight" }} />
        ))}
      </ComposedChart>
    </ResponsiveContainer>
  );
}
