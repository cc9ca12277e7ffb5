// RFC 9457 problem details for the JSON API.
export interface ProblemFieldError {
  path: string;
  message: string;
}

export function problem(
  status: number,
  title: string,
  detail?: string,
  extra: { errors?: ProblemFieldError[]; [key: string]: unknown } = {},
  headers: HeadersInit = {},
): Response {
  return new Response(JSON.stringify({ type: "about:blank", status, title, detail, ...extra }), {
    status,
    headers: { "Content-Type": "application/problem+json", ...headers },
  });
}

/** zod issues → `errors: [{path, message}]`. */
export function zodErrors(issues: readonly { path: readonly PropertyKey[]; message: string }[]): ProblemFieldError[] {
  return issues.map((i) => ({ path: i.path.map(String).join(".") || "(body)", message: i.message }));
}

import { getEnv } from "./env.server";

/**
 * The client's address for per-address sign-in limits. react-router-serve does not hand the
 * socket address to routes, so it comes from X-Forwarded-For, trusted only when a proxy that
 * sets it is in front (TRUST_PROXY=true); otherwise every request counts as one address.
 */
export function clientAddress(request: Request): string {
  if (!getEnv().TRUST_PROXY) return "direct";
  return request.headers.get("x-forwarded-for")?.split(",")[0]?.trim() || "direct";
}
