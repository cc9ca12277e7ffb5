import { Link } from "react-router";
import type { Route } from "./+types/circuits.$circuitId";
import { hasRole, requireUser } from "~/utils/auth.server";
import { getEnv } from "~/utils/env.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { circuitJson, circuitTimeZone, crossingJson, getCircuit, listCrossings } from "~/services/circuits.server";
import { listProfiles, profileJson } from "~/services/profiles.server";
import { CROSSING_KIND_LABELS } from "../../shared/circuit-schemas";
import { ProfileUpload } from "~/components/profile-upload";
import { formatPercent } from "../../shared/format";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const id = pageId(params.circuitId);
  const circuit = await orNotFound(getCircuit(user.organisationId, id));
  const [crossings, profiles] = await Promise.all([listCrossings(user.organisationId, id), listProfiles(user.organisationId, id)]);
  return {
    circuit: circuitJson(circuit),
    timeZone: await circuitTimeZone(circuit),
    crossings: crossings.map(crossingJson),
    profiles: profiles.map((p) => ({ ...profileJson(p), coverage: (p.quality as { coverage?: number }).coverage ?? null })),
    canEdit: hasRole(user, ["engineer"]),
    uploadMaxBytes: getEnv().UPLOAD_MAX_BYTES,
  };
}

export default function CircuitPage({ loaderData }: Route.ComponentProps) {
  const { circuit, crossings, profiles, canEdit } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <title>{`${circuit.name} · Duskline`}</title>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm text-night-400">
            <Link to="/circuits">Circuits</Link> /
          </p>
          <h1>{circuit.name}</h1>
          <p className="figure mt-1 text-night-200">
            {circuit.voltageKv} kV · {circuit.phases} phase{circuit.phases === 1 ? "" : "s"}
            {circuit.normalRatingA != null && ` · rated ${circuit.normalRatingA} A`} · {loaderData.timeZone}
            {!circuit.timeZone && " (the organisation's time zone)"}
          </p>
          {circuit.notes && <p className="mt-2 max-w-2xl text-sm text-night-200">{circuit.notes}</p>}
        </div>
        {canEdit && (
          <Link to={`/circuits/${circuit.id}/edit`} className="btn-quiet">
            Edit circuit
          </Link>
        )}
      </div>

      <section className="card" aria-labelledby="crossings-heading">
        <div className="mb-3 flex items-center justify-between">
          <h2 id="crossings-heading">Crossings</h2>
          {canEdit && (
            <Link to={`/circuits/${circuit.id}/crossings/new`} className="btn-quiet">
              Add crossing
            </Link>
          )}
        </div>
        {crossings.length === 0 ? (
          <p className="text-night-400">No crossings on this circuit yet.</p>
        ) : (
          <table>
            <thead>
              <tr>
                <th scope="col">Crossing</th>
                <th scope="col">Kind</th>
                <th scope="col">Span</th>
                <th scope="col">Location (lat, lon)</th>
              </tr>
            </thead>
            <tbody>
              {crossings.map((x) => (
                <tr key={x.id}>
                  <td>
                    <Link to={`/crossings/${x.id}`}>{x.name}</Link>
                  </td>
                  <td>{CROSSING_KIND_LABELS[x.kind]}</td>
                  <td className="figure">
                    {x.spanLength.value} {x.spanLength.unit}
                  </td>
                  <td className="figure">
                    {x.lat.toFixed(4)}, {x.lon.toFixed(4)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section className="card" aria-labelledby="profiles-heading">
        <h2 id="profiles-heading" className="mb-3">
          Load profiles
        </h2>
        {profiles.length === 0 ? (
          <p className="text-night-400">No current history uploaded yet.</p>
        ) : (
          <table>
            <thead>
              <tr>
                <th scope="col">Profile</th>
                <th scope="col">Period (UTC)</th>
                <th scope="col">Phases</th>
                <th scope="col">Samples</th>
                <th scope="col">Coverage</th>
              </tr>
            </thead>
            <tbody>
              {profiles.map((p) => (
                <tr key={p.id}>
                  <td>
                    <Link to={`/profiles/${p.id}`}>{p.name}</Link>
                  </td>
                  <td className="figure">
                    {p.start.slice(0, 10)} – {p.end.slice(0, 10)}
                  </td>
                  <td className="figure">{p.phases.join(", ")}</td>
                  <td className="figure">{p.samples.toLocaleString("en-US")}</td>
                  <td className="figure">{p.coverage == null ? "—" : formatPercent(p.coverage, 1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      {canEdit && <ProfileUpload circuitId={circuit.id} phases={circuit.phases} maxBytes={loaderData.uploadMaxBytes} voltageKv={circuit.voltageKv} timeZone={loaderData.timeZone} />}
    </div>
  );
}
