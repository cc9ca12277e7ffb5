// Zoom state lives in the URL (?phase, ?month, ?from/?to), so a zoom survives a phase switch, a
// reload and a shared link. Buttons show the selected phase and month with aria-pressed.
import { Form, Link, useNavigate, useSearchParams } from "react-router";
import type { MonthRange, ZoomSteps } from "../../../shared/zoom";

type Query = Record<string, string | undefined>;

const ZOOM_KEYS = ["month", "from", "to"] as const;

function href(path: string, query: Query): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v) params.set(k, v);
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

/** Hidden inputs carrying the given query values through a GET form. */
function Keep({ query, keys }: { query: Query; keys: readonly string[] }) {
  return (
    <>
      {keys.map((k) => (query[k] ? <input key={k} type="hidden" name={k} value={query[k]} /> : null))}
    </>
  );
}

export interface ZoomControlsProps {
  /** The page's path, e.g. /profiles/12. */
  path: string;
  /** The query on show: phase, month, from, to. */
  query: Query;
  months: MonthRange[];
  steps: ZoomSteps;
  /** The local dates on show (YYYY-MM-DD), for the date-range inputs. */
  shownDates: { from: string; to: string };
  /** Phase buttons (profile page); the selected one is pressed. */
  phases?: { value: string; label: string }[];
  selectedPhase?: string;
  /** Further ranges (e.g. the worst week), as instants. */
  extra?: { label: string; from: string; to: string }[];
  timeZone: string;
}

export function ZoomControls({ path, query, months, steps, shownDates, phases, selectedPhase, extra = [], timeZone }: ZoomControlsProps) {
  const zoomed = ZOOM_KEYS.some((k) => query[k]);
  const keepPhase = { phase: query.phase };
  const stepLink = (label: string, range: { from: string; to: string } | null) =>
    range && (
      <Link to={href(path, { ...keepPhase, ...range })} className="btn-quiet" preventScrollReset>
        {label}
      </Link>
    );
  return (
    <div className="no-print flex flex-col gap-2 text-sm" aria-label="Zoom and phase">
      {phases && phases.length > 1 && (
        <Form method="get" action={path} preventScrollReset className="flex flex-wrap items-center gap-2" aria-label="Phase">
          <span className="text-night-400">Phase</span>
          <Keep query={query} keys={ZOOM_KEYS} />
          {phases.map((p) => (
            <button key={p.value} type="submit" name="phase" value={p.value} className="btn-quiet aria-pressed:border-amber-glow aria-pressed:text-amber-glow" aria-pressed={selectedPhase === p.value}>
              {p.label}
            </button>
          ))}
        </Form>
      )}
      <Form method="get" action={path} preventScrollReset className="flex flex-wrap items-center gap-2" aria-label="Month">
        <span className="text-night-400">Period</span>
        <Keep query={query} keys={["phase"]} />
        <button type="submit" className="btn-quiet aria-pressed:border-amber-glow aria-pressed:text-amber-glow" aria-pressed={!zoomed}>
          Whole period
        </button>
        {months.map((m) => (
          <button key={m.label} type="submit" name="month" value={m.label} className="btn-quiet figure aria-pressed:border-amber-glow aria-pressed:text-amber-glow" aria-pressed={query.month === m.label}>
            {m.label}
          </button>
        ))}
      </Form>
      <div className="flex flex-wrap items-center gap-2">
        <span className="text-night-400">From the start on show</span>
        {stepLink("Day", steps.day)}
        {stepLink("Week", steps.week)}
        {stepLink("◀ Earlier", zoomed ? steps.previous : null)}
        {stepLink("Later ▶", zoomed ? steps.next : null)}
        {extra.map((x) => (
          <Link key={x.label} to={href(path, { ...keepPhase, from: x.from, to: x.to })} className="btn-quiet" preventScrollReset>
            {x.label}
          </Link>
        ))}
      </div>
      <Form method="get" action={path} preventScrollReset className="flex flex-wrap items-end gap-2" aria-label="Date range">
        <Keep query={query} keys={["phase"]} />
        <label className="flex flex-col gap-1">
          <span className="text-night-400">From (local date, {timeZone})</span>
          <input type="date" name="from" defaultValue={shownDates.from} key={`f${shownDates.from}`} required />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-night-400">To (inclusive)</span>
          <input type="date" name="to" defaultValue={shownDates.to} key={`t${shownDates.to}`} required />
        </label>
        <button type="submit" className="btn-quiet">
          Show these days
        </button>
      </Form>
      <p className="text-xs text-night-400">Drag across the chart to zoom into a stretch.</p>
    </div>
  );
}

/** Drag-to-zoom on a chart: the selected stretch becomes ?from/?to (instants), keeping the phase. */
export function useDragZoom(path: string) {
  const navigate = useNavigate();
  const [search] = useSearchParams();
  return (fromMs: number, toMs: number) => {
    navigate(href(path, { phase: search.get("phase") ?? undefined, from: new Date(fromMs).toISOString(), to: new Date(toMs).toISOString() }), { preventScrollReset: true });
  };
}
