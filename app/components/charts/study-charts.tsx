import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatUtc } from "../../../shared/format";
import { formatLocal, localDate } from "../../../shared/zoned-time";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./chart-frame";

/** Current against the share of known time it is exceeded, with the device's limits drawn on it. */
export function LoadDurationChart({ points, minA, maxA }: { points: { currentA: number; shareExceeded: number }[]; minA: number; maxA: number }) {
  const rows = points.map((p) => ({ share: Math.round(p.shareExceeded * 10000) / 100, currentA: p.currentA }));
  const top = Math.max(...points.map((p) => p.currentA), minA);
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis dataKey="share" type="number" domain={[0, 100]} unit=" %" {...axisProps} />
        <YAxis unit=" A" width={64} domain={[0, Math.ceil(top * 1.05)]} {...axisProps} />
        <Tooltip {...tooltipStyle} formatter={(v) => `${Number(v).toFixed(1)} A`} labelFormatter={(v) => `exceeded ${v} % of known time`} />
        <ReferenceLine y={minA} stroke={CHART_COLOURS.nogo} strokeDasharray="6 3" label={{ value: `min ${minA} A`, fill: CHART_COLOURS.nogo, fontSize: 11, position: "insideTopRight" }} />
        {maxA <= top * 1.05 && <ReferenceLine y={maxA} stroke={CHART_COLOURS.amber} strokeDasharray="6 3" label={{ value: `max ${maxA} A`, fill: CHART_COLOURS.amber, fontSize: 11, position: "insideTopRight" }} />}
        <Line dataKey="currentA" stroke={CHART_COLOURS.current} dot={false} isAnimationActive={false} />
      </LineChart>
    </ResponsiveContainer>
  );
}

/** Stored energy through the worst week. */
export function StorageChart({ points, storageWh, timeZone = "UTC" }: { points: { t: string; chargeWh: number }[]; storageWh: number; timeZone?: string }) {
  const rows = points.map((p) => ({ t: Date.parse(p.t), chargeWh: p.chargeWh }));
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
        <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
        <XAxis dataKey="t" type="number" scale="time" domain={["dataMin", "dataMax"]} tickFormatter={(v) => localDate(v, timeZone).slice(5)} {...axisProps} />
        <YAxis unit=" Wh" width={70} domain={[0, Math.ceil(storageWh)]} {...axisProps} />
        <Tooltip {...tooltipStyle} formatter={(v) => `${Number(v).toFixed(1)} Wh`} labelFormatter={(v) => (timeZone === "UTC" ? formatUtc(new Date(Number(v)).toISOString()) : `${formatLocal(Number(v), timeZone)} (${formatUtc(new Date(Number(v)).toISOString())})`)} />
        <Line dataKey="chargeWh" stroke={CHART_COLOURS.amber} dot={false} isAnimationActive={false} />
      </LineChart>
    </ResponsiveContainer>
  );
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** Hour of day × month: share of known time below the minimum current, as a shaded grid (plain HTML, no script needed). */
export function HourMonthGrid({ share, timeBasis }: { share: (number | null)[][]; timeBasis: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="heat-grid figure w-auto border-separate border-spacing-0.5 text-[10px]" aria-label={`Share of time below the minimum current by hour (${timeBasis}) and month`}>
        <thead>
          <tr>
            <th className="border-0 px-1 py-0 text-right">h</th>
            {MONTHS.map((m) => (
              <th key={m} className="border-0 px-1 py-0 text-center">
                {m}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {share.map((row, h) => (
            <tr key={h}>
              <th scope="row" className="border-0 px-1 py-0 text-right font-normal">
                {String(h).padStart(2, "0")}
              </th>
              {row.map((v, m) => (
                // Sizes and text colour come from the heat-grid class (app.css); a year's 288 cells keep only their shade.
                <td
                  key={m}
                  title={v == null ? "no data" : `${(v * 100).toFixed(1)} % below minimum`}
                  className={v != null && v > 0.5 ? "hot" : undefined}
                  style={v == null ? undefined : { background: `rgba(229,100,110,${(0.08 + 0.92 * v).toFixed(3)})` }}
                >
                  {v == null ? "·" : v === 0 ? "" : Math.round(v * 100)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
