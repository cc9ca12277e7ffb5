import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/admin.users";
import { readForm } from "~/utils/forms.server";
import { requireRole } from "~/utils/auth.server";
import { AccountError, changeRole, inviteUser, listUsers, setActive } from "~/services/accounts.server";
import { changeRoleSchema, inviteSchema } from "../../shared/account-schemas";
import { idField } from "../../shared/fields";
import { RoleSelect } from "~/components/role-select";
import { Field, FormMessage } from "~/components/forms";
import { RowAction } from "~/components/row-action";

export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  const users = await listUsers(admin.organisationId);
  return {
    me: admin.id,
    users: users.map((u) => ({ id: u.id, email: u.email, name: u.name, role: u.role, active: u.active, invited: u.passwordHash === null })),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const admin = await requireRole(context, "admin");
  const form = await readForm(request);
  try {
    switch (form.intent) {
      case "invite": {
        const parsed = inviteSchema.safeParse(form);
        if (!parsed.success) return data({ intent: "invite", errors: z.flattenError(parsed.error).fieldErrors, message: null }, { status: 400 });
        await inviteUser(admin, parsed.data);
        return { intent: "invite", errors: {}, message: `Invitation sent to ${parsed.data.email}.` };
      }
      case "role": {
        const parsed = changeRoleSchema.safeParse(form);
        if (!parsed.success) return data({ intent: "role", errors: z.flattenError(parsed.error).fieldErrors, message: null }, { status: 400 });
        await changeRole(admin, parsed.data.userId, parsed.data.role);
        return { intent: "role", errors: {}, message: "Role changed." };
      }
      case "deactivate":
      case "reactivate": {
        const parsed = z.object({ userId: idField("Choose a person from the list.") }).safeParse(form);
        if (!parsed.success) return data({ intent: form.intent, errors: z.flattenError(parsed.error).fieldErrors, message: "Choose a person from the list." }, { status: 400 });
        await setActive(admin, parsed.data.userId, form.intent === "reactivate");
        return { intent: form.intent, errors: {}, message: form.intent === "deactivate" ? "Account deactivated; its sessions have ended." : "Account reactivated." };
      }
      default:
        return data({ intent: "unknown", errors: {}, message: "Unknown action." }, { status: 400 });
    }
  } catch (error) {
    if (error instanceof AccountError) {
      return data({ intent: String(form.intent), errors: error.field ? { [error.field]: [error.message] } : {}, message: error.message }, { status: 400 });
    }
    throw error;
  }
}

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const inviteErrors = actionData?.intent === "invite" ? actionData.errors : undefined;
  const failed = actionData && Object.keys(actionData.errors ?? {}).length > 0;
  return (
    <div className="flex flex-col gap-6">
      <title>People · Duskline</title>
      <h1>People</h1>
      {actionData?.message && <FormMessage tone={failed || !actionData.message.endsWith(".") ? "error" : "ok"}>{actionData.message}</FormMessage>}
      <section className="card overflow-x-auto">
        <table>
          <thead>
            <tr>
              <th scope="col">Name</th>
              <th scope="col">E-mail</th>
              <th scope="col">Role</th>
              <th scope="col">Status</th>
              <th scope="col">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {loaderData.users.map((u) => (
              <tr key={u.id}>
                <td>{u.name}</td>
                <td className="figure">{u.email}</td>
                <td>
                  <RowAction className="flex flex-wrap gap-2">
                    <input type="hidden" name="intent" value="role" />
                    <input type="hidden" name="userId" value={u.id} />
                    <label htmlFor={`role-${u.id}`} className="sr-only">
                      Role of {u.name}
                    </label>
                    <RoleSelect id={`role-${u.id}`} defaultValue={u.role} disabled={u.id === loaderData.me} />
                    {u.id !== loaderData.me && (
                      <button className="btn-quiet" type="submit">
                        Save
                      </button>
                    )}
                  </RowAction>
                </td>
                <td>{!u.active ? "Deactivated" : u.invited ? "Invited" : "Active"}</td>
                <td>
                  {u.id !== loaderData.me && (
                    <RowAction>
                      <input type="hidden" name="userId" value={u.id} />
                      <button className="btn-quiet" name="intent" value={u.active ? "deactivate" : "reactivate"} type="submit">
                        {u.active ? "Deactivate" : "Reactivate"}
                      </button>
                    </RowAction>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section className="card max-w-xl">
        <h2 className="mb-3">Invite someone</h2>
        <Form method="post" className="flex flex-col gap-3">
          <input type="hidden" name="intent" value="invite" />
          <Field name="name" label="Name" errors={inviteErrors}>
            <input id="name" name="name" required />
          </Field>
          <Field name="email" label="E-mail" errors={inviteErrors}>
            <input id="email" name="email" type="email" required />
          </Field>
          <Field name="role" label="Role" errors={inviteErrors}>
            <RoleSelect id="role" defaultValue="engineer" />
          </Field>
          <button className="btn self-start" type="submit" disabled={busy}>
            Send invitation
          </button>
          <p className="text-xs text-night-400">The invitation link lets them set a password and expires after 72 hours.</p>
        </Form>
      </section>
    </div>
  );
}
