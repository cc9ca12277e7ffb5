// Page actions: validate a submitted form with its shared zod schema and answer with
// field errors (status 400) that the form shows beside each field.
import { data } from "react-router";
import { ZodError, type ZodType } from "zod";
import { InputError, NotFoundError } from "../services/errors.server";

export type FieldErrors = Record<string, string[]>;

/** Nested schema paths map onto flat form names: spanLength.value → spanLengthValue. */
export function fieldName(path: readonly PropertyKey[]): string {
  return path.map((p, i) => (i === 0 ? String(p) : String(p).charAt(0).toUpperCase() + String(p).slice(1))).join("") || "form";
}

export function zodFieldErrors(error: ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) (out[fieldName(issue.path)] ??= []).push(issue.message);
  return out;
}

export type FormResult<T> = { ok: true; value: T } | { ok: false; response: ReturnType<typeof formFailure> };

export function formFailure(errors: FieldErrors, message = "Some fields need attention.") {
  return data({ ok: false as const, errors, message }, { status: 400 });
}

export function parseForm<T>(schema: ZodType<T>, input: unknown): FormResult<T> {
  const parsed = schema.safeParse(input);
  if (parsed.success) return { ok: true, value: parsed.data };
  return { ok: false, response: formFailure(zodFieldErrors(parsed.error)) };
}

/** Runs a service call; an InputError becomes a field error instead of an error page. */
export async function withInputErrors<T>(fn: () => Promise<T>): Promise<{ ok: true; value: T } | { ok: false; response: ReturnType<typeof formFailure> }> {
  try {
    return { ok: true, value: await fn() };
  } catch (error) {
    if (error instanceof InputError) return { ok: false, response: formFailure({ [error.path]: [error.message] }, error.message) };
    if (error instanceof ZodError) return { ok: false, response: formFailure(zodFieldErrors(error)) };
    throw error;
  }
}

/** A NotFoundError from a service (or a malformed id) becomes the 404 page. */
export async function orNotFound<T>(promise: Promise<T>): Promise<T> {
  try {
    return await promise;
  } catch (error) {
    if (error instanceof NotFoundError) throw new Response(error.message, { status: 404, statusText: "Not Found" });
    throw error;
  }
}

export function pageId(value: string | undefined): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n <= 0) throw new Response("Not found", { status: 404, statusText: "Not Found" });
  return n;
}
