import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/rules.$ruleKey";
import { hasRole, requireRole, requireUser } from "~/utils/auth.server";
import { orNotFound, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { confirmRule, ruleWithHistory } from "~/services/rule-book.server";
import { Field, FormMessage } from "~/components/forms";
import { RuleStatus } from "~/components/rule-status";
import { numberLabel, numericValues, valuesInWords } from "../../lib/rulebook/book";
import { RULE_SET_LABELS } from "../../shared/crossing-details-schemas";
import { EDITIONS, citation, numberField, ruleConfirmFromForm, ruleConfirmSchema } from "../../shared/rule-book";

function ruleKey(value: string | undefined): string {
  if (!value || !/^[a-z0-9.-]{1,100}$/.test(value)) throw new Response("Not found", { status: 404, statusText: "Not Found" });
  return value;
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const { entry, history } = await orNotFound(ruleWithHistory(user.organisationId, ruleKey(params.ruleKey)));
  return {
    canConfirm: hasRole(user, ["consultant"]),
    entry,
    numbers: numericValues(entry.values).map((n) => ({ ...n, field: numberField(n.path), label: numberLabel(n.path) })),
    values: valuesInWords(entry.values),
    citation: citation(entry.source),
    currentEdition: EDITIONS[entry.source.document]?.current ?? null,
    today: new Date().toISOString().slice(0, 10),
    history: history.map((h) => ({ ...h, valuesBefore: valuesInWords(h.valuesBefore), valuesAfter: valuesInWords(h.valuesAfter) })),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "consultant");
  const key = ruleKey(params.ruleKey);
  const { entry } = await orNotFound(ruleWithHistory(user.organisationId, key));
  const fields = await readForm(request);
  const form = parseForm(ruleConfirmSchema, ruleConfirmFromForm(fields, numericValues(entry.values).map((n) => n.path)));
  if (!form.ok) return form.response;
  const done = await withInputErrors(() => confirmRule(user, key, form.value));
  if (!done.ok) return done.response;
  return {
    ok: true as const,
    errors: {},
    message: done.value.overridden ? "Value changed and confirmed; the old value is in the history below." : "Rule confirmed.",
  };
}

/** Number fields are named value_<path>; zod reports them under numbers.<path>. */
function errorsFor(errors: Record<string, string[] | undefined> | undefined) {
  if (!errors) return undefined;
  const out: Record<string, string[] | undefined> = { ...errors };
  for (const [k, v] of Object.entries(errors)) if (k.startsWith("numbers")) out[numberField(k.slice("numbers".length).replace(/^\./, "").replace(/^./, (c) => c.toLowerCase()))] = v;
  return out;
}

export default function RulePage({ loaderData, actionData }: Route.ComponentProps) {
  const { entry, numbers, values, citation: cited, canConfirm, history, today, currentEdition } = loaderData;
  const s = entry.source;
  const errors = errorsFor(actionData && !actionData.ok ? actionData.errors : undefined);
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-4">
      <title>{`${s.title} · Rule book · Duskline`}</title>
      <p className="text-sm text-night-400">
        <Link to="/rules">Rule book</Link> / {RULE_SET_LABELS[entry.ruleSet]} /
      </p>
      <h1>{s.title}</h1>
      <div className="card flex flex-col gap-2">
        <p>{s.rule}</p>
        <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[max-content_1fr]">
          <dt className="text-night-400">Value</dt>
          <dd className="figure">{values || "—"}</dd>
          <dt className="text-night-400">Source</dt>
          <dd>{cited}</dd>
          <dt className="text-night-400">Status</dt>
          <dd>
            <RuleStatus source={s} />
          </dd>
        </dl>
      </div>
      {actionData?.message && <FormMessage tone={actionData.ok ? "ok" : "error"}>{actionData.message}</FormMessage>}
      {canConfirm && (
        <Form method="post" className="card flex max-w-xl flex-col gap-3" noValidate key={JSON.stringify(s)}>
          <h2>Confirm against your copy</h2>
          <p className="text-sm text-night-200">
            {`Check the value against the text of ${s.document}${currentEdition ? ` (the current edition is ${currentEdition})` : ""}, then record where you found it. Change a number only if the text says otherwise.`}
          </p>
          <Field name="edition" label="Edition" errors={errors}>
            <input id="edition" name="edition" defaultValue={currentEdition ?? s.edition ?? ""} required />
          </Field>
          <Field name="paragraph" label="Paragraph" errors={errors}>
            <input id="paragraph" name="paragraph" defaultValue={s.paragraph ?? ""} required />
          </Field>
          <Field name="confirmedOn" label="Checked on" errors={errors}>
            <input id="confirmedOn" name="confirmedOn" type="date" defaultValue={today} required />
          </Field>
          <Field name="quote" label="The quotation's first words (optional)" errors={errors}>
            <input id="quote" name="quote" defaultValue={s.quote ?? ""} />
          </Field>
          {numbers.map((n) => (
            <Field key={n.path} name={n.field} label={`Value: ${n.label}`} errors={errors}>
              <input id={n.field} name={n.field} type="number" step="any" defaultValue={n.value} className="figure" required />
            </Field>
          ))}
          <Field name="note" label="Note (optional)" errors={errors}>
            <textarea id="note" name="note" rows={2} />
          </Field>
          <button type="submit" className="btn self-start" disabled={busy}>
            {busy ? "Saving…" : "Confirm rule"}
          </button>
        </Form>
      )}
      <section className="card flex flex-col gap-2" aria-labelledby="rule-history">
        <h2 id="rule-history">History</h2>
        {history.length === 0 ? (
          <p className="text-sm text-night-400">Shipped default; not changed by your organisation.</p>
        ) : (
          <ol className="flex flex-col gap-2 text-sm">
            {history.map((h, i) => (
              <li key={i}>
                {`${h.by} ${h.action === "override" ? `changed the value from ${h.valuesBefore} to ${h.valuesAfter} and confirmed it` : "confirmed the rule"} against ${h.sourceAfter} (checked on ${h.confirmedOn}; before: ${h.sourceBefore}, ${h.statusBefore})`}
                {h.note ? `: “${h.note}”` : ""} <span className="text-night-400">{h.at.slice(0, 16).replace("T", " ")} UTC</span>
              </li>
            ))}
          </ol>
        )}
      </section>
    </div>
  );
}
