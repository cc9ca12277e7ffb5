import { Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.aviation";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { crossingJson, getCrossing } from "~/services/circuits.server";
import { saveAviationRecord } from "~/services/aviation-record.server";
import { Field, FormMessage } from "~/components/forms";
import { aviationRecordSchema, type AviationRecord } from "../../shared/aviation-record-schemas";

export async function loader({ params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer", "consultant");
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const record: AviationRecord = crossing.aviationRecord ?? {};
  return { crossing: crossingJson(crossing), record };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer", "consultant");
  const id = pageId(params.crossingId);
  const form = parseForm(aviationRecordSchema, await readForm(request));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(saveAviationRecord(user, id, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${id}`);
}

export default function AviationRecordPage({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, record } = loaderData;
  const errors = actionData?.errors;
  const unit = crossing.spanLength.unit;
  const busy = useNavigation().state === "submitting";
  const text = (name: keyof AviationRecord, label: string, hint?: string) => (
    <Field name={name} label={label} errors={errors} hint={hint}>
      <input id={name} name={name} defaultValue={record[name] === undefined ? "" : String(record[name])} />
    </Field>
  );
  return (
    <div className="flex flex-col gap-4">
      <title>{`Aviation record · ${crossing.name} · Duskline`}</title>
      <p className="text-sm text-night-400">
        <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link> /
      </p>
      <h1>Aviation record</h1>
      {actionData?.message && <FormMessage tone="error">{actionData.message}</FormMessage>}
      <Form method="post" className="card flex max-w-xl flex-col gap-3" noValidate>
        <div className="grid grid-cols-2 gap-3">
          {text("structureNumberA", "Structure number at support A")}
          {text("structureNumberB", "Structure number at support B")}
        </div>
        {text("siteElevation", `Site ground elevation above sea level (${unit})`)}
        <Field name="nearestKind" label="Nearest airport or heliport" errors={errors}>
          <select id="nearestKind" name="nearestKind" defaultValue={record.nearestKind ?? ""}>
            <option value="">None recorded</option>
            <option value="airport">Airport</option>
            <option value="heliport">Heliport</option>
          </select>
        </Field>
        {text("nearestDistance", `Distance to its nearest runway point or landing area (${unit})`)}
        {text("nearestLongestRunway", `Its longest runway (${unit})`, "Airports only.")}
        {text("nearestElevation", `Elevation of that runway point or landing area (${unit})`)}
        {text("determinationNumber", "Aeronautical study number of the determination")}
        {text("determinationDate", "Date of the determination (YYYY-MM-DD)")}
        {text("determinationRequires", "Marking and lighting the determination requires")}
        <button type="submit" className="btn self-start" disabled={busy}>
          {busy ? "Saving…" : "Save aviation record"}
        </button>
      </Form>
    </div>
  );
}
