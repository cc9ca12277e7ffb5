import { useState } from "react";
import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis, type MouseHandlerDataParam } from "recharts";
import { formatUtc } from "../../../shared/format";
import { MAX_SHADED_WINDOWS } from "../../../shared/zoom";
import { formatLocal, localDate, wallClock } from "../../../shared/zoned-time";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./chart-frame";
import { unpackTimeline, type PackedTimeline } from "../../../shared/packed-timeline";

export type TimelineData = Pick<PackedTimeline, "firstMs" | "stepMs" | "buckets" | "minA" | "maxA" | "unknown"> & { required?: PackedTimeline["required"] };

const ms = (iso: string) => Date.parse(iso);

/**
 * Current over time as a min–max band per bucket; unknown stretches shaded grey, required (night)
 * windows navy. Times on the axis and in the tooltip are in `timeZone` (the tooltip adds UTC).
 * With `onZoom`, dragging across the chart selects a range and hands it over (epoch ms).
 */
export function CurrentTimeline({
  data,
  thresholds = [],
  timeZone = "UTC",
  onZoom,
}: {
  data: TimelineData;
  thresholds?: { value: number; label: string; colour?: string }[];
  timeZone?: string;
  onZoom?: (fromMs: number, toMs: number) => void;
}) {
  const rows = unpackTimeline(data).map((p) => ({ t: p.t, range: p.minA == null || p.maxA == null ? null : [p.minA, p.maxA], max: p.maxA }));
  const [drag, setDrag] = useState<{ a: number; b: number } | null>(null);
  // Too many night bands at a year's zoom add nothing but paint time: show them from a month down.
  const showRequired = (data.required?.length ?? 0) <= MAX_SHADED_WINDOWS;
  const spanMs = rows.length > 1 ? rows[rows.length - 1].t - rows[0].t : 0;
  // Under three days on show, the axis names hours; else dates.
  const tick = spanMs < 3 * 86_400_000 ? (v: number) => { const c = wallClock(v, timeZone); return `${String(c.day).padStart(2, "0")} ${String(c.hour).padStart(2, "0")}:${String(c.minute).padStart(2, "0")}`; } : (v: number) => localDate(v, timeZone);
  const at = (s: MouseHandlerDataParam) => {
    const i = Number(s?.activeTooltipIndex);
    return Number.isInteger(i) && rows[i] ? rows[i].t : null;
  };
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart
        data={rows}
        margin={{ top: 8, right: 16, bottom: 4, left: 8 }}
        onMouseDown={onZoom ? (s) => { const t = at(s); if (t != null) setDrag({ a: t, b: t }); } : undefined}
        onMouseMove={onZoom ? (s) => { const t = at(s); if (drag && t != null && t !== drag.b) setDrag({ a: drag.a, b: t }); } : undefined}
        onMouseUp={onZoom ? () => { if (drag && drag.a !== drag.b) onZoom(Math.min(drag.a, drag.b), Math.max(drag.a, drag.b)); setDrag(null); } : undefined}
        onMouseLeave={onZoom ? () => setDrag(null) : undefined}
        style={onZoom ? { cursor: "crosshair", userSelect: "none" } : undefined}
      >
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis dataKey="t" type="number" domain={["dataMin", "dataMax"]} scale="time" tickFormatter={tick} {...axisProps} />
        <YAxis unit=" A" width={64} {...axisProps} />
        <Tooltip
          {...tooltipStyle}
          labelFormatter={(v) => {
            const iso = new Date(Number(v)).toISOString();
            return timeZone === "UTC" ? formatUtc(iso) : `${formatLocal(iso, timeZone)} (${formatUtc(iso)})`;
          }}
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
        {drag && drag.a !== drag.b && <ReferenceArea x1={Math.min(drag.a, drag.b)} x2={Math.max(drag.a, drag.b)} fill={CHART_COLOURS.amber} fillOpacity={0.2} />}
      </ComposedChart>
    </ResponsiveContainer>
  );
}
