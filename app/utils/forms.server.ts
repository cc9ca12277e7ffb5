// Page actions: validate a submitted form with its shared zod schema and answer with
// field errors (status 400) that the form shows beside each field.
import { data } from "react-router";
import { ZodError, type ZodType } from "zod";
import { safeParseForm } from "../../shared/form-decode";
import { InputError, NotFoundError } from "../services/errors.server";
import { BodyTooLargeError, discardBody, readLimitedBytes } from "./body.server";
import { databaseInputError } from "./db-errors.server";

/** Forms here are a few fields of text: 1 MB is ample and bounds what an action reads. */
export const FORM_MAX_BYTES = 1024 * 1024;

const formRefusal = (status: number, message: string) => new Response(message, { status, statusText: status === 413 ? "Payload Too Large" : "Bad Request", headers: { "Content-Type": "text/plain; charset=utf-8" } });

/**
 * The one way page actions read their form: URL-encoded or multipart, at most `maxBytes`
 * (counted while it arrives), text fields only. Anything else is a 400 (413 when too large)
 * with a message, never a parser's exception.
 */
export async function readForm(request: Request, maxBytes = FORM_MAX_BYTES): Promise<Record<string, string>> {
  const contentType = request.headers.get("content-type") ?? "";
  const type = contentType.split(";")[0].trim().toLowerCase();
  if (type !== "application/x-www-form-urlencoded" && type !== "multipart/form-data") {
    discardBody(request);
    throw formRefusal(400, `This form is sent as application/x-www-form-urlencoded or multipart/form-data${type ? `, not ${type}` : ""}.`);
  }
  let bytes: Uint8Array;
  try {
    bytes = await readLimitedBytes(request, maxBytes);
  } catch (error) {
    if (error instanceof BodyTooLargeError) throw formRefusal(413, `The form is larger than the limit of ${maxBytes} bytes.`);
    throw error;
  }
  let entries: [string, FormDataEntryValue][];
  try {
    entries =
      type === "multipart/form-data"
        ? [...(await new Request("http://form.invalid/", { method: "POST", body: bytes as Uint8Array<ArrayBuffer>, headers: { "content-type": contentType } }).formData()).entries()]
        : [...new URLSearchParams(new TextDecoder().decode(bytes)).entries()];
  } catch {
    throw formRefusal(400, "The form body is malformed and could not be read.");
  }
  const out: Record<string, string> = {};
  for (const [key, value] of entries) {
    if (typeof value !== "string") throw formRefusal(400, `This form takes no files (field "${key.slice(0, 60)}").`);
    out[key] = value;
  }
  return out;
}

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

/**
 * The one way a page action turns its form into typed values: the text is decoded for the
 * schema (numbers, checkboxes, empty fields, flat names of nested objects: shared/form-decode.ts),
 * then validated by it; field errors come back under the form's flat names.
 */
export function parseForm<T>(schema: ZodType<T>, input: unknown): FormResult<T> {
  const parsed = safeParseForm(schema, input);
  if (parsed.success) return { ok: true, value: parsed.data };
  return { ok: false, response: formFailure(zodFieldErrors(parsed.error)) };
}

/**
 * Runs a service call; an InputError (or a database refusal of the input, such as a name
 * taken by a concurrent create) becomes a field error instead of an error page.
 */
export async function withInputErrors<T>(fn: () => Promise<T>): Promise<{ ok: true; value: T } | { ok: false; response: ReturnType<typeof formFailure> }> {
  try {
    return { ok: true, value: await fn() };
  } catch (caught) {
    const error = caught instanceof InputError ? caught : (databaseInputError(caught) ?? caught);
    // Under the service's path and the form's flat name of it (params.phase → paramsPhase), so the message sits beside its field.
    if (error instanceof InputError) return { ok: false, response: formFailure({ [error.path]: [error.message], [fieldName(error.path.split("."))]: [error.message] }, error.message) };
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
  const n = value && /^\d{1,15}$/.test(value) ? Number(value) : NaN;
  if (!Number.isSafeInteger(n) || n <= 0) throw new Response("Not found", { status: 404, statusText: "Not Found" });
  return n;
}
