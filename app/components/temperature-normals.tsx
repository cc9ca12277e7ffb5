import { Link } from "react-router";
import type { TemperatureNormals } from "../../shared/temperature-schemas";

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** The crossing's monthly normal temperatures (cold-weather storage), on the crossing page. */
export function TemperatureNormalsPanel({ crossingId, normals, canEdit }: { crossingId: number; normals: TemperatureNormals | null; canEdit: boolean }) {
  return (
    <section className="card flex flex-col gap-3" aria-labelledby="temperatures-heading" data-testid="temperature-normals">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="temperatures-heading">Monthly normal temperatures</h2>
        {canEdit && (
          <Link to={`/crossings/${crossingId}/temperatures`} className="btn-quiet no-print">
            Edit the temperatures
          </Link>
        )}
      </div>
      {normals ? (
        <>
          <table className="text-sm">
            <thead>
              <tr>
                {MONTHS.map((m) => (
                  <th key={m} scope="col">
                    {m}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              <tr>
                {normals.monthlyC.map((c, i) => (
                  <td key={MONTHS[i]} className="figure">{`${c} °C`}</td>
                ))}
              </tr>
            </tbody>
          </table>
          <p className="text-xs text-night-400">{`Source: ${normals.source ?? "not stated"}. Studies and the optimiser use these for the devices' cold derating unless a run gives its own; months with recorded temperatures in the load profile use those.`}</p>
        </>
      ) : (
        <p className="text-sm text-night-400">None recorded: studies apply no cold derating unless the run gives monthly temperatures or the load profile recorded them.</p>
      )}
    </section>
  );
}
