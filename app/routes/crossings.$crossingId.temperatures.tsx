import { Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.temperatures";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { crossingJson, getCrossing } from "~/services/circuits.server";
import { saveTemperatureNormals } from "~/services/crossing-temperatures.server";
import { Field, FormMessage } from "~/components/forms";
import { temperatureNormalsFromForm, temperatureNormalsSchema } from "../../shared/temperature-schemas";

const MONTHS = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];

export async function loader({ params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer", "consultant");
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  return { crossing: crossingJson(crossing), normals: crossing.temperatureNormals ?? null };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer", "consultant");
  const id = pageId(params.crossingId);
  const submitted = temperatureNormalsFromForm(await readForm(request));
  const form = submitted.clear ? ({ ok: true, value: null } as const) : parseForm(temperatureNormalsSchema, submitted.value);
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(saveTemperatureNormals(user, id, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${id}`);
}

export default function TemperatureNormalsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, normals } = loaderData;
  const errors = actionData?.errors;
  // A value's own error ("monthlyC2") is shown on the one field, named by its month.
  const listErrors = Object.entries(errors ?? {}).flatMap(([key, messages]) => {
    const m = /^monthlyC(\d+)?$/.exec(key);
    if (!m) return [];
    return (messages ?? []).map((message) => (m[1] === undefined ? message : `${MONTHS[Number(m[1])] ?? `Value ${Number(m[1]) + 1}`}: ${message}`));
  });
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-4">
      <title>{`Temperatures · ${crossing.name} · Duskline`}</title>
      <p className="text-sm text-night-400">
        <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link> /
      </p>
      <h1>Monthly normal temperatures</h1>
      <p className="text-night-200">
        The crossing's mean air temperature in each calendar month, for the cold derating of device storage. Its studies and the optimiser use them unless a run gives its own;
        months the load profile recorded temperatures for use the recorded means instead. Leave both fields empty to clear them.
      </p>
      {actionData?.message && <FormMessage tone="error">{actionData.message}</FormMessage>}
      <Form method="post" className="card flex max-w-xl flex-col gap-3" noValidate>
        <Field name="monthlyC" label="January to December (°C)" errors={{ ...errors, monthlyC: listErrors }} hint="Twelve numbers separated by spaces or commas.">
          <input id="monthlyC" name="monthlyC" className="figure" defaultValue={normals?.monthlyC.join(" ") ?? ""} placeholder="-8 -5 2 9 15 21 25 24 18 10 2 -5" />
        </Field>
        <Field name="source" label="Source" errors={errors} hint="Where the values come from: station, period, publication.">
          <input id="source" name="source" defaultValue={normals?.source ?? ""} />
        </Field>
        <button type="submit" className="btn self-start" disabled={busy}>
          {busy ? "Saving…" : "Save temperatures"}
        </button>
      </Form>
    </div>
  );
}
