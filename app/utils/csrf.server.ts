// Cross-site request refusal for cookie-authenticated changes (the session cookie is SameSite=Lax,
// which still lets a same-site sibling post, and older browsers ignore it). One home: the page
// guards, the API guard, the sign-in pages and, later, the request middleware all call this.
import { appUrl } from "./env.server";
import { problem } from "./http.server";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Content types a page on another site may send without a CORS preflight. A JSON API call
 * authenticated by the cookie never legitimately uses them.
 */
const CROSS_SITE_SENDABLE = new Set(["text/plain", "application/x-www-form-urlencoded", "multipart/form-data"]);

/** The media type of the body without parameters, lower-cased ("" when absent). */
export function mediaType(request: Request): string {
  return (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
}

function originOf(url: string): string | null {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
}

/** Origins this app is reached at: APP_URL, and the origin the request itself was addressed to. */
function ownOrigins(request: Request): string[] {
  return [originOf(appUrl()), originOf(request.url)].filter((o): o is string => o !== null);
}

/**
 * Why a state-changing request looks cross-site, or null when it does not. Browsers send
 * `Sec-Fetch-Site` and `Origin` on every POST; both must agree with this site when present. A
 * request with neither comes from a program (curl, an integration), not a page on another site
 * riding on a visitor's cookie, so it passes (the `Referer` is checked when that is all there is).
 */
export function crossSiteReason(request: Request): string | null {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return null;
  const site = request.headers.get("sec-fetch-site");
  if (site !== null && site !== "same-origin" && site !== "none") return `Sec-Fetch-Site: ${site}`;
  const origin = request.headers.get("origin");
  if (origin !== null) return ownOrigins(request).includes(origin) ? null : `Origin: ${origin}`;
  if (site !== null) return null;
  const referer = request.headers.get("referer");
  if (referer) {
    const from = originOf(referer);
    return from && ownOrigins(request).includes(from) ? null : `Referer from ${from ?? "an unreadable address"}`;
  }
  return null;
}

/**
 * Throws a 403 when a cookie-authenticated change comes from another site: problem+json for the
 * API, a plain 403 (rendered by the error boundary) for pages. Bearer-key calls never reach here.
 */
export function assertSameOrigin(request: Request, kind: "page" | "api" = "page"): void {
  const reason = crossSiteReason(request);
  if (reason === null) return;
  const detail = `This change was sent from another site (${reason}); it is refused. Use the page on this site, or an API key.`;
  if (kind === "api") throw problem(403, "Cross-site request refused", detail);
  throw new Response(detail, { status: 403, statusText: "Forbidden" });
}

/**
 * For cookie-authenticated API changes: the same-origin check, and no body type that a page on
 * another site could send without asking first (so `text/plain` "JSON" is refused as 415).
 */
export function assertApiCookieRequest(request: Request): void {
  assertSameOrigin(request, "api");
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  const type = mediaType(request);
  if (CROSS_SITE_SENDABLE.has(type)) {
    throw problem(415, "Unsupported media type", `A signed-in browser call may not send ${type}; send application/json (or the file's own type for uploads).`);
  }
}
