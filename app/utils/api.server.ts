// Shared plumbing for the JSON resource routes under /api/v1: one place that turns the
// services' errors into RFC 9457 problem+json responses.
import { ZodError, type ZodType } from "zod";
import { IngestError } from "../../lib/ingest/ingest";
import { InputError, NotFoundError, ReviewMoveError } from "../services/errors.server";
import { problem, zodErrors } from "./http.server";
import { getEnv } from "./env.server";

/** Runs an API handler; known errors become problem+json, anything else a plain 500 without a stack. */
export async function apiResponse(handler: () => Promise<Response>): Promise<Response> {
  try {
    return await handler();
  } catch (error) {
    return errorToProblem(error);
  }
}

export function errorToProblem(error: unknown): Response {
  if (error instanceof Response) return error;
  if (error instanceof ZodError) return problem(400, "Invalid request", "Some fields are not valid; see errors.", { errors: zodErrors(error.issues) });
  if (error instanceof NotFoundError) return problem(404, "Not found", error.message);
  if (error instanceof ReviewMoveError) {
    const title = { 400: "Invalid request", 403: "Forbidden", 409: "Illegal review move", 422: "Not ready for this move" }[error.status];
    const errors = error.status === 400 || error.status === 422 ? { errors: [{ path: error.path, message: error.message }] } : {};
    return problem(error.status, title, error.message, { state: error.state, ...errors });
  }
  if (error instanceof InputError) return problem(error.status, "Conflict", error.message, { errors: [{ path: error.path, message: error.message }] });
  if (error instanceof IngestError) {
    return problem(error.status, error.title, error.detail, { examples: error.examples });
  }
  console.error(error);
  return problem(500, "Internal error", "The server could not complete the request. It has been logged.");
}

/** Reads and validates a JSON body, with a size limit stated in the error. */
export async function readJson<T>(request: Request, schema: ZodType<T>, maxBytes = getEnv().API_MAX_BODY_BYTES): Promise<T> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.includes("application/json")) throw problem(415, "Unsupported media type", "Send the body as application/json.");
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > maxBytes) throw problem(413, "Body too large", `The body is ${declared} bytes; the limit is ${maxBytes} bytes.`, { limitBytes: maxBytes });
  const text = await request.text();
  if (text.length > maxBytes) throw problem(413, "Body too large", `The limit is ${maxBytes} bytes.`, { limitBytes: maxBytes });
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch (e) {
    throw problem(400, "Malformed JSON", `The body is not valid JSON: ${(e as Error).message}`);
  }
  return schema.parse(body);
}

export function methodNotAllowed(allowed: string[]): Response {
  return problem(405, "Method not allowed", `Use ${allowed.join(" or ")}.`, {}, { Allow: allowed.join(", ") });
}

export function idParam(value: string | undefined, what: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n <= 0) throw new NotFoundError(`${what} ${value}`);
  return n;
}
