import type { ReactNode } from "react";
import { Form, useNavigation } from "react-router";

export type FieldErrors = Record<string, string[] | undefined>;

/** A labelled field with its error message beside it (ids tie label, input and message). */
export function Field({
  name,
  label,
  errors,
  hint,
  children,
}: {
  name: string;
  label: string;
  errors?: FieldErrors;
  hint?: ReactNode;
  children: ReactNode;
}) {
  const messages = errors?.[name];
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={name}>{label}</label>
      {children}
      {hint && <span className="text-xs text-night-400">{hint}</span>}
      {messages?.map((m) => (
        <span key={m} id={`${name}-error`} className="field-error" role="alert">
          {m}
        </span>
      ))}
    </div>
  );
}

export function FormMessage({ tone, children }: { tone: "error" | "ok"; children: ReactNode }) {
  const cls = tone === "error" ? "border-verdict-nogo/60 text-verdict-nogo" : "border-verdict-go/60 text-verdict-go";
  return (
    <p role={tone === "error" ? "alert" : "status"} className={`rounded-md border px-3 py-2 text-sm ${cls}`}>
      {children}
    </p>
  );
}

/** A record's form in a card: the form-level message on top, the submit button below the fields. */
export function RecordForm({ message, submitLabel, children }: { message?: string; submitLabel: string; children: ReactNode }) {
  const busy = useNavigation().state === "submitting";
  return (
    <Form method="post" className="card flex max-w-xl flex-col gap-3" noValidate>
      {message && <FormMessage tone="error">{message}</FormMessage>}
      {children}
      <button type="submit" className="btn self-start" disabled={busy}>
        {busy ? "Saving…" : submitLabel}
      </button>
    </Form>
  );
}
