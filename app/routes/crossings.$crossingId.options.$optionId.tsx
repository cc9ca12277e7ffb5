import { Form, Link, redirect } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.options.$optionId";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { getCrossing } from "~/services/circuits.server";
import { deleteOption, getOption, optionFormContext, optionValues, updateOption } from "~/services/lighting-options.server";
import { lightingOptionFormSchema } from "../../shared/lighting-option-schemas";
import { LightingOptionForm } from "~/components/lighting-options";

const EDITORS = ["engineer", "consultant"] as const;

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, ...EDITORS);
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const option = await orNotFound(getOption(user.organisationId, crossing.id, pageId(params.optionId)));
  return { crossing: { id: crossing.id, name: crossing.name }, values: optionValues(option), context: await optionFormContext(user.organisationId, crossing) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, ...EDITORS);
  const crossingId = pageId(params.crossingId);
  const id = pageId(params.optionId);
  const fields = await readForm(request);
  if (fields.intent === "delete") {
    await orNotFound(deleteOption(user, crossingId, id));
    throw redirect(`/crossings/${crossingId}#options-heading`);
  }
  const form = parseForm(lightingOptionFormSchema, fields);
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(updateOption(user, crossingId, id, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${crossingId}#options-heading`);
}

export default function EditOptionPage({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, values, context } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`${values.name} · ${crossing.name} · Duskline`}</title>
      <p className="text-sm text-night-400">
        <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link> /
      </p>
      <h1>{`Edit option: ${values.name}`}</h1>
      <LightingOptionForm values={values} context={context} errors={actionData?.errors} message={actionData?.message} submitLabel="Save option" />
      <Form method="post" className="card max-w-3xl" onSubmit={(e) => !confirm(`Delete ${values.name}?`) && e.preventDefault()}>
        <h2>Delete this option</h2>
        <p className="my-2 text-sm text-night-400">It leaves the comparison. This cannot be undone.</p>
        <button className="btn-quiet text-verdict-nogo" name="intent" value="delete" type="submit">
          Delete option
        </button>
      </Form>
    </div>
  );
}
