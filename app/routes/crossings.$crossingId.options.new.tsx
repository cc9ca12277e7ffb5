import { Form, Link, redirect } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.options.new";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { getCrossing } from "~/services/circuits.server";
import { createOption, newOptionValues, optionFormContext } from "~/services/lighting-options.server";
import { INSTALLATION_METHODS, OPTION_KINDS, type InstallationMethod, type OptionKind } from "../../shared/cost-schemas";
import { INSTALLATION_METHOD_LABELS, lightingOptionFormSchema, lightingOptionFormToInput, OPTION_KIND_LABELS } from "../../shared/lighting-option-schemas";
import { LightingOptionForm } from "~/components/lighting-options";

const EDITORS = ["engineer", "consultant"] as const;

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, ...EDITORS);
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const search = new URL(request.url).searchParams;
  const kind = (OPTION_KINDS as readonly string[]).includes(search.get("kind") ?? "") ? (search.get("kind") as OptionKind) : "line-powered";
  const method = (INSTALLATION_METHODS as readonly string[]).includes(search.get("method") ?? "") ? (search.get("method") as InstallationMethod) : undefined;
  const formContext = await optionFormContext(user.organisationId, crossing);
  return { crossing: { id: crossing.id, name: crossing.name }, kind, method: method ?? "", values: newOptionValues(kind, method, formContext.counts), context: formContext };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, ...EDITORS);
  const crossingId = pageId(params.crossingId);
  const form = parseForm(lightingOptionFormSchema, lightingOptionFormToInput(await readForm(request)));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(createOption(user, crossingId, form.value)));
  if (!saved.ok) return saved.response;
  throw redirect(`/crossings/${crossingId}#options-heading`);
}

export default function NewOptionPage({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, kind, method, values, context } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`New lighting option · ${crossing.name} · Duskline`}</title>
      <p className="text-sm text-night-400">
        <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link> /
      </p>
      <h1>New lighting option</h1>
      <Form method="get" className="card flex max-w-3xl flex-wrap items-end gap-3" aria-label="Start from demo figures">
        <div className="flex flex-col gap-1">
          <label htmlFor="start-kind">Start from the demo figures of</label>
          <select id="start-kind" name="kind" defaultValue={kind}>
            {OPTION_KINDS.map((k) => (
              <option key={k} value={k}>
                {OPTION_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="start-method">installed by</label>
          <select id="start-method" name="method" defaultValue={method}>
            <option value="">its usual method</option>
            {INSTALLATION_METHODS.map((m) => (
              <option key={m} value={m}>
                {INSTALLATION_METHOD_LABELS[m]}
              </option>
            ))}
          </select>
        </div>
        <button type="submit" className="btn-quiet">
          Fill the form
        </button>
        <p className="basis-full text-xs text-night-400">{context.demoLabel}</p>
      </Form>
      <LightingOptionForm key={`${kind}-${method}`} values={values} context={context} errors={actionData?.errors} message={actionData?.message} submitLabel="Add option" />
    </div>
  );
}
