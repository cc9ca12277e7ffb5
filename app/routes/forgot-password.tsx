import { data, Form, Link } from "react-router";
import type { Route } from "./+types/forgot-password";
import { readForm } from "~/utils/forms.server";
import { forgotPasswordSchema } from "../../shared/account-schemas";
import { requestPasswordReset } from "~/services/accounts.server";
import { appUrl } from "~/utils/env.server";
import { AuthPage } from "~/components/auth-page";
import { FormMessage } from "~/components/forms";

export async function action({ request }: Route.ActionArgs) {
  const parsed = forgotPasswordSchema.safeParse(await readForm(request));
  if (!parsed.success) return data({ sent: false, error: parsed.error.issues[0].message }, { status: 400 });
  await requestPasswordReset(parsed.data.email, appUrl(request));
  return { sent: true, error: null };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  return (
    <AuthPage title="Reset your password">
      {actionData?.sent ? (
        <FormMessage tone="ok">If that address has an account, a reset link is on its way. It expires in 2 hours.</FormMessage>
      ) : (
        <Form method="post" className="flex flex-col gap-3">
          {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
          <label htmlFor="email">E-mail</label>
          <input id="email" name="email" type="email" required autoFocus />
          <button className="btn justify-center" type="submit">
            Send reset link
          </button>
        </Form>
      )}
      <Link to="/login" className="text-sm">
        Back to sign-in
      </Link>
    </AuthPage>
  );
}
