import { redirect } from "react-router";
import type { Route } from "./+types/circuits.$circuitId.crossings.new";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { createCrossing, getCircuit } from "~/services/circuits.server";
import { crossingSchema } from "../../shared/circuit-schemas";
import { CrossingForm } from "~/components/circuit-forms";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  const circuit = await orNotFound(getCircuit(user.organisationId, pageId(params.circuitId)));
  return { circuit: { id: circuit.id, name: circuit.name } };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const circuitId = pageId(params.circuitId);
  const form = parseForm(crossingSchema, await readForm(request));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(createCrossing(user, circuitId, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${saved.value.id}`);
}

export default function NewCrossing({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="flex flex-col gap-4">
      <title>New crossing · Duskline</title>
      <h1>New crossing on {loaderData.circuit.name}</h1>
      <CrossingForm errors={actionData?.errors} message={actionData?.message} submitLabel="Create crossing" chooseRuleSet />
    </div>
  );
}
