import type { StudyResult } from "../../shared/study-schemas";
import { formatHours, formatNumber, formatPercent, roundToTotal } from "../../shared/format";
import { formatLocal } from "../../shared/zoned-time";
import { exceededFromCurve } from "../../lib/engine/load-duration";
import { ChartFrame, CHART_COLOURS } from "./charts/chart-frame";
import { CategoryBars } from "./charts/bars";
import { HourMonthGrid, LoadDurationChart, StorageChart } from "./charts/study-charts";

/** The parts of a study's results its charts draw: the saved run's, or a what-if's (the same shape). */
export type StudyChartInputs = Pick<StudyResult, "loadDuration" | "monthly" | "hourMonthBelowMin" | "storage" | "period"> & {
  current: Pick<StudyResult["current"], "hoursAtOrAboveMin" | "exceeded" | "rating">;
};

/** Required hours of a month with no known current (stored results before engine 2 lack the field). */
const unknownOf = (f: { requiredHours: number; requiredKnownHours: number; requiredUnknownHours?: number }) =>
  f.requiredUnknownHours ?? Math.max(0, f.requiredHours - f.requiredKnownHours);

/** Monthly rows rounded so that lit + dark + unknown shows as the required hours of the row. */
export function monthlyRowsOf(monthly: StudyChartInputs["monthly"]) {
  return monthly.map((m) => {
    const [lit, dark, unknown] = roundToTotal([m.litHours, m.darkHours, unknownOf(m)], 1);
    return { month: m.month, lit, dark, unknown, required: lit + dark + unknown };
  });
}

/**
 * The charts a what-if can change: load-duration curve, required hours by month, the hour × month
 * grid below the minimum current and the storage's worst week. `whatIf` prefixes every title so a
 * recomputed chart is never mistaken for the saved study's.
 */
export function StudyResultCharts({ r, device, timeZone, whatIf = false }: { r: StudyChartInputs; device: { minCurrentA: number; maxCurrentA: number }; timeZone: string; whatIf?: boolean }) {
  const label = (title: string) => (whatIf ? `What-if: ${title.charAt(0).toLowerCase()}${title.slice(1)}` : title);
  const shareAtMin = r.period.knownHours > 0 ? r.current.hoursAtOrAboveMin / r.period.knownHours : null;
  const exceeded = r.current.exceeded ?? exceededFromStoredCurve(r.loadDuration);
  const rating = r.current.rating ?? null;
  const monthlyRows = monthlyRowsOf(r.monthly);
  const darkestMonth = [...r.monthly].sort((a, b) => b.darkHours - a.darkHours)[0];
  const worstWeek = r.storage?.worstWeek;
  return (
    <div className="flex flex-col gap-4" data-testid={whatIf ? "what-if-charts" : "saved-charts"}>
      <div className="grid gap-4 lg:grid-cols-2">
        <ChartFrame
          title={label("Load-duration curve")}
          summary={`${exceeded ? `The current exceeds ${formatNumber(exceeded.p10A, 1)} A for 10 %, ${formatNumber(exceeded.p50A, 1)} A for half and ${formatNumber(exceeded.p90A, 1)} A for 90 % of the known time; it` : "It"} is at or above the ${device.minCurrentA} A minimum ${shareAtMin == null ? "—" : formatPercent(shareAtMin, 1)} of the time. Device maximum ${device.maxCurrentA} A${rating ? `; circuit normal rating ${formatNumber(rating.ratingA)} A` : ""}.`}
        >
          <LoadDurationChart points={r.loadDuration} minA={device.minCurrentA} maxA={device.maxCurrentA} />
        </ChartFrame>
        <ChartFrame
          title={label("Required hours by month: lit, dark, unknown")}
          summary={darkestMonth && darkestMonth.darkHours > 0 ? `Darkest month ${darkestMonth.month} with ${formatHours(darkestMonth.darkHours)} dark of ${formatHours(darkestMonth.requiredHours)} required.` : "No dark hours in any month."}
        >
          <CategoryBars
            rows={monthlyRows}
            category="month"
            unit=" h"
            stacked
            series={[
              { key: "lit", label: "Lit", colour: CHART_COLOURS.go },
              { key: "dark", label: "Dark", colour: CHART_COLOURS.nogo },
              { key: "unknown", label: "Unknown", colour: CHART_COLOURS.unknown },
            ]}
          />
        </ChartFrame>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <figure className="card flex flex-col gap-2">
          <figcaption className="font-semibold">{label("Below the minimum current: hour of day × month")}</figcaption>
          <HourMonthGrid share={r.hourMonthBelowMin.share} timeBasis={r.hourMonthBelowMin.timeBasis} />
          <p className="text-sm text-night-200">
            Per cent of known time below {device.minCurrentA} A. Hours are {r.hourMonthBelowMin.timeBasis}.
          </p>
        </figure>
        {r.storage && worstWeek ? (
          <ChartFrame
            title={label(`Storage charge through the worst week (${r.storage.storageWh} Wh usable)`)}
            summary={`${worstWeek.basis}: ${formatLocal(worstWeek.start, timeZone)} to ${formatLocal(worstWeek.end, timeZone)}. Lowest charge over the whole period ${formatNumber(r.storage.minChargeWh, 1)} Wh${r.storage.minChargeAt ? ` at ${formatLocal(r.storage.minChargeAt, timeZone)}` : ""}.`}
          >
            <StorageChart points={worstWeek.points} storageWh={r.storage.storageWh} timeZone={timeZone} />
          </ChartFrame>
        ) : (
          <div className="card text-sm text-night-200">
            <p className="font-semibold">{label("Storage")}</p>
            <p className="mt-2">This device has no storage: it is dark whenever the harvest cannot carry the load.</p>
          </div>
        )}
      </div>
    </div>
  );
}

/** Exceeded-p currents of results saved before the engine reported them, read off their curve. */
export function exceededFromStoredCurve(points: { currentA: number; shareExceeded: number }[]) {
  const [p10A, p50A, p90A] = [0.1, 0.5, 0.9].map((p) => exceededFromCurve(points, p));
  return p10A == null || p50A == null || p90A == null ? null : { p10A, p50A, p90A };
}
