import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/admin.api-keys";
import { requireRole } from "~/utils/auth.server";
import { formFailure, orNotFound, parseForm, readForm } from "~/utils/forms.server";
import { idField } from "../../shared/fields";
import { createApiKey, listApiKeys, revokeApiKey, takeOverApiKey } from "~/services/api-keys.server";
import { apiKeyFormToInput, apiKeySchema, API_KEY_ROLES } from "../../shared/account-schemas";
import { API_SCOPES, API_SCOPE_LABELS, ROLE_SCOPES } from "../../shared/api-scopes";
import { CopyButton } from "~/components/copy-button";
import { ROLE_LABELS } from "../../shared/roles";
import { Field, FormMessage } from "~/components/forms";
import { RowAction } from "~/components/row-action";
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
  const form = parseForm(apiKeySchema, apiKeyFormToInput(fields));
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
        key may do only what its scopes allow, acts with one role in reviews, and may expire. The key is shown once; only its hash is
        kept. Revoking stops it at once. A key stops working when the admin who created it is deactivated; another admin can take it
        over. The reference is at <a href="/docs/api">/docs/api</a>.
      </p>
      {newKey && (
        <div role="status" className="card border-amber-glow/60">
          <p className="font-semibold text-amber-glow">Copy this key now: it will not be shown again.</p>
          <p className="figure mt-2 break-all rounded bg-night-950 p-3 text-sm" data-testid="new-api-key">
            {newKey}
          </p>
          <div className="mt-2">
            <CopyButton text={newKey} label="Copy key" />
          </div>
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
              <th scope="col">Scopes</th>
              <th scope="col">Expires</th>
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
                <td className="text-xs">
                  {k.scoped ? k.scopes.join(", ") : `as the role (${k.scopes.length} scopes)`}
                </td>
                <td className="figure">{k.expiresAt ? formatUtc(k.expiresAt) : "never"}</td>
                <td className="figure">{formatUtc(k.createdAt)}</td>
                <td>{k.creatorName ?? "(removed)"}</td>
                <td className="figure">{k.lastUsedAt ? formatUtc(k.lastUsedAt) : "never"}</td>
                <td>{k.revokedAt ? `revoked ${k.revokedAt.slice(0, 10)}` : k.expired ? "expired" : k.creatorStopped ? "stopped: creator deactivated" : "active"}</td>
                <td className="flex gap-2">
                  {!k.revokedAt && k.creatorStopped && (
                    <RowAction>
                      <input type="hidden" name="keyId" value={k.id} />
                      <button className="btn-quiet" name="intent" value="take-over" type="submit">
                        Take over
                      </button>
                    </RowAction>
                  )}
                  {!k.revokedAt && (
                    <RowAction confirmText={`Revoke "${k.name}"? Systems using it will be refused.`}>
                      <input type="hidden" name="keyId" value={k.id} />
                      <button className="btn-quiet" name="intent" value="revoke" type="submit">
                        Revoke
                      </button>
                    </RowAction>
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
          <Field name="role" label="Acts as (in reviews and the audit log)" errors={actionData?.errors} hint="Review moves follow this role: engineers and consultants submit, managers approve or return.">
            <RoleSelect id="role" defaultValue="manager" roles={API_KEY_ROLES} />
          </Field>
          <fieldset className="flex flex-col gap-1" aria-describedby="scopes-hint">
            <legend className="font-semibold">Scopes</legend>
            <p id="scopes-hint" className="text-xs text-night-300">
              What the key may do. A manager's reads are {ROLE_SCOPES.manager.join(", ")}.
            </p>
            {API_SCOPES.map((scope) => (
              <label key={scope} className="flex items-baseline gap-2 text-sm">
                <input type="checkbox" name={`scope:${scope}`} defaultChecked={ROLE_SCOPES.manager.includes(scope)} />
                <span className="figure">{scope}</span>
                <span className="text-night-300">{API_SCOPE_LABELS[scope]}</span>
              </label>
            ))}
            {actionData && !actionData.ok && actionData.errors.scopes && <FormMessage tone="error">{actionData.errors.scopes[0]}</FormMessage>}
          </fieldset>
          <Field name="expiresOn" label="Last day (optional, UTC)" errors={actionData?.errors} hint="Leave empty for a key that does not expire.">
            <input id="expiresOn" name="expiresOn" type="date" />
          </Field>
          <button className="btn self-start" type="submit" disabled={busy}>
            Create key
          </button>
        </Form>
      </section>
    </div>
  );
}
