import type { MouseEvent } from "react";
import { useNavigate } from "react-router";
import { nightsOf, type Night } from "../../lib/engine/nights";
import { NIGHT_CELL_CSS, NIGHT_STATUS_STYLE, describeNight } from "../../shared/night-status";
import { NIGHT_STATUSES, type NightCalendar, type NightStatus } from "../../shared/study-schemas";

/** Nights grouped by the month of their evening (YYYY-MM), each at its day of the month. */
export function nightsByMonth(nights: Night[]): { month: string; days: (Night | null)[] }[] {
  const months = new Map<string, (Night | null)[]>();
  for (const n of nights) {
    const key = n.date.slice(0, 7);
    if (!months.has(key)) months.set(key, Array.from({ length: 31 }, () => null));
    months.get(key)![Number(n.date.slice(8, 10)) - 1] = n;
  }
  return [...months].map(([month, days]) => ({ month, days }));
}

export function nightCounts(nights: Night[]): Record<NightStatus, number> {
  const counts = Object.fromEntries(NIGHT_STATUSES.map((s) => [s, 0])) as Record<NightStatus, number>;
  for (const n of nights) counts[n.status]++;
  return counts;
}

/**
 * One cell per night of the analysed period, months as rows. Each cell has a colour and a mark of
 * its status, a text label with the dark and unknown minutes (hover and screen readers), and links
 * to that night on the current chart (`traceHref`); absent for the printed report.
 */
export function NightCalendarGrid({
  calendar,
  solarOffsetSeconds,
  traceHref,
}: {
  calendar: NightCalendar | undefined;
  solarOffsetSeconds: number;
  traceHref?: (n: Night) => string;
}) {
  if (!calendar) {
    return (
      <section className="card" aria-labelledby="nights-heading">
        <h2 id="nights-heading">Night by night</h2>
        <p className="mt-2 text-sm text-night-200">This study was run before Duskline kept a night-by-night record. Run it again to see each night.</p>
      </section>
    );
  }
  const nights = nightsOf(calendar, solarOffsetSeconds);
  const offsetH = solarOffsetSeconds / 3600;
  return (
    <section className="card night-calendar flex flex-col gap-3" aria-labelledby="nights-heading">
      <h2 id="nights-heading">Night by night</h2>
      <p className="text-sm text-night-200">
        One cell per night, from local solar noon to the next (UTC {offsetH >= 0 ? "+" : "−"} {Math.abs(offsetH).toFixed(2)} h), dated by its evening.{" "}
        {traceHref ? "Hover or focus a night for its dark minutes; open it to see that night's current." : ""}
      </p>
      <NightCells nights={nights} traceHref={traceHref} />
    </section>
  );
}

/** The legend with counts and the grid of nights (study page and printable report). */
export function NightCells({ nights, traceHref }: { nights: Night[]; traceHref?: (n: Night) => string }) {
  const counts = nightCounts(nights);
  const openInApp = useClientNavigation();
  return (
    <>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm" aria-label="Legend">
        {NIGHT_STATUSES.filter((s) => s !== "none" || counts.none > 0).map((s) => (
          <li key={s} className="flex items-center gap-1.5" data-status={s}>
            <Swatch status={s} />
            {NIGHT_STATUS_STYLE[s].label}: <span className="figure">{counts[s]}</span>
          </li>
        ))}
      </ul>
      {/* A constant of ours, not user data: the cells' colours and marks by status. */}
      <style dangerouslySetInnerHTML={{ __html: NIGHT_CELL_CSS }} />
      <div className="overflow-x-auto">
        <table className="night-grid" aria-label="Night-by-night calendar" onClick={traceHref ? openInApp : undefined}>
          <thead>
            <tr>
              <th scope="col">Month</th>
              {Array.from({ length: 31 }, (_, d) => (
                <th key={d} scope="col" className="figure text-center text-[10px] font-normal text-night-400">
                  {d + 1}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {nightsByMonth(nights).map(({ month, days }) => (
              <tr key={month}>
                <th scope="row" className="figure pr-2 text-xs font-normal">
                  {month}
                </th>
                {days.map((n, d) => (
                  <td key={d}>
                    {n && <NightCell night={n} href={traceHref?.(n)} />}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}

function Swatch({ status }: { status: NightStatus }) {
  const s = NIGHT_STATUS_STYLE[status];
  return (
    <span
      aria-hidden="true"
      className="inline-flex h-4 w-4 items-center justify-center rounded-sm border border-night-600 text-[10px] leading-none"
      style={{ background: s.colour, color: s.text }}
    >
      {s.mark}
    </span>
  );
}

/**
 * Opens a night's link inside the app (no full page load), like a router Link, from one handler
 * on the grid: a year has ~365 cells, and a Link each cost about a tenth of the page's render.
 */
function useClientNavigation() {
  const navigate = useNavigate();
  return (event: MouseEvent<HTMLElement>) => {
    if (event.defaultPrevented || event.button !== 0 || event.metaKey || event.ctrlKey || event.shiftKey || event.altKey) return;
    const link = (event.target as Element).closest?.("a[data-status]");
    const href = link?.getAttribute("href");
    if (!href) return;
    event.preventDefault();
    navigate(href);
  };
}

/**
 * A year draws ~365 of these, so each is as short as it can be: its look is the night-cell class
 * (app.css) and its colour and mark come from NIGHT_CELL_CSS by data-status. A link's accessible
 * name is its title (it has no text), which is also the hover text.
 */
function NightCell({ night, href }: { night: Night; href?: string }) {
  const label = describeNight(night);
  return href ? (
    <a href={href} title={label} data-status={night.status} className="night-cell" />
  ) : (
    <span title={label} aria-label={label} role="img" data-status={night.status} className="night-cell" />
  );
}
