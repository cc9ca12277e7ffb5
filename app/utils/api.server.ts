// Shared plumbing for the JSON resource routes under /api/v1: one place that turns the
// services' errors into RFC 9457 problem+json responses.
import { ZodError, type ZodType } from "zod";
import { IngestError } from "../../lib/ingest/ingest";
import { InputError, NotFoundError, ReviewMoveError } from "../services/errors.server";
import { formatBytes } from "../../shared/format";
import { isWellFormed } from "../../shared/fields";
import { BodyTooLargeError, discardBody, readLimitedBytes } from "./body.server";
import { databaseInputError } from "./db-errors.server";
import { problem, zodErrors } from "./http.server";
import { getEnv } from "./env.server";
import { databaseUnavailable, isDatabaseUnavailable } from "./db.server";
import { EngineStoppedError } from "./worker-pool.server";
import { mediaType } from "./csrf.server";
import { unknownFields } from "../../shared/api-schemas";
import { withIdempotentWork } from "../services/idempotency.server";
import { requireApiScope, type GuardSource } from "./auth.server";
import type { SessionUser } from "./session.server";

/**
 * Runs an API handler; known errors become problem+json, anything else a plain 500 without a stack.
 * JSON answers carry `Content-Disposition: attachment`, so a browser sent to an API URL saves the
 * body instead of rendering it.
 */
export async function apiResponse(handler: () => Promise<Response>): Promise<Response> {
  let response: Response;
  try {
    response = await handler();
  } catch (error) {
    response = errorToProblem(error);
  }
  if (/json/.test(response.headers.get("content-type") ?? "") && !response.headers.has("content-disposition")) {
    try {
      response.headers.set("Content-Disposition", 'attachment; filename="api.json"');
    } catch {
      // Immutable headers (a Response from elsewhere): leave them.
    }
  }
  return response;
}

export function errorToProblem(error: unknown): Response {
  if (error instanceof Response) return error;
  if (error instanceof ZodError) {
    const unknown = error.issues.flatMap((i) => (i.code === "unrecognized_keys" ? i.keys.map((k) => [...i.path.map(String), k].join(".")) : []));
    if (unknown.length) return unknownFieldsProblem(unknown);
  }
  if (error instanceof ZodError) return problem(400, "Invalid request", "Some fields are not valid; see errors.", { errors: zodErrors(error.issues) });
  if (error instanceof NotFoundError) return problem(404, "Not found", error.message);
  if (error instanceof ReviewMoveError) {
    const title = { 400: "Invalid request", 403: "Forbidden", 409: "Illegal review move", 422: "Not ready for this move" }[error.status];
    const errors = error.status === 400 || error.status === 422 ? { errors: [{ path: error.path, message: error.message }] } : {};
    return problem(error.status, title, error.message, { state: error.state, ...errors });
  }
  if (error instanceof BodyTooLargeError) return tooLarge(error);
  const input = error instanceof InputError ? error : databaseInputError(error);
  if (input) return problem(input.status, input.status === 409 ? "Conflict" : "Invalid value", input.message, { errors: [{ path: input.path, message: input.message }] });
  if (error instanceof IngestError) {
    const path = error.path ?? error.option ?? "body";
    return problem(error.status, error.title, error.detail, { examples: error.examples, errors: [{ path, message: error.detail }] });
  }
  if (isDatabaseUnavailable(error)) return databaseUnavailable();
  if (error instanceof EngineStoppedError) {
    console.error(error);
    return problem(503, "Service unavailable", "The computation stopped before it finished (its engine process was restarted). Nothing was saved by this request; try again.", { retryable: true }, { "Retry-After": "5" });
  }
  console.error(error);
  return problem(500, "Internal error", "The server could not complete the request. It has been logged.");
}

function tooLarge(error: BodyTooLargeError): Response {
  const size = error.declaredBytes !== undefined ? `The body is ${formatBytes(error.declaredBytes)}; the` : "The";
  return problem(413, "Body too large", `${size} limit is ${formatBytes(error.limitBytes)} (${error.limitBytes} bytes).`, {
    limitBytes: error.limitBytes,
    errors: [{ path: "body", message: `At most ${error.limitBytes} bytes.` }],
  });
}

/**
 * Reads and validates a JSON body. The size limit holds while the body streams in (chunked
 * too); the text must be UTF-8 and JSON; no string may hold a lone surrogate (422 naming it).
 */
export async function readJson<T>(request: Request, schema: ZodType<T>, maxBytes = getEnv().API_MAX_BODY_BYTES): Promise<T> {
  const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
  if (type !== "application/json" && !type.endsWith("+json")) {
    discardBody(request);
    throw problem(415, "Unsupported media type", `Send the body as application/json${type ? `, not ${type}` : ""}.`, { errors: [{ path: "content-type", message: "Use application/json." }] });
  }
  const bytes = await readLimitedBytes(request, maxBytes);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw problem(400, "Not UTF-8", "The body is not UTF-8 text.", { errors: [{ path: "body", message: "Send UTF-8 encoded JSON." }] });
  }
  if (text.trim() === "") throw problem(400, "Empty body", "The body is empty; send a JSON object.", { errors: [{ path: "body", message: "Send a JSON object." }] });
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch (e) {
    throw problem(400, "Malformed JSON", `The body is not valid JSON: ${(e as Error).message}`, { errors: [{ path: "body", message: "Not valid JSON." }] });
  }
  const bad = illFormedString(body);
  if (bad !== null) {
    const message = "Contains a character that is not valid Unicode text (a lone surrogate).";
    throw problem(422, "Invalid text", `${bad}: ${message}`, { errors: [{ path: bad, message }] });
  }
  const unknown = unknownFields(schema, body);
  if (unknown.length) throw unknownFieldsProblem(unknown);
  return schema.parse(body);
}

function unknownFieldsProblem(paths: string[]): Response {
  const message = "Not a field of this request.";
  return problem(422, "Unknown fields", `Not part of this request: ${paths.join(", ")}. See /api/v1/openapi.json for the fields.`, { errors: paths.map((path) => ({ path, message })) });
}

/** Path of the first string (or key) that is not well-formed Unicode, or null. */
function illFormedString(value: unknown, path: string[] = []): string | null {
  if (typeof value === "string") return isWellFormed(value) ? null : path.join(".") || "(body)";
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const v = value[i];
      if (typeof v === "number" || v === null) continue; // samples: millions of numbers
      const found = illFormedString(v, [...path, String(i)]);
      if (found !== null) return found;
    }
    return null;
  }
  if (value && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      if (!isWellFormed(k)) return [...path, "(key)"].join(".");
      const found = illFormedString(v, [...path, k]);
      if (found !== null) return found;
    }
  }
  return null;
}

export function methodNotAllowed(allowed: string[]): Response {
  return problem(405, "Method not allowed", `Use ${allowed.join(" or ")}.`, {}, { Allow: allowed.join(", ") });
}

export function idParam(value: string | undefined, what: string): number {
  if (!value || !/^\d{1,15}$/.test(value)) throw new NotFoundError(`${what} ${String(value).slice(0, 40)}`);
  const n = Number(value);
  if (!Number.isSafeInteger(n) || n <= 0) throw new NotFoundError(`${what} ${value}`);
  return n;
}

/** 201 with the new record and its address. */
export function created(body: unknown, location: string): Response {
  return Response.json(body, { status: 201, headers: { Location: location } });
}

/**
 * The action of a stateless computation (POST /api/v1/feasibility, /optimise): POST only, the
 * feasibility:run scope, the JSON body read against `schema` (API_MAX_BODY_BYTES), an
 * Idempotency-Key honoured; `work` answers with the body checked.
 */
export function statelessComputeAction<T>(schema: ZodType<T>, work: (user: SessionUser, body: T) => Promise<Response>) {
  return ({ request, context }: { request: Request; context: GuardSource }) =>
    apiResponse(async () => {
      if (request.method !== "POST") return methodNotAllowed(["POST"]);
      const user = await requireApiScope(context, "feasibility:run");
      return withIdempotentWork(request, user.organisationId, (request) => readJson(request, schema), (body) => work(user, body));
    });
}
