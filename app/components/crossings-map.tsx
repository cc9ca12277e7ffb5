import { useRef, useState, type PointerEvent as ReactPointerEvent, type WheelEvent as ReactWheelEvent } from "react";
import { Link } from "react-router";
import type { BaseMap } from "../../lib/map/base-map";
import type { ReviewState } from "../../shared/review-schemas";
import type { VerdictStatus } from "../../shared/study-schemas";
import { VERDICT_WORDS } from "../../shared/portfolio";
import { REVIEW_STATE_LABELS } from "../../shared/review-schemas";

export interface MapCrossing {
  crossingId: number;
  crossing: string;
  verdict: VerdictStatus | null;
  reviewState: ReviewState;
  reviewStale: boolean;
}

const VERDICT_FILL: Record<VerdictStatus | "not-studied", string> = {
  go: "#3fbf8a",
  marginal: "#e8c547",
  "no-go": "#e5646e",
  "insufficient-data": "#8d97b8",
  "not-studied": "#0c1328",
};
/** The review state is the ring: none for draft, dashed while submitted, solid when approved, amber when stale. */
function ring(c: MapCrossing): { stroke: string; dash?: string; label: string } {
  if (c.reviewStale) return { stroke: "#f5b342", label: "approved, stale" };
  if (c.reviewState === "approved") return { stroke: "#ffffff", label: "approved" };
  if (c.reviewState === "submitted") return { stroke: "#ffffff", dash: "2 2", label: "submitted" };
  if (c.reviewState === "returned") return { stroke: "#c3cbe6", dash: "1 3", label: "returned" };
  return { stroke: "#6f7fb0", label: "draft" };
}

const MIN_ZOOM = 1;
const MAX_ZOOM = 12;

/**
 * The crossings on an offline base map (drawn on the server from npm-shipped atlases): fill by
 * verdict, ring by review state, each a link to its crossing. Zoom with the buttons or the wheel,
 * pan by dragging or with the arrow buttons; no tiles, nothing is fetched.
 */
export function CrossingsMap({ map, crossings, title = "Map of crossings" }: { map: BaseMap; crossings: MapCrossing[]; title?: string }) {
  const [view, setView] = useState({ zoom: 1, cx: map.width / 2, cy: map.height / 2 });
  const drag = useRef<{ x: number; y: number; cx: number; cy: number } | null>(null);
  const svg = useRef<SVGSVGElement>(null);
  const w = map.width / view.zoom;
  const h = map.height / view.zoom;
  const clamp = (v: { zoom: number; cx: number; cy: number }) => {
    const zoom = Math.min(MAX_ZOOM, Math.max(MIN_ZOOM, v.zoom));
    const hw = map.width / zoom / 2;
    const hh = map.height / zoom / 2;
    return { zoom, cx: Math.min(map.width - hw, Math.max(hw, v.cx)), cy: Math.min(map.height - hh, Math.max(hh, v.cy)) };
  };
  const zoomBy = (factor: number) => setView((v) => clamp({ ...v, zoom: v.zoom * factor }));
  const panBy = (dx: number, dy: number) => setView((v) => clamp({ ...v, cx: v.cx + (dx * map.width) / v.zoom / 4, cy: v.cy + (dy * map.height) / v.zoom / 4 }));
  const scale = () => (svg.current ? map.width / view.zoom / svg.current.getBoundingClientRect().width : 1);
  const onWheel = (e: ReactWheelEvent) => {
    // Ctrl/⌘ + wheel zooms; a plain wheel keeps scrolling the page.
    if (!e.ctrlKey && !e.metaKey) return;
    zoomBy(e.deltaY < 0 ? 1.25 : 0.8);
  };
  const onPointerDown = (e: ReactPointerEvent) => {
    if ((e.target as Element).closest("a")) return;
    drag.current = { x: e.clientX, y: e.clientY, cx: view.cx, cy: view.cy };
    (e.currentTarget as Element).setPointerCapture(e.pointerId);
  };
  const onPointerMove = (e: ReactPointerEvent) => {
    const d = drag.current;
    if (!d) return;
    const k = scale();
    setView((v) => clamp({ ...v, cx: d.cx - (e.clientX - d.x) * k, cy: d.cy - (e.clientY - d.y) * k }));
  };
  const byId = new Map(map.points.map((p) => [p.id, p]));
  const r = 6 / Math.sqrt(view.zoom);
  return (
    <figure className="card flex flex-col gap-2" data-testid="crossings-map">
      <figcaption className="flex flex-wrap items-center justify-between gap-2">
        <span className="font-semibold">{title}</span>
        <span className="no-print flex gap-1" role="group" aria-label="Zoom and pan the map">
          <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => zoomBy(1.5)} aria-label="Zoom in">
            +
          </button>
          <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => zoomBy(1 / 1.5)} aria-label="Zoom out">
            −
          </button>
          {(
            [
              ["←", "Pan west", -1, 0],
              ["→", "Pan east", 1, 0],
              ["↑", "Pan north", 0, -1],
              ["↓", "Pan south", 0, 1],
            ] as const
          ).map(([mark, label, dx, dy]) => (
            <button key={label} type="button" className="btn-quiet px-2 py-0.5" onClick={() => panBy(dx, dy)} aria-label={label}>
              {mark}
            </button>
          ))}
          <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => setView({ zoom: 1, cx: map.width / 2, cy: map.height / 2 })}>
            Reset
          </button>
        </span>
      </figcaption>
      <svg
        ref={svg}
        viewBox={`${view.cx - w / 2} ${view.cy - h / 2} ${w} ${h}`}
        className="w-full touch-none select-none rounded-md bg-[#0a1a33]"
        role="group"
        aria-label={`${title}: ${crossings.length} crossings; each is a link`}
        onWheel={onWheel}
        onPointerDown={onPointerDown}
        onPointerMove={onPointerMove}
        onPointerUp={() => (drag.current = null)}
        onPointerCancel={() => (drag.current = null)}
      >
        <path d={map.land} fill="#1d2a52" />
        <path d={map.countries} fill="none" stroke="#6f7fb0" strokeWidth={1 / view.zoom} />
        <path d={map.states} fill="none" stroke="#2b3b6b" strokeWidth={0.8 / view.zoom} />
        {crossings.map((c) => {
          const p = byId.get(c.crossingId);
          if (!p || !Number.isFinite(p.x)) return null;
          const o = ring(c);
          const verdict = c.verdict ?? "not-studied";
          const label = `${c.crossing}: ${VERDICT_WORDS[verdict]}, review ${o.label}`;
          return (
            <Link key={c.crossingId} to={`/crossings/${c.crossingId}`} aria-label={label} data-crossing={c.crossingId}>
              <title>{label}</title>
              <circle cx={p.x} cy={p.y} r={r} fill={VERDICT_FILL[verdict]} stroke={o.stroke} strokeWidth={2 / Math.sqrt(view.zoom)} strokeDasharray={o.dash} />
            </Link>
          );
        })}
      </svg>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-night-200" aria-label="Map legend">
        {(Object.keys(VERDICT_FILL) as (keyof typeof VERDICT_FILL)[]).map((v) => (
          <li key={v} className="flex items-center gap-1">
            <svg width="12" height="12" aria-hidden="true">
              <circle cx="6" cy="6" r="5" fill={VERDICT_FILL[v]} stroke="#6f7fb0" />
            </svg>
            {VERDICT_WORDS[v]}
          </li>
        ))}
        <li>Ring: none = {REVIEW_STATE_LABELS.draft.toLowerCase()}, dashed = submitted, white = approved, amber = stale approval</li>
      </ul>
    </figure>
  );
}
