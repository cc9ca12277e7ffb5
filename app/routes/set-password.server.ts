// Shared by the invitation and password-reset routes: both set a password from a one-time link.
import { data, redirect } from "react-router";
import { z } from "zod";
import type { AccountTokenKind } from "../../db/models";
import { newPasswordSchema } from "../../shared/account-schemas";
import { AccountError, findTokenUser, setPasswordWithToken } from "~/services/accounts.server";
import { assertSameOrigin } from "~/utils/csrf.server";
import { readForm } from "~/utils/forms.server";

export async function loadTokenPage(kind: AccountTokenKind, token: string) {
  const found = await findTokenUser(kind, token);
  if (!found) {
    throw new Response(
      kind === "invite"
        ? "This invitation link has expired or was already used. Ask your administrator for a new one."
        : "This reset link has expired or was already used. Ask for a new one on the sign-in page.",
      { status: 410, statusText: "Link no longer valid" },
    );
  }
  return { email: found.user.email, name: found.user.name };
}

export async function submitTokenPage(kind: AccountTokenKind, token: string, request: Request) {
  assertSameOrigin(request);
  const parsed = newPasswordSchema.safeParse(await readForm(request));
  if (!parsed.success) {
    return data({ errors: z.flattenError(parsed.error).fieldErrors, formError: undefined }, { status: 400 });
  }
  try {
    await setPasswordWithToken(kind, token, parsed.data.password);
  } catch (error) {
    if (error instanceof AccountError) return data({ errors: {}, formError: error.message }, { status: 410 });
    throw error;
  }
  throw redirect("/login?reset=done");
}
