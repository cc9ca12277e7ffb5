import type { ReactNode } from "react";

/**
 * Fixed-height box for a Recharts chart plus a text summary of the same figures.
 * Recharts draws only after hydration; the summary is rendered on the server, so the
 * page reads right before scripts load and for screen readers.
 */
export function ChartFrame({ title, summary, height = 260, children }: { title: string; summary: ReactNode; height?: number; children: ReactNode }) {
  return (
    <figure className="card flex flex-col gap-2">
      <figcaption className="font-semibold">{title}</figcaption>
      <div style={{ height }} className="w-full" aria-hidden="true">
        {children}
      </div>
      <p className="text-sm text-night-200">{summary}</p>
    </figure>
  );
}

export const CHART_COLOURS = {
  grid: "#1d2a52",
  axis: "#8d97b8",
  current: "#c3cbe6",
  band: "#6f7fb0",
  amber: "#f5b342",
  go: "#3fbf8a",
  nogo: "#e5646e",
  unknown: "#8d97b8",
  night: "#2b3b6b",
};

export const axisProps = { stroke: CHART_COLOURS.axis, tick: { fill: CHART_COLOURS.axis, fontSize: 11 } } as const;
export const tooltipStyle = { contentStyle: { background: "#0c1328", border: "1px solid #2b3b6b", color: "#e3e7f5", fontSize: 12 } } as const;
