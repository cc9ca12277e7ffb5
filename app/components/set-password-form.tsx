import { Form } from "react-router";
import { MIN_PASSWORD_LENGTH } from "../../shared/account-schemas";
import { Field, FormMessage, type FieldErrors } from "./forms";

export function SetPasswordForm({ email, errors, formError }: { email: string; errors?: FieldErrors; formError?: string }) {
  return (
    <Form method="post" className="flex flex-col gap-3">
      <p className="text-sm text-night-200">
        Account: <span className="figure">{email}</span>
      </p>
      {formError && <FormMessage tone="error">{formError}</FormMessage>}
      <Field name="password" label="New password" errors={errors} hint={`At least ${MIN_PASSWORD_LENGTH} characters.`}>
        <input id="password" name="password" type="password" autoComplete="new-password" minLength={MIN_PASSWORD_LENGTH} required />
      </Field>
      <Field name="confirm" label="Repeat the password" errors={errors}>
        <input id="confirm" name="confirm" type="password" autoComplete="new-password" required />
      </Field>
      <button className="btn justify-center" type="submit">
        Set password
      </button>
    </Form>
  );
}
