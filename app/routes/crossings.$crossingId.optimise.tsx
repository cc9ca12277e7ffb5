import { data, Link, redirect } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.optimise";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { getCircuit, getCrossing } from "~/services/circuits.server";
import { listProfiles } from "~/services/profiles.server";
import { listDeviceProfiles } from "~/services/devices.server";
import { crossingOptimiseSchema, optimiseJobResult, startCrossingOptimise } from "~/services/optimise.server";
import { optimiseFormToRequest } from "../../shared/optimise-forms";
import { Field, FormMessage } from "~/components/forms";
import { OptimiserForm, OptimiserResult } from "~/components/optimiser";
import { SafetyCaution } from "~/components/safety-caution";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const circuit = await getCircuit(user.organisationId, crossing.circuitId);
  const [profiles, devices] = await Promise.all([listProfiles(user.organisationId, crossing.circuitId), listDeviceProfiles(user.organisationId, { includeRetired: false })]);
  const jobId = new URL(request.url).searchParams.get("job");
  const result = jobId ? await orNotFound(optimiseJobResult(user.organisationId, pageId(jobId), { crossingId: crossing.id })) : null;
  return {
    crossing: { id: crossing.id, name: crossing.name },
    circuit: { id: circuit.id, name: circuit.name },
    profiles: profiles.map((p) => ({ id: p.id, name: p.name, start: p.startAt.toISOString(), end: p.endAt.toISOString() })),
    devices: devices.map((d) => ({ id: d.id, name: d.name, minCurrentA: d.spec.minCurrentA, turnOnCurrentA: d.spec.turnOnCurrentA, lifeYears: d.spec.lifeYears })),
    result,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const crossingId = pageId(params.crossingId);
  const devices = await listDeviceProfiles(user.organisationId, { includeRetired: false });
  const { request: body, names } = optimiseFormToRequest(await readForm(request), devices);
  const form = parseForm(crossingOptimiseSchema, body);
  if (!form.ok) return data({ ...form.response.data, names }, { status: 400 });
  const started = await withInputErrors(() => orNotFound(startCrossingOptimise(user, crossingId, form.value)));
  if (!started.ok) return data({ ...started.response.data, names }, { status: 400 });
  throw redirect(`/jobs/${started.value.id}`);
}

export default function CrossingOptimiser({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, circuit, profiles, devices, result } = loaderData;
  const failed = actionData as { errors?: Record<string, string[]>; names?: string[] } | undefined;
  return (
    <div className="flex flex-col gap-4">
      <title>{`Optimiser · ${crossing.name} · Duskline`}</title>
      <h1>Cheapest device and storage that reaches go</h1>
      <p className="text-night-200">
        <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link> on {circuit.name}. Every device ticked is tried with every storage size offered on the load profile
        chosen; the cheapest per year (present value × capital recovery factor) whose verdict is go is recommended.
      </p>
      {result && <OptimiserResult rows={result.candidates} recommended={result.recommended} closest={result.closest} simulations={result.simulations} />}
      {profiles.length === 0 && <FormMessage tone="error">This circuit has no load profile yet. Upload its current history on the circuit page first.</FormMessage>}
      {devices.length === 0 && <FormMessage tone="error">There is no device profile in use. Create one under Device profiles first.</FormMessage>}
      {profiles.length > 0 && devices.length > 0 && (
        <OptimiserForm devices={devices} errors={failed?.errors} names={failed?.names}>
          <Field name="profileId" label="Load profile" errors={failed?.errors}>
            <select id="profileId" name="profileId">
              {profiles.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name} ({p.start.slice(0, 10)} – {p.end.slice(0, 10)})
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
