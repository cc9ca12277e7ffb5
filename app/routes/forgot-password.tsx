import { data, Form, Link } from "react-router";
import type { Route } from "./+types/forgot-password";
import { readForm } from "~/utils/forms.server";
import { forgotPasswordSchema } from "../../shared/account-schemas";
import { requestPasswordResetLimited } from "~/services/accounts.server";
import { assertSameOrigin } from "~/utils/csrf.server";
import { clientAddress } from "~/utils/http.server";
import { AuthPage } from "~/components/auth-page";
import { FormMessage } from "~/components/forms";

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const parsed = forgotPasswordSchema.safeParse(await readForm(request));
  if (!parsed.success) return data({ sent: false, error: parsed.error.issues[0].message }, { status: 400 });
  const outcome = await requestPasswordResetLimited(parsed.data.email, clientAddress(request));
  if (!outcome.allowed) {
    const minutes = Math.ceil(outcome.retryAfterSeconds / 60);
    return data(
      { sent: false, error: `Too many reset requests. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}.` },
      { status: 429, headers: { "Retry-After": String(outcome.retryAfterSeconds) } },
    );
  }
  return { sent: true, error: null };
}

// The action's Retry-After reaches the document response only through this export.
export function headers({ actionHeaders }: Route.HeadersArgs) {
  return actionHeaders;
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
