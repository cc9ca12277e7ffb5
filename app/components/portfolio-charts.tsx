import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { ChartFrame, CHART_COLOURS, axisProps, tooltipStyle } from "./charts/chart-frame";
import { CategoryBars } from "./charts/bars";
import { REVIEW_FILTERS, VERDICT_FILTERS, VERDICT_WORDS, verdictKey, type PortfolioRow } from "../../shared/portfolio";
import { REVIEW_STATE_LABELS } from "../../shared/review-schemas";
import { formatNumber } from "../../shared/format";

const REVIEW_COLOURS: Record<(typeof REVIEW_FILTERS)[number], string> = {
  draft: CHART_COLOURS.band,
  submitted: CHART_COLOURS.current,
  approved: CHART_COLOURS.go,
  returned: CHART_COLOURS.nogo,
  stale: CHART_COLOURS.amber,
};

/** Crossings counted by verdict, split by review state (a stale approval counts as stale, not approved). */
export function verdictReviewCounts(rows: PortfolioRow[]) {
  return VERDICT_FILTERS.map((v) => {
    const row: Record<string, string | number> = { verdict: VERDICT_WORDS[v] };
    for (const s of REVIEW_FILTERS) row[s] = 0;
    for (const r of rows) if (verdictKey(r) === v) (row[r.reviewStale ? "stale" : r.reviewState] as number)++;
    return row;
  });
}

/** The 20 crossings with the most dark hours per year, most first. */
export function worstDark(rows: PortfolioRow[], n = 20) {
  return rows
    .filter((r) => r.darkHoursPerYear != null)
    .sort((a, b) => b.darkHoursPerYear! - a.darkHoursPerYear! || a.crossing.localeCompare(b.crossing))
    .slice(0, n)
    .map((r) => ({ crossing: r.crossing, darkHours: Math.round(r.darkHoursPerYear! * 10) / 10 }));
}

export function PortfolioCharts({ rows }: { rows: PortfolioRow[] }) {
  const byVerdict = verdictReviewCounts(rows);
  const worst = worstDark(rows);
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <ChartFrame
        title="Crossings by verdict and review state"
        summary={byVerdict
          .map((r) => `${r.verdict}: ${REVIEW_FILTERS.filter((s) => (r[s] as number) > 0).map((s) => `${r[s]} ${s === "stale" ? "stale approval" : REVIEW_STATE_LABELS[s].toLowerCase()}`).join(", ") || "none"}`)
          .join("; ")}
      >
        <CategoryBars
          rows={byVerdict}
          category="verdict"
          stacked
          series={REVIEW_FILTERS.map((s) => ({ key: s, label: s === "stale" ? "Approved (stale)" : REVIEW_STATE_LABELS[s], colour: REVIEW_COLOURS[s] }))}
        />
      </ChartFrame>
      <ChartFrame
        title={`Dark hours per year, worst ${Math.min(20, worst.length)}`}
        height={Math.max(160, worst.length * 22 + 40)}
        summary={worst.length === 0 ? "No studied crossing yet." : worst.map((w) => `${w.crossing} ${formatNumber(w.darkHours, 1)} h`).join("; ")}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={worst} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 8 }}>
            <CartesianGrid stroke={CHART_COLOURS.grid} horizontal={false} />
            <XAxis type="number" unit=" h" {...axisProps} />
            <YAxis type="category" dataKey="crossing" width={150} {...axisProps} />
            <Tooltip {...tooltipStyle} cursor={{ fill: "#131d3b" }} />
            <Bar dataKey="darkHours" name="Dark hours per year" fill={CHART_COLOURS.nogo} isAnimationActive={false} />
          </BarChart>
        </ResponsiveContainer>
      </ChartFrame>
    </div>
  );
}
