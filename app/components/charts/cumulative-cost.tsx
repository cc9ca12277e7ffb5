import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatMoney } from "../../../shared/format";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./chart-frame";

// One colour per option, distinct from the verdict colours so they are not read as verdicts.
export const OPTION_COLOURS = [CHART_COLOURS.amber, "#7fb3ff", "#d58cff", "#7de0d0", "#ff9f80", CHART_COLOURS.current];

/** Cumulative cost per option by year (present value), one line each. */
export function CumulativeCostChart({ rows, series, currency }: { rows: Record<string, number>[]; series: { key: string; label: string }[]; currency: string }) {
  const compact = (v: number) => new Intl.NumberFormat("en-US", { style: "currency", currency, notation: "compact", maximumFractionDigits: 1 }).format(v);
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis dataKey="year" type="number" domain={[0, "dataMax"]} allowDecimals={false} {...axisProps} />
        <YAxis width={72} tickFormatter={compact} {...axisProps} />
        <Tooltip {...tooltipStyle} labelFormatter={(v) => `Year ${v}`} formatter={(v) => formatMoney(Number(v), currency)} />
        <Legend wrapperStyle={{ fontSize: 12 }} />
        {series.map((s, i) => (
          <Line key={s.key} dataKey={s.key} name={s.label} stroke={OPTION_COLOURS[i % OPTION_COLOURS.length]} dot={false} strokeWidth={2} isAnimationActive={false} connectNulls={false} />
        ))}
      </LineChart>
    </ResponsiveContainer>
  );
}
