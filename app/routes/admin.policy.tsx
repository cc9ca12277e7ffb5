import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/admin.policy";
import { requireRole } from "~/utils/auth.server";
import { parseForm, readForm } from "~/utils/forms.server";
import { getPolicy, savePolicy } from "~/services/policy.server";
import { organisationTimeZone, setOrganisationTimeZone } from "~/services/circuits.server";
import { organisationTimeZoneSchema } from "../../shared/circuit-schemas";
import { TimeZoneNames } from "~/components/time-zone-names";
import { DEFAULT_POLICY, type Policy } from "../../shared/study-schemas";
import { POLICY_PERCENT_FIELDS, policyFormSchema, toPercent } from "../../shared/policy-form";
import { Field, FormMessage } from "~/components/forms";

const FIELDS: { name: keyof Policy; label: string; hint: string; step: string }[] = [
  { name: "minKnownHours", label: "Minimum known hours", hint: "Below this the verdict is insufficient data (a year is 8,760 h).", step: "1" },
  { name: "minCoverage", label: "Minimum coverage (%)", hint: "Share of the analysed period with known current.", step: "0.1" },
  { name: "goAvailability", label: "Go: availability at least (%)", hint: "Lit hours / required known hours.", step: "0.001" },
  { name: "maxDarkStretchHours", label: "Go: longest dark stretch at most (h)", hint: "0.5 h matches the 30-minute outage-reporting rule.", step: "0.01" },
  { name: "marginalAvailability", label: "Marginal: availability at least (%)", hint: "Below this the verdict is no-go.", step: "0.001" },
];

export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  return { policy: await getPolicy(admin.organisationId), defaults: DEFAULT_POLICY, timeZone: await organisationTimeZone(admin.organisationId) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const admin = await requireRole(context, "admin");
  const fields = await readForm(request);
  if (fields.intent === "timeZone") {
    const zone = parseForm(organisationTimeZoneSchema, fields);
    if (!zone.ok) return zone.response;
    await setOrganisationTimeZone(admin, zone.value.timeZone);
    return { ok: true as const, errors: {}, message: `Time zone set to ${zone.value.timeZone}. Circuits without their own time zone show their times in it; studies run from now count its clock.` };
  }
  const input = fields.intent === "defaults" ? formValues(DEFAULT_POLICY) : fields;
  const form = parseForm(policyFormSchema, input);
  if (!form.ok) return form.response;
  await savePolicy(admin, form.value);
  return { ok: true as const, errors: {}, message: "Policy saved. New studies use it; saved studies keep the verdict they were given." };
}

/** The policy as the form shows it: shares in per cent. */
function formValues(policy: Policy): Record<keyof Policy, number> {
  const out = { ...policy };
  for (const k of POLICY_PERCENT_FIELDS) out[k] = toPercent(policy[k]);
  return out;
}

export default function AdminPolicy({ loaderData, actionData }: Route.ComponentProps) {
  const policy = formValues(loaderData.policy);
  const defaults = formValues(loaderData.defaults);
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-4">
      <title>Verdict policy · Duskline</title>
      <h1>Verdict policy</h1>
      <p className="max-w-2xl text-sm text-night-200">
        How a study's figures become go, marginal, no-go or insufficient data. These are the organisation's defaults; a study may override them and says so.
      </p>
      {actionData?.message && <FormMessage tone={actionData.ok ? "ok" : "error"}>{actionData.message}</FormMessage>}
      <Form method="post" className="card flex max-w-xl flex-col gap-3" noValidate key={JSON.stringify(policy)}>
        {FIELDS.map((f) => (
          <Field key={f.name} name={f.name} label={f.label} errors={actionData?.ok ? undefined : actionData?.errors} hint={`${f.hint} Default ${defaults[f.name]}${(POLICY_PERCENT_FIELDS as readonly string[]).includes(f.name) ? " %" : ""}.`}>
            <input id={f.name} name={f.name} type="number" step={f.step} defaultValue={policy[f.name]} className="figure" required />
          </Field>
        ))}
        <div className="flex gap-2">
          <button className="btn" type="submit" name="intent" value="save" disabled={busy}>
            Save policy
          </button>
          <button className="btn-quiet" type="submit" name="intent" value="defaults" disabled={busy}>
            Restore defaults
          </button>
        </div>
      </Form>
      <Form method="post" className="card flex max-w-xl flex-col gap-3" noValidate key={loaderData.timeZone} aria-labelledby="tz-heading">
        <h2 id="tz-heading">Time zone</h2>
        <Field name="timeZone" label="Organisation's time zone (IANA)" errors={actionData?.ok ? undefined : actionData?.errors} hint="Profile and study pages show times in it for circuits without their own zone (UTC on hover and in exports); the hour × month grid of new studies counts its clock.">
          <input id="timeZone" name="timeZone" defaultValue={loaderData.timeZone} list="time-zone-names" maxLength={64} required autoComplete="off" />
        </Field>
        <TimeZoneNames />
        <button className="btn self-start" type="submit" name="intent" value="timeZone" disabled={busy}>
          Save time zone
        </button>
      </Form>
    </div>
  );
}
