import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/admin.api-keys";
import { requireRole } from "~/utils/auth.server";
import { formFailure, orNotFound, parseForm, readForm } from "~/utils/forms.server";
import { idField } from "../../shared/fields";
import { createApiKey, listApiKeys, revokeApiKey, takeOverApiKey } from "~/services/api-keys.server";
import { apiKeySchema, API_KEY_ROLES } from "../../shared/account-schemas";
import { ROLE_LABELS } from "../../shared/roles";
import { Field, FormMessage } from "~/components/forms";
import { RoleSelect } from "~/components/role-select";
import { formatUtc } from "../../shared/format";

export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  return { keys: await listApiKeys(admin.organisationId) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const admin = await requireRole(context, "admin");
  const fields = await readForm(request);
  if (fields.intent === "revoke") {
    const keyId = idField("Choose a key from the list.").safeParse(fields.keyId);
    if (!keyId.success) return formFailure({ keyId: ["Choose a key from the list."] }, "Choose a key from the list.");
    await orNotFound(revokeApiKey(admin, keyId.data));
    return { ok: true as const, errors: {}, message: "Key revoked: calls with it are refused from now on.", key: null };
  }
  if (fields.intent === "take-over") {
    const keyId = idField("Choose a key from the list.").safeParse(fields.keyId);
    if (!keyId.success) return formFailure({ keyId: ["Choose a key from the list."] }, "Choose a key from the list.");
    await orNotFound(takeOverApiKey(admin, keyId.data));
    return { ok: true as const, errors: {}, message: "You now answer for this key: it works again.", key: null };
  }
  const form = parseForm(apiKeySchema, fields);
  if (!form.ok) return form.response;
  const created = await createApiKey(admin, form.value);
  return { ok: true as const, errors: {}, message: null, key: created.key };
}

export default function AdminApiKeys({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const newKey = actionData?.ok ? actionData.key : null;
  return (
    <div className="flex flex-col gap-6">
      <title>API keys · Duskline</title>
      <h1>API keys</h1>
      <p className="max-w-2xl text-sm text-night-200">
        Keys let the utility's own systems call <span className="figure">/api/v1</span> with <span className="figure">Authorization: Bearer &lt;key&gt;</span>. Each
        key acts with one role inside this organisation. The key is shown once; only its hash is kept. A key stops working when the
        admin who created it is deactivated; another admin can take it over.
      </p>
      {newKey && (
        <div role="status" className="card border-amber-glow/60">
          <p className="font-semibold text-amber-glow">Copy this key now: it will not be shown again.</p>
          <p className="figure mt-2 break-all rounded bg-night-950 p-3 text-sm" data-testid="new-api-key">
            {newKey}
          </p>
        </div>
      )}
      {actionData?.ok && actionData.message && <FormMessage tone="ok">{actionData.message}</FormMessage>}
      {actionData && !actionData.ok && actionData.errors.keyId && <FormMessage tone="error">{actionData.errors.keyId[0]}</FormMessage>}
      <section className="card overflow-x-auto">
        <table>
          <thead>
            <tr>
              <th scope="col">Name</th>
              <th scope="col">Key starts</th>
              <th scope="col">Role</th>
              <th scope="col">Created</th>
              <th scope="col">Created by</th>
              <th scope="col">Last used</th>
              <th scope="col">Status</th>
              <th scope="col">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {loaderData.keys.map((k) => (
              <tr key={k.id} className={k.revokedAt ? "opacity-60" : ""}>
                <td>{k.name}</td>
                <td className="figure">{k.prefix}…</td>
                <td>{ROLE_LABELS[k.role]}</td>
                <td className="figure">{formatUtc(k.createdAt)}</td>
                <td>{k.creatorName ?? "(removed)"}</td>
                <td className="figure">{k.lastUsedAt ? formatUtc(k.lastUsedAt) : "never"}</td>
                <td>{k.revokedAt ? `revoked ${k.revokedAt.slice(0, 10)}` : k.creatorStopped ? "stopped: creator deactivated" : "active"}</td>
                <td className="flex gap-2">
                  {!k.revokedAt && k.creatorStopped && (
                    <Form method="post">
                      <input type="hidden" name="keyId" value={k.id} />
                      <button className="btn-quiet" name="intent" value="take-over" type="submit" disabled={busy}>
                        Take over
                      </button>
                    </Form>
                  )}
                  {!k.revokedAt && (
                    <Form method="post" onSubmit={(e) => !confirm(`Revoke "${k.name}"? Systems using it will be refused.`) && e.preventDefault()}>
                      <input type="hidden" name="keyId" value={k.id} />
                      <button className="btn-quiet" name="intent" value="revoke" type="submit" disabled={busy}>
                        Revoke
                      </button>
                    </Form>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {loaderData.keys.length === 0 && <p className="py-3 text-night-400">No keys yet.</p>}
      </section>
      <section className="card max-w-xl">
        <h2 className="mb-3">Create a key</h2>
        <Form method="post" className="flex flex-col gap-3" noValidate>
          <input type="hidden" name="intent" value="create" />
          <Field name="name" label="Name (the system that will use it)" errors={actionData?.errors}>
            <input id="name" name="name" required maxLength={200} />
          </Field>
          <Field name="role" label="Acts as" errors={actionData?.errors} hint="Engineer keys may create circuits, upload profiles and run studies; manager keys read and compute only.">
            <RoleSelect id="role" defaultValue="manager" roles={API_KEY_ROLES} />
          </Field>
          <button className="btn self-start" type="submit" disabled={busy}>
            Create key
          </button>
        </Form>
      </section>
    </div>
  );
}
