import { Link } from "react-router";
import type { VerdictStatus } from "../../shared/study-schemas";
import { formatAvailability, formatHours } from "../../shared/format";
import { VerdictBadge } from "./verdict-badge";

export interface CrossingStudyRow {
  id: number;
  verdict: VerdictStatus;
  availability: number | null;
  darkHours: number;
  createdAt: string;
  deviceName: string;
  profileName: string;
}

/** The crossing's feasibility runs, newest first; earlier runs stay readable. */
export function CrossingStudies({ crossingId, studies, canRun }: { crossingId: number; studies: CrossingStudyRow[]; canRun: boolean }) {
  return (
    <section className="card" aria-labelledby="studies-heading">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <h2 id="studies-heading">Feasibility studies</h2>
        {canRun && (
          <span className="flex gap-2">
            <Link to={`/crossings/${crossingId}/studies/new`} className="btn-quiet">
              Run a study
            </Link>
            <Link to={`/crossings/${crossingId}/optimise`} className="btn-quiet">
              Find the cheapest device
            </Link>
          </span>
        )}
      </div>
      {studies.length === 0 ? (
        <p className="text-night-400">No study yet. A study checks, from the circuit's load history, whether a line-powered light would stay lit every night.</p>
      ) : (
        <table>
          <thead>
            <tr>
              <th scope="col">Run (UTC)</th>
              <th scope="col">Verdict</th>
              <th scope="col">Availability</th>
              <th scope="col">Dark hours</th>
              <th scope="col">Device profile</th>
              <th scope="col">Load profile</th>
            </tr>
          </thead>
          <tbody>
            {studies.map((s, i) => (
              <tr key={s.id}>
                <td className="figure">
                  <Link to={`/studies/${s.id}`}>{s.createdAt.replace("T", " ").slice(0, 16)}</Link>
                  {i === 0 && <span className="ml-2 text-xs text-amber-glow">latest</span>}
                </td>
                <td>
                  <VerdictBadge status={s.verdict} />
                </td>
                <td className="figure">{formatAvailability(s.availability, 2)}</td>
                <td className="figure">{formatHours(s.darkHours)}</td>
                <td>{s.deviceName}</td>
                <td>{s.profileName}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
