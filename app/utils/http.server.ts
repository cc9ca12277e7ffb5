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
 * The client's address for per-address limits, or null when it is not known. server.ts writes
 * it into a header of its own (from the socket, or from X-Forwarded-For when TRUST_PROXY=true)
 * and overwrites whatever a client sent under that name. Without that server (the Vite dev
 * server) it is unknown, and callers then skip per-address limits rather than count every
 * client as one address (which would let anyone lock everyone out).
 */
export function clientAddress(request: Request): string | null {
  const address = request.headers.get("x-duskline-client-address")?.trim();
  return address && address !== "unknown" ? address.slice(0, 64) : null;
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
