import { Link, redirect } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.details";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { crossingJson, getCircuit, getCrossing } from "~/services/circuits.server";
import { updateCrossingDetails } from "~/services/crossing-marking.server";
import { crossingDetailsFormToInput, crossingDetailsSchema } from "../../shared/crossing-details-schemas";
import { CrossingDetailsForm } from "~/components/crossing-details-form";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer", "consultant");
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const circuit = await getCircuit(user.organisationId, crossing.circuitId);
  return { crossing: crossingJson(crossing), voltageKv: circuit.voltageKv };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer", "consultant");
  const id = pageId(params.crossingId);
  const form = parseForm(crossingDetailsSchema, crossingDetailsFormToInput(await readForm(request)));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(updateCrossingDetails(user, id, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${id}`);
}

export default function CrossingDetailsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, voltageKv } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`Span and marking details · ${crossing.name} · Duskline`}</title>
      <p className="text-sm text-night-400">
        <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link> /
      </p>
      <h1>Span and marking details</h1>
      <p className="figure text-night-200">{`Span ${crossing.spanLength.value} ${crossing.spanLength.unit} · ${voltageKv} kV`}</p>
      <CrossingDetailsForm details={crossing.details} unit={crossing.spanLength.unit} voltageKv={voltageKv} errors={actionData?.errors} message={actionData?.message} />
    </div>
  );
}
