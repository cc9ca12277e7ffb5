import { Link } from "react-router";
import type { Route } from "./+types/circuits";
import { hasRole, requireUser } from "~/utils/auth.server";
import { listCircuits } from "~/services/circuits.server";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  return { circuits: await listCircuits(user.organisationId), canEdit: hasRole(user, ["engineer"]) };
}

export default function Circuits({ loaderData }: Route.ComponentProps) {
  const { circuits, canEdit } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>Circuits · Duskline</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1>Circuits</h1>
        {canEdit && (
          <Link to="/circuits/new" className="btn">
            New circuit
          </Link>
        )}
      </div>
      {circuits.length === 0 ? (
        <p className="card text-night-200">No circuits yet.{canEdit ? " Create one to add its crossings and upload its current history." : ""}</p>
      ) : (
        <div className="card overflow-x-auto">
          <table>
            <thead>
              <tr>
                <th scope="col">Circuit</th>
                <th scope="col">Voltage</th>
                <th scope="col">Phases</th>
                <th scope="col">Normal rating</th>
                <th scope="col">Crossings</th>
                <th scope="col">Load profiles</th>
              </tr>
            </thead>
            <tbody>
              {circuits.map((c) => (
                <tr key={c.id}>
                  <td>
                    <Link to={`/circuits/${c.id}`}>{c.name}</Link>
                  </td>
                  <td className="figure">{c.voltageKv} kV</td>
                  <td className="figure">{c.phases}</td>
                  <td className="figure">{c.normalRatingA == null ? "—" : `${c.normalRatingA} A`}</td>
                  <td className="figure">{c.crossings}</td>
                  <td className="figure">{c.profiles}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
