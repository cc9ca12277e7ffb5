import { Form, redirect } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.edit";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { crossingJson, deleteCrossing, getCrossing, updateCrossing } from "~/services/circuits.server";
import { crossingSchema } from "../../shared/circuit-schemas";
import { CrossingForm } from "~/components/circuit-forms";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  return { crossing: crossingJson(await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)))) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const id = pageId(params.crossingId);
  const fields = await readForm(request);
  if (fields.intent === "delete") {
    const circuitId = await orNotFound(deleteCrossing(user, id));
    throw redirect(`/circuits/${circuitId}`);
  }
  const form = parseForm(crossingSchema, fields);
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(updateCrossing(user, id, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${id}`);
}

export default function EditCrossing({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`Edit ${crossing.name} · Duskline`}</title>
      <h1>Edit crossing</h1>
      <CrossingForm values={crossing} errors={actionData?.errors} message={actionData?.message} submitLabel="Save changes" />
      <Form method="post" className="card max-w-xl" onSubmit={(e) => !confirm(`Delete ${crossing.name}?`) && e.preventDefault()}>
        <h2>Delete this crossing</h2>
        <p className="my-2 text-sm text-night-400">Removes its studies and options too. This cannot be undone.</p>
        <button className="btn-quiet text-verdict-nogo" name="intent" value="delete" type="submit">
          Delete crossing
        </button>
      </Form>
    </div>
  );
}
