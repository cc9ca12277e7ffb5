import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./chart-frame";

export interface BarSeries {
  key: string;
  label: string;
  colour: string;
}

/** Bars per category (e.g. month), stacked when `stacked`. */
export function CategoryBars({ rows, category, series, unit, stacked = false }: { rows: Record<string, number | string>[]; category: string; series: BarSeries[]; unit?: string; stacked?: boolean }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <BarChart data={rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis dataKey={category} {...axisProps} />
        <YAxis unit={unit} width={64} {...axisProps} />
        <Tooltip {...tooltipStyle} cursor={{ fill: "#131d3b" }} />
        {series.length > 1 && <Legend wrapperStyle={{ fontSize: 12 }} />}
        {series.map((s) => (
          <Bar key={s.key} dataKey={s.key} name={s.label} fill={s.colour} stackId={stacked ? "stack" : undefined} isAnimationActive={false} />
        ))}
      </BarChart>
    </ResponsiveContainer>
  );
}
