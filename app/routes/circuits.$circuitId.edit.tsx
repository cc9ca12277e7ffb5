import { Form, redirect } from "react-router";
import type { Route } from "./+types/circuits.$circuitId.edit";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { circuitJson, deleteCircuit, getCircuit, organisationTimeZone, updateCircuit } from "~/services/circuits.server";
import { circuitSchema } from "../../shared/circuit-schemas";
import { CircuitForm } from "~/components/circuit-forms";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  return { circuit: circuitJson(await orNotFound(getCircuit(user.organisationId, pageId(params.circuitId)))), organisationTimeZone: await organisationTimeZone(user.organisationId) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const id = pageId(params.circuitId);
  const fields = await readForm(request);
  if (fields.intent === "delete") {
    await orNotFound(deleteCircuit(user, id));
    throw redirect("/circuits");
  }
  const form = parseForm(circuitSchema, fields);
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(updateCircuit(user, id, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/circuits/${id}`);
}

export default function EditCircuit({ loaderData, actionData }: Route.ComponentProps) {
  const { circuit } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`Edit ${circuit.name} · Duskline`}</title>
      <h1>Edit circuit</h1>
      <CircuitForm organisationTimeZone={loaderData.organisationTimeZone} values={circuit} errors={actionData?.errors} message={actionData?.message} submitLabel="Save changes" />
      <Form method="post" className="card max-w-xl" onSubmit={(e) => !confirm(`Delete ${circuit.name} with its crossings, load profiles and studies?`) && e.preventDefault()}>
        <h2>Delete this circuit</h2>
        <p className="my-2 text-sm text-night-400">Removes its crossings, load profiles and studies too. This cannot be undone.</p>
        <button className="btn-quiet text-verdict-nogo" name="intent" value="delete" type="submit">
          Delete circuit
        </button>
      </Form>
    </div>
  );
}
