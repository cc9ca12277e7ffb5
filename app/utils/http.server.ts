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

/**
 * The client's address for per-address limits. server.ts writes it into a header of its own
 * (from the socket, or from X-Forwarded-For when TRUST_PROXY=true) and overwrites whatever a
 * client sent under that name. Without that server (the Vite dev server) it is unknown.
 */
export function clientAddress(request: Request): string {
  return request.headers.get("x-duskline-client-address") || "unknown";
}
