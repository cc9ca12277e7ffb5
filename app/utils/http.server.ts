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
 * The client's address for per-address limits, or null when it is not known. react-router-serve
 * does not hand the socket address to routes, so it comes from X-Forwarded-For, trusted only
 * when a proxy that sets it is in front (TRUST_PROXY=true). The last entry is the one that proxy
 * appended; earlier entries are whatever the client claimed. Null means "unknown": callers then
 * skip per-address limits rather than count every client as one address.
 */
export function clientAddress(request: Request): string | null {
  if (!getEnv().TRUST_PROXY) return null;
  const hops = request.headers.get("x-forwarded-for")?.split(",") ?? [];
  return hops.at(-1)?.trim().slice(0, 64) || null;
}

/**
 * `value` when it is a path on this site, else null. Browsers read `/\evil.example`,
 * `/%5Cevil.example` after decoding, `//evil.example` and tabs or newlines inside a URL as a
 * jump to another host, so anything with a backslash, a control character or a leading `//`
 * (also percent-encoded) is refused, and the rest must resolve to the same origin.
 */
export function sameOriginPath(value: string): string | null {
  if (!value.startsWith("/") || value.length > 2000) return null;
  // Decoded twice: a doubly encoded `%255C` is still a backslash to some reader along the way.
  const once = tryDecode(value);
  if (once === null) return null;
  const twice = tryDecode(once) ?? once;
  for (const text of [value, once, twice]) {
    // eslint-disable-next-line no-control-regex
    if (text.includes("\\") || /[\u0000-\u001f\u007f]/.test(text) || text.startsWith("//")) return null;
  }
  const base = "http://same-origin.invalid";
  let url: URL;
  try {
    url = new URL(value, base);
  } catch {
    return null;
  }
  if (url.origin !== base) return null;
  return url.pathname + url.search + url.hash;
}

function tryDecode(text: string): string | null {
  try {
    return decodeURIComponent(text);
  } catch {
    return null;
  }
}
