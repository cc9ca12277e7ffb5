import { Link } from "react-router";
import type { Route } from "./+types/portfolio";
import { requireUser } from "~/utils/auth.server";
import { portfolio } from "~/services/studies.server";
import { SafetyCaution } from "~/components/safety-caution";
import { VerdictBadge, VERDICT_LABELS } from "~/components/verdict-badge";
import { CROSSING_KIND_LABELS } from "../../shared/circuit-schemas";
import { formatAvailability, formatHours } from "../../shared/format";
import { VERDICT_STATUSES } from "../../shared/study-schemas";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  return { ...(await portfolio(user.organisationId)), organisation: user.organisationName, at: new Date().toISOString() };
}

export default function Portfolio({ loaderData }: Route.ComponentProps) {
  const { counts, rows, worst, organisation, at } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <title>Portfolio · Duskline</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1>Portfolio</h1>
          <p className="text-sm text-night-400">
            {organisation} · latest study of each crossing · {at.slice(0, 16).replace("T", " ")} UTC
          </p>
        </div>
        <div className="no-print flex gap-2">
          <a href="/portfolio.csv" className="btn-quiet" download>
            Export CSV
          </a>
          <button type="button" className="btn-quiet" onClick={() => window.print()}>
            Print
          </button>
        </div>
      </div>
      <SafetyCaution />
      <section className="grid gap-4 sm:grid-cols-3 lg:grid-cols-5" aria-label="Crossings by verdict">
        {VERDICT_STATUSES.map((v) => (
          <div key={v} className="card">
            <VerdictBadge status={v} />
            <p className="figure mt-2 text-3xl">{counts[v]}</p>
            <p className="text-sm text-night-400">{VERDICT_LABELS[v].toLowerCase()} crossings</p>
          </div>
        ))}
        <div className="card">
          <span className="text-sm text-night-400">Not studied</span>
          <p className="figure mt-2 text-3xl">{counts["not-studied"]}</p>
          <p className="text-sm text-night-400">crossings without a study</p>
        </div>
      </section>
      <section className="card" aria-labelledby="worst-heading">
        <h2 id="worst-heading" className="mb-2">
          Needs attention
        </h2>
        {worst.length === 0 ? (
          <p className="text-night-400">Every studied crossing is go.</p>
        ) : (
          <ol className="flex list-decimal flex-col gap-1 pl-6">
            {worst.map((r) => (
              <li key={r.crossingId}>
                <Link to={`/crossings/${r.crossingId}`}>{r.crossing}</Link> ({r.circuit}) — <VerdictBadge status={r.verdict} />{" "}
                {r.availability != null && <span className="figure text-sm">availability {formatAvailability(r.availability, 2)}</span>}
              </li>
            ))}
          </ol>
        )}
      </section>
      <section className="card overflow-x-auto" aria-labelledby="all-heading">
        <h2 id="all-heading" className="mb-2">
          All crossings
        </h2>
        <table>
          <thead>
            <tr>
              <th scope="col">Crossing</th>
              <th scope="col">Circuit</th>
              <th scope="col">Kind</th>
              <th scope="col">Verdict</th>
              <th scope="col">Availability</th>
              <th scope="col">Dark hours</th>
              <th scope="col">Longest dark</th>
              <th scope="col">Study</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.crossingId}>
                <td>
                  <Link to={`/crossings/${r.crossingId}`}>{r.crossing}</Link>
                </td>
                <td>
                  {r.circuit} <span className="figure text-night-400">{r.voltageKv} kV</span>
                </td>
                <td>{CROSSING_KIND_LABELS[r.kind]}</td>
                <td>
                  <VerdictBadge status={r.verdict} />
                </td>
                <td className="figure">{formatAvailability(r.availability)}</td>
                <td className="figure">{r.darkHours == null ? "—" : formatHours(r.darkHours)}</td>
                <td className="figure">{r.longestDarkHours == null ? "—" : formatHours(r.longestDarkHours, 2)}</td>
                <td className="figure">{r.studyId ? <Link to={`/studies/${r.studyId}`}>{r.studiedAt?.slice(0, 10)}</Link> : "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </div>
  );
}
