import { data, Link, redirect } from "react-router";
import type { Route } from "./+types/optimise";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { listCircuits } from "~/services/circuits.server";
import { listDeviceProfiles } from "~/services/devices.server";
import { crossingOptimiseSchema, optimiseJobResult, startFleetOptimise } from "~/services/optimise.server";
import { optimiseFormToRequest } from "../../shared/optimise-forms";
import { formatMoney } from "../../shared/format";
import { Field, FormMessage } from "~/components/forms";
import { OptimiserForm } from "~/components/optimiser";
import { SafetyCaution } from "~/components/safety-caution";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  const [circuits, devices] = await Promise.all([listCircuits(user.organisationId), listDeviceProfiles(user.organisationId, { includeRetired: false })]);
  const jobId = new URL(request.url).searchParams.get("job");
  const result = jobId ? { jobId, ...(await orNotFound(optimiseJobResult(user.organisationId, pageId(jobId), "fleet"))) } : null;
  return {
    circuits: circuits.map((c) => ({ id: c.id, name: c.name })),
    devices: devices.map((d) => ({ id: d.id, name: d.name, minCurrentA: d.spec.minCurrentA, turnOnCurrentA: d.spec.turnOnCurrentA, lifeYears: d.spec.lifeYears })),
    result,
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const devices = await listDeviceProfiles(user.organisationId, { includeRetired: false });
  const form = await readForm(request);
  const { request: body, names } = optimiseFormToRequest(form, devices);
  const parsed = parseForm(crossingOptimiseSchema, body);
  if (!parsed.ok) return data({ ...parsed.response.data, names }, { status: 400 });
  const scope = form.scope === "all" || !form.scope ? null : pageId(form.scope);
  const started = await withInputErrors(() => orNotFound(startFleetOptimise(user, scope, parsed.value)));
  if (!started.ok) return data({ ...started.response.data, names }, { status: 400 });
  throw redirect(`/jobs/${started.value.id}`);
}

export default function FleetOptimiser({ loaderData, actionData }: Route.ComponentProps) {
  const { circuits, devices, result } = loaderData;
  const failed = actionData as { errors?: Record<string, string[]>; names?: string[] } | undefined;
  return (
    <div className="flex flex-col gap-4">
      <title>Fleet optimiser · Duskline</title>
      <h1>Cheapest device per crossing, for a circuit or the portfolio</h1>
      <p className="text-night-200">
        Every crossing is optimised on its circuit's newest load profile at its own location (night schedule, the organisation's policy). The recommended device per crossing and the
        fleet's total cost come back as a table and a CSV.
      </p>
      {result && (
        <section className="card flex flex-col gap-3 overflow-x-auto" aria-labelledby="fleet-result">
          <h2 id="fleet-result">Recommended device per crossing</h2>
          <p data-testid="fleet-total">
            Fleet total for the {result.totals.withRecommendation} of {result.totals.crossings} crossings with a recommendation: <strong>{formatMoney(result.totals.equivalentAnnualCost)}</strong>{" "}
            per year ({formatMoney(result.totals.presentValue)} present value).
          </p>
          <p>
            <a href={`/optimise.csv?job=${result.jobId}`} className="btn-quiet" download>
              Download CSV
            </a>
          </p>
          <table>
            <thead>
              <tr>
                <th scope="col">Circuit</th>
                <th scope="col">Crossing</th>
                <th scope="col">Recommended</th>
                <th scope="col">Storage</th>
                <th scope="col">Per year</th>
                <th scope="col">Note</th>
              </tr>
            </thead>
            <tbody>
              {result.rows.map((r) => (
                <tr key={r.crossingId}>
                  <td>{r.circuit}</td>
                  <td>
                    <Link to={`/crossings/${r.crossingId}`}>{r.crossing}</Link>
                  </td>
                  <td>{r.recommended ?? "—"}</td>
                  <td className="figure">{r.storageWh === null ? "—" : `${r.storageWh} Wh`}</td>
                  <td className="figure">{r.equivalentAnnualCost === null ? "—" : formatMoney(r.equivalentAnnualCost)}</td>
                  <td className="text-sm text-night-200">{r.note}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
      {devices.length === 0 ? (
        <FormMessage tone="error">There is no device profile in use. Create one under Device profiles first.</FormMessage>
      ) : (
        <OptimiserForm devices={devices} errors={failed?.errors} names={failed?.names}>
          <Field name="scope" label="Crossings" errors={failed?.errors}>
            <select id="scope" name="scope" defaultValue="all">
              <option value="all">The whole portfolio</option>
              {circuits.map((c) => (
                <option key={c.id} value={c.id}>
                  Circuit {c.name}
                </option>
              ))}
            </select>
          </Field>
        </OptimiserForm>
      )}
      <SafetyCaution />
    </div>
  );
}
