import { redirect } from "react-router";
import type { Route } from "./+types/circuits.new";
import { requireRole } from "~/utils/auth.server";
import { parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { createCircuit, organisationTimeZone } from "~/services/circuits.server";
import { circuitSchema } from "../../shared/circuit-schemas";
import { CircuitForm } from "~/components/circuit-forms";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  return { organisationTimeZone: await organisationTimeZone(user.organisationId) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const form = parseForm(circuitSchema, await readForm(request));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => createCircuit(user, form.value));
  if (!saved.ok) return saved.response;
  throw redirect(`/circuits/${saved.value.id}`);
}

export default function NewCircuit({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="flex flex-col gap-4">
      <title>New circuit · Duskline</title>
      <h1>New circuit</h1>
      <CircuitForm organisationTimeZone={loaderData.organisationTimeZone} errors={actionData?.errors} message={actionData?.message} submitLabel="Create circuit" />
    </div>
  );
}
