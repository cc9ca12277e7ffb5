import type { Route } from "./+types/invite.$token";
import { loadTokenPage, submitTokenPage } from "./set-password.server";
import { AuthPage } from "~/components/auth-page";
import { SetPasswordForm } from "~/components/set-password-form";

export const loader = ({ params }: Route.LoaderArgs) => loadTokenPage("invite", params.token);
export const action = ({ params, request }: Route.ActionArgs) => submitTokenPage("invite", params.token, request);

export default function AcceptInvitation({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <AuthPage title={`Welcome, ${loaderData.name}`}>
      <p className="text-sm text-night-200">Choose a password to finish setting up your account.</p>
      <SetPasswordForm email={loaderData.email} errors={actionData?.errors} formError={actionData?.formError} />
    </AuthPage>
  );
}
