import type { Route } from "./+types/reset.$token";
import { loadTokenPage, submitTokenPage } from "./set-password.server";
import { AuthPage } from "~/components/auth-page";
import { SetPasswordForm } from "~/components/set-password-form";

export const loader = ({ params }: Route.LoaderArgs) => loadTokenPage("reset", params.token);
export const action = ({ params, request }: Route.ActionArgs) => submitTokenPage("reset", params.token, request);

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <AuthPage title="Choose a new password">
      <SetPasswordForm email={loaderData.email} errors={actionData?.errors} formError={actionData?.formError} />
    </AuthPage>
  );
}
