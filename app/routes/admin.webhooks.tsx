import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/admin.webhooks";
import { requireRole } from "~/utils/auth.server";
import { formFailure, orNotFound, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { idField } from "../../shared/fields";
import { createWebhook, deleteWebhook, deliveryJson, listDeliveries, listWebhooks, retryDelivery, setWebhookActive, webhookJson } from "~/services/webhooks.server";
import { WEBHOOK_EVENTS, WEBHOOK_EVENT_LABELS, webhookInputSchema } from "../../shared/webhook-schemas";
import { Field, FormMessage } from "~/components/forms";
import { RowAction } from "~/components/row-action";
import { formatUtc } from "../../shared/format";

export async function loader({ context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  const [webhooks, deliveries] = await Promise.all([listWebhooks(admin.organisationId), listDeliveries(admin.organisationId, { limit: 30 })]);
  return { webhooks: webhooks.map(webhookJson), deliveries: deliveries.map(deliveryJson) };
}

const done = (message: string) => ({ ok: true as const, errors: {}, message, secret: null });

export async function action({ request, context }: Route.ActionArgs) {
  const admin = await requireRole(context, "admin");
  const fields = await readForm(request);
  if (fields.intent === "create") {
    // One checkbox per event: "event:study.completed" = "on".
    const form = parseForm(webhookInputSchema, { url: fields.url, description: fields.description || undefined, events: WEBHOOK_EVENTS.filter((e) => fields[`event:${e}`]) });
    if (!form.ok) return form.response;
    const created = await withInputErrors(() => createWebhook(admin, form.value));
    if (!created.ok) return created.response;
    return { ok: true as const, errors: {}, message: null, secret: created.value.secret };
  }
  const id = idField("Choose an item from the list.").safeParse(fields.id);
  if (!id.success) return formFailure({ id: ["Choose an item from the list."] }, "Choose an item from the list.");
  switch (fields.intent) {
    case "deactivate":
    case "activate":
      await orNotFound(setWebhookActive(admin, id.data, fields.intent === "activate"));
      return done(fields.intent === "activate" ? "Endpoint active: events are sent to it again." : "Endpoint paused: no events are sent to it.");
    case "delete":
      await orNotFound(deleteWebhook(admin, id.data));
      return done("Endpoint removed with its delivery log.");
    case "retry":
      await orNotFound(retryDelivery(admin, id.data));
      return done("Delivery queued to be sent again now.");
    default:
      return formFailure({ intent: ["Unknown action."] }, "Unknown action.");
  }
}

export default function AdminWebhooks({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const secret = actionData?.ok ? actionData.secret : null;
  const errors = actionData && !actionData.ok ? actionData.errors : undefined;
  const urlOf = new Map(loaderData.webhooks.map((w) => [w.id, w.url]));
  return (
    <div className="flex flex-col gap-6">
      <title>Webhooks · Duskline</title>
      <h1>Webhooks</h1>
      <p className="max-w-2xl text-sm text-night-200">
        Duskline posts a JSON event to each endpoint below when something it subscribed to happens. Every delivery is signed: the{" "}
        <span className="figure">Duskline-Signature</span> header is <span className="figure">v1=</span> and the hex HMAC-SHA256, keyed with the endpoint's
        secret, of <span className="figure">Duskline-Timestamp</span>, a full stop and the raw body. A delivery that is not answered with a 2xx status is
        tried again later (up to 8 attempts, waiting longer each time); the log shows the latest attempts.
      </p>
      {secret && (
        <div role="status" className="card border-amber-glow/60">
          <p className="font-semibold text-amber-glow">Copy this signing secret now: it will not be shown again.</p>
          <p className="figure mt-2 break-all rounded bg-night-950 p-3 text-sm" data-testid="new-webhook-secret">
            {secret}
          </p>
        </div>
      )}
      {actionData?.ok && actionData.message && <FormMessage tone="ok">{actionData.message}</FormMessage>}
      {errors && (errors as Record<string, string[]>).id && <FormMessage tone="error">{(errors as Record<string, string[]>).id[0]}</FormMessage>}
      <section className="card overflow-x-auto">
        <h2 className="mb-3">Endpoints</h2>
        <table>
          <thead>
            <tr>
              <th scope="col">URL</th>
              <th scope="col">Events</th>
              <th scope="col">Secret starts</th>
              <th scope="col">Status</th>
              <th scope="col">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {loaderData.webhooks.map((w) => (
              <tr key={w.id} className={w.active ? "" : "opacity-60"}>
                <td className="figure break-all">
                  {w.url}
                  {w.description && <span className="block text-night-400">{w.description}</span>}
                </td>
                <td className="figure">{w.events.join(", ")}</td>
                <td className="figure">{w.secretPrefix}</td>
                <td>{w.active ? "active" : "paused"}</td>
                <td className="flex gap-2">
                  <RowAction>
                    <input type="hidden" name="id" value={w.id} />
                    <button className="btn-quiet" name="intent" value={w.active ? "deactivate" : "activate"} type="submit">
                      {w.active ? "Pause" : "Resume"}
                    </button>
                  </RowAction>
                  <RowAction confirmText={`Remove ${w.url} and its delivery log?`}>
                    <input type="hidden" name="id" value={w.id} />
                    <button className="btn-quiet" name="intent" value="delete" type="submit">
                      Remove
                    </button>
                  </RowAction>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {loaderData.webhooks.length === 0 && <p className="py-3 text-night-400">No endpoints yet.</p>}
      </section>
      <section className="card max-w-xl">
        <h2 className="mb-3">Add an endpoint</h2>
        <Form method="post" className="flex flex-col gap-3" noValidate>
          <input type="hidden" name="intent" value="create" />
          <Field name="url" label="URL" errors={errors} hint="https:// (plain http only to this machine's loopback address on a local installation).">
            <input id="url" name="url" type="url" required maxLength={2000} />
          </Field>
          <Field name="description" label="Description (optional)" errors={errors}>
            <input id="description" name="description" maxLength={200} />
          </Field>
          <fieldset className="flex flex-col gap-1">
            <legend className="mb-1 text-sm">Events</legend>
            {WEBHOOK_EVENTS.map((e) => (
              <label key={e} className="flex items-start gap-2 text-sm">
                <input type="checkbox" name={`event:${e}`} defaultChecked={e === "study.completed"} />
                <span>
                  <span className="figure">{e}</span> — {WEBHOOK_EVENT_LABELS[e]}
                </span>
              </label>
            ))}
            {errors && (errors as Record<string, string[]>).events && <p className="text-sm text-red-300">{(errors as Record<string, string[]>).events[0]}</p>}
          </fieldset>
          <button className="btn self-start" type="submit" disabled={busy}>
            Add endpoint
          </button>
        </Form>
      </section>
      <section className="card overflow-x-auto">
        <h2 className="mb-3">Latest deliveries</h2>
        <table>
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">Event</th>
              <th scope="col">Endpoint</th>
              <th scope="col">State</th>
              <th scope="col">Attempts</th>
              <th scope="col">Last answer</th>
              <th scope="col">Next attempt</th>
              <th scope="col">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {loaderData.deliveries.map((d) => (
              <tr key={d.id}>
                <td className="figure">{d.id}</td>
                <td className="figure">{d.event}</td>
                <td className="figure break-all">{urlOf.get(d.webhookId) ?? "—"}</td>
                <td>{d.state}</td>
                <td className="figure">{d.attempts}</td>
                <td className="figure">{d.lastStatus ?? (d.lastError ? d.lastError.slice(0, 80) : "—")}</td>
                <td className="figure">{d.nextAttemptAt ? formatUtc(d.nextAttemptAt) : "—"}</td>
                <td>
                  {d.state === "failed" && (
                    <RowAction>
                      <input type="hidden" name="id" value={d.id} />
                      <button className="btn-quiet" name="intent" value="retry" type="submit">
                        Send again
                      </button>
                    </RowAction>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {loaderData.deliveries.length === 0 && <p className="py-3 text-night-400">No deliveries yet.</p>}
      </section>
    </div>
  );
}
