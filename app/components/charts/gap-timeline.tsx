import { formatUtc } from "../../../shared/format";
import { monthRanges } from "../../../shared/zoom";
import { formatLocal } from "../../../shared/zoned-time";

/**
 * The profile's period as one strip: known time, unknown gaps, flatlines and zero-current
 * stretches at their places. Plain SVG, so it renders on the server and prints.
 */
export function GapTimeline({
  start,
  end,
  unknown,
  flatlines,
  zeros,
  timeZone = "UTC",
}: {
  start: string;
  end: string;
  unknown: { start: string; end: string }[];
  flatlines: { start: string; end: string }[];
  zeros: { start: string; end: string }[];
  /** Titles and month ticks in this zone (UTC in the titles too). */
  timeZone?: string;
}) {
  const t0 = Date.parse(start);
  const span = Math.max(1, Date.parse(end) - t0);
  const x = (iso: string) => Math.min(1000, Math.max(0, ((Date.parse(iso) - t0) / span) * 1000));
  // A stretch shorter than a pixel still gets a visible mark.
  const w = (s: { start: string; end: string }) => Math.max(1.5, x(s.end) - x(s.start));
  const lane = (items: { start: string; end: string }[], y: number, fill: string, label: string) =>
    items.map((s) => (
      <rect key={`${label}${s.start}`} x={x(s.start)} y={y} width={w(s)} height={14} fill={fill}>
        <title>{`${label}: ${formatLocal(s.start, timeZone)} → ${formatLocal(s.end, timeZone)}${timeZone === "UTC" ? "" : ` (${formatUtc(s.start)} → ${formatUtc(s.end)})`}`}</title>
      </rect>
    ));
  // Local month starts after the first one.
  const months = monthRanges(start, end, timeZone)
    .slice(1)
    .map((m) => ({ x: x(m.from), label: m.label }));
  const step = Math.ceil(months.length / 12);
  return (
    <svg viewBox="0 0 1000 92" className="h-auto w-full" role="img" aria-label="Timeline of known time, gaps, flatlines and zero-current stretches">
      <text x={0} y={10} fontSize={10} fill="#8d97b8">
        gaps
      </text>
      <rect x={0} y={14} width={1000} height={14} fill="#2b3b6b" />
      {lane(unknown, 14, "#e5646e", "gap")}
      <text x={0} y={42} fontSize={10} fill="#8d97b8">
        flatlines
      </text>
      <rect x={0} y={46} width={1000} height={14} fill="#131d3b" />
      {lane(flatlines, 46, "#f5b342", "flatline")}
      <text x={0} y={74} fontSize={10} fill="#8d97b8">
        zero current
      </text>
      <rect x={0} y={78} width={1000} height={14} fill="#131d3b" />
      {lane(zeros, 78, "#c3cbe6", "zero current")}
      {months.map((m, i) => (
        <g key={m.label}>
          <line x1={m.x} x2={m.x} y1={14} y2={92} stroke="#070b1a" strokeWidth={0.6} />
          {i % step === 0 && (
            <text x={m.x + 2} y={10} fontSize={9} fill="#6f7fb0" className="figure">
              {m.label}
            </text>
          )}
        </g>
      ))}
    </svg>
  );
}
