import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/login";
import { authenticator, safeRedirect, SignInError } from "~/utils/auth.server";
import { readForm } from "~/utils/forms.server";
import { createUserSession, getSessionUser } from "~/utils/session.server";
import { assertSameOrigin } from "~/utils/csrf.server";
import { AuthPage } from "~/components/auth-page";
import { FormMessage } from "~/components/forms";

export async function loader({ request }: Route.LoaderArgs) {
  if (await getSessionUser(request)) throw redirect("/");
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  // Read (and bounded) once here; the strategy then reads its own copy of a form known to be sound.
  const redirectTo = safeRedirect((await readForm(request.clone())).redirectTo);
  try {
    const user = await authenticator.authenticate("form", request);
    return createUserSession(request, user.id, redirectTo);
  } catch (error) {
    if (error instanceof SignInError) return data({ error: error.message }, { status: error.status });
    throw error;
  }
}

export default function Login({ actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const busy = useNavigation().state === "submitting";
  return (
    <AuthPage title="Sign in">
      {params.get("reset") === "done" && <FormMessage tone="ok">Password set. Sign in with it now.</FormMessage>}
      {actionData?.error && <FormMessage tone="error">{actionData.error}</FormMessage>}
      <Form method="post" className="flex flex-col gap-3">
        <input type="hidden" name="redirectTo" value={params.get("redirectTo") ?? "/"} />
        <label htmlFor="email">E-mail</label>
        <input id="email" name="email" type="email" autoComplete="username" required autoFocus />
        <label htmlFor="password">Password</label>
        <input id="password" name="password" type="password" autoComplete="current-password" required />
        <button className="btn mt-2 justify-center" type="submit" disabled={busy}>
          {busy ? "Signing in…" : "Sign in"}
        </button>
      </Form>
      <Link to="/forgot-password" className="text-sm">
        Forgot your password?
      </Link>
    </AuthPage>
  );
}
