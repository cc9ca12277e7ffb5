import { Link } from "react-router";
import type { Route } from "./+types/portfolio";
import { requireUser } from "~/utils/auth.server";
import { portfolioInView } from "~/services/portfolio.server";
import { crossingsMap } from "~/services/base-map.server";
import { SafetyCaution } from "~/components/safety-caution";
import { VerdictBadge } from "~/components/verdict-badge";
import { PortfolioFilters, PortfolioTable } from "~/components/portfolio-table";
import { CrossingsMap } from "~/components/crossings-map";
import { PortfolioCharts } from "~/components/portfolio-charts";
import { searchParamsOfView, VERDICT_FILTERS, VERDICT_WORDS, viewFromSearchParams, reviewWords } from "../../shared/portfolio";
import { formatAvailability } from "../../shared/format";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const view = viewFromSearchParams(new URL(request.url).searchParams);
  const { counts, stale, rows, attention, inViewIds, description } = await portfolioInView(user.organisationId, view);
  return {
    counts,
    stale,
    rows,
    attention: attention.slice(0, 15),
    attentionCount: attention.length,
    view,
    summary: description,
    inViewIds,
    map: crossingsMap(rows.map((r) => ({ id: r.crossingId, lat: r.lat, lon: r.lon }))),
    query: searchParamsOfView(view).toString(),
    organisation: user.organisationName,
    // To the minute, as shown: the same data within a minute is the same page (page cache).
    atMinute: new Date().toISOString().slice(0, 16).replace("T", " "),
  };
}

export default function Portfolio({ loaderData }: Route.ComponentProps) {
  const { counts, stale, rows, attention, attentionCount, view, summary, inViewIds, map, query, organisation, atMinute } = loaderData;
  const inView = new Set(inViewIds);
  const circuits = [...new Set(rows.map((r) => r.circuit))].sort();
  return (
    <div className="flex flex-col gap-6">
      <title>Portfolio · Duskline</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1>Portfolio</h1>
          <p className="text-sm text-night-400">
            {organisation} · latest study of each crossing · {atMinute} UTC
          </p>
        </div>
        <div className="no-print flex gap-2">
          <a href={`/portfolio.csv${query ? `?${query}` : ""}`} className="btn-quiet" download>
            Export this view (CSV)
          </a>
          <button type="button" className="btn-quiet" onClick={() => window.print()}>
            Print
          </button>
        </div>
      </div>
      <SafetyCaution />
      <nav className="grid gap-4 sm:grid-cols-3 lg:grid-cols-7" aria-label="Crossings by verdict">
        {VERDICT_FILTERS.map((v) => (
          <Link key={v} to={`/portfolio?verdict=${v}`} className="card no-underline hover:border-amber-glow" aria-label={`${counts[v]} ${VERDICT_WORDS[v].toLowerCase()}: show them`}>
            {v === "not-studied" ? <span className="text-sm text-night-400">Not studied</span> : <VerdictBadge status={v} />}
            <p className="figure mt-2 text-3xl text-night-100">{counts[v]}</p>
            <p className="text-sm text-night-400">{v === "not-studied" ? "crossings without a study" : `${VERDICT_WORDS[v].toLowerCase()} crossings`}</p>
          </Link>
        ))}
        <Link to="/portfolio?review=stale" className="card no-underline hover:border-amber-glow">
          <span className="text-sm text-amber-glow">Stale approvals</span>
          <p className="figure mt-2 text-3xl text-night-100">{stale}</p>
          <p className="text-sm text-night-400">approvals whose basis changed</p>
        </Link>
        <Link to="/portfolio?attention=1" className="card no-underline hover:border-amber-glow">
          <span className="text-sm text-night-400">Needs attention</span>
          <p className="figure mt-2 text-3xl text-night-100">{attentionCount}</p>
          <p className="text-sm text-night-400">not go, never studied or stale</p>
        </Link>
      </nav>
      <section className="card" aria-labelledby="attention-heading">
        <h2 id="attention-heading" className="mb-2">
          Needs attention
        </h2>
        {attention.length === 0 ? (
          <p className="text-night-400">Every crossing is studied, go, and any approval is current.</p>
        ) : (
          <ol className="flex list-decimal flex-col gap-1 pl-6">
            {attention.map((r) => (
              <li key={r.crossingId}>
                <Link to={`/crossings/${r.crossingId}`}>{r.crossing}</Link> ({r.circuit}) — <VerdictBadge status={r.verdict} />{" "}
                {r.verdict == null && <span className="text-sm text-night-200">never studied</span>}
                {r.availability != null && <span className="figure text-sm">availability {formatAvailability(r.availability, 2)}</span>}
                {r.reviewStale && <span className="text-sm text-amber-glow"> · {reviewWords(r)}: {r.staleReasons.join("; ")}</span>}
              </li>
            ))}
          </ol>
        )}
        {attentionCount > attention.length && (
          <p className="mt-2 text-sm">
            <Link to="/portfolio?attention=1">All {attentionCount} crossings needing attention</Link>
          </p>
        )}
      </section>
      <PortfolioFilters view={view} circuits={circuits} />
      <section className="card flex flex-col gap-2" aria-labelledby="all-heading">
        <h2 id="all-heading">Crossings</h2>
        <p className="text-sm text-night-200" role="status">
          {summary}
        </p>
        <PortfolioTable rows={rows} view={view} />
      </section>
      <CrossingsMap map={map} crossings={rows.filter((r) => inView.has(r.crossingId))} title={`Map of the ${inViewIds.length} crossings in this view`} />
      <PortfolioCharts rows={rows} />
    </div>
  );
}
