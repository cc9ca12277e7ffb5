import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { createContext, redirect, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { Op } from "sequelize";
import { ApiKey, Organisation, SignInAttempt, User } from "../../db/models";
import { apiKeyHash, bearerToken, DEMO_KEY_PREFIX } from "./api-keys.server";
import { verifyPassword } from "../../lib/passwords";
import { assessSignIn, THROTTLE } from "../../lib/sign-in-throttle";
import { signInSchema } from "../../shared/account-schemas";
import type { Role } from "../../shared/roles";
import { parseStoredScopes, ROLE_SCOPES, type ApiScope } from "../../shared/api-scopes";
import { getEnv } from "./env.server";
import { assertApiCookieRequest, assertSameOrigin } from "./csrf.server";
import { db } from "./db.server";
import { clientAddress, problem, sameOriginPath } from "./http.server";
import { getSessionUser, type SessionUser } from "./session.server";

/** A sign-in refusal with the HTTP status the page should answer with. */
export class SignInError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 401 | 429,
  ) {
    super(message);
  }
}

export const authenticator = new Authenticator<User>();

authenticator.use(
  new FormStrategy(async ({ form, request }) => {
    const parsed = signInSchema.safeParse(Object.fromEntries(form));
    if (!parsed.success) throw new SignInError(parsed.error.issues[0]?.message ?? "Enter your e-mail and password.", 400);
    const { email, password } = parsed.data;
    const ip = clientAddress(request);
    db();
    const since = new Date(Date.now() - THROTTLE.windowMinutes * 60_000);
    const [accountFailures, addressFailures] = await Promise.all([
      SignInAttempt.count({ where: { email, success: false, createdAt: { [Op.gt]: since } } }),
      ip === null ? null : SignInAttempt.count({ where: { ip, success: false, createdAt: { [Op.gt]: since } } }),
    ]);
    const decision = assessSignIn(accountFailures, addressFailures);
    if (!decision.allowed) throw new SignInError(decision.message!, 429);
    if (decision.delayMs) await new Promise((r) => setTimeout(r, decision.delayMs));

    const user = await User.findOne({ where: { email } });
    // Always one bcrypt comparison (against a dummy hash for an unknown e-mail): equal timing.
    const matches = await verifyPassword(password, user?.passwordHash);
    const ok = !!user && user.active && matches;
    await SignInAttempt.create({ email, ip, success: ok });
    if (!ok) {
      // Said only to someone who knows the password, so it reveals nothing to a guesser.
      if (user && !user.active && matches) throw new SignInError("This account has been deactivated. Ask your administrator.", 401);
      throw new SignInError("E-mail or password is not right.", 401);
    }
    return user!;
  }),
  "form",
);

// Admins may do everything a role can; other roles only their own work.
export function hasRole(user: Pick<SessionUser, "role">, roles: Role[]): boolean {
  return user.role === "admin" || roles.includes(user.role);
}

/**
 * Who is calling, found once per request by the middleware of the app layout (pages) or of the
 * /api/v1 prefix (API), and read by the guards below from the router context.
 */
type Caller =
  | { user: SessionUser; via: "session" }
  | { user: SessionUser; via: "api-key"; key: ApiKeyGrant }
  | { user: null; via: "none" }
  | { user: null; via: "invalid-key"; reason: InvalidKeyReason };

/** What a valid key may do: its scopes (null: its role's, and the role's page rules apply). */
export interface ApiKeyGrant {
  id: number;
  scopes: ApiScope[] | null;
  rateLimitPerMinute: number | null;
}

type InvalidKeyReason = "malformed" | "unknown" | "expired" | "revoked" | "stopped";
const INVALID_KEY_DETAIL: Record<InvalidKeyReason, string> = {
  malformed: "The Authorization header does not hold a well-formed key (Bearer followed by 16 to 200 letters, digits, _ or -).",
  unknown: "No key matches this secret.",
  expired: "This API key has expired; ask an administrator for a new one.",
  revoked: "This API key has been revoked.",
  stopped: "The administrator who created this API key has been deactivated; another administrator can take it over.",
};
const KEY_SHAPE = /^[A-Za-z0-9_-]{16,200}$/;

const callerContext = createContext<Caller | undefined>(undefined);

/** A guard reads the caller from the context (routes under a middleware) or, for routes outside them, from the request. */
export type GuardSource = Request | Readonly<RouterContextProvider>;

function loginRedirect(request: Request): Response {
  const url = new URL(request.url);
  const back = url.pathname + url.search;
  return redirect(back === "/" ? "/login" : `/login?redirectTo=${encodeURIComponent(back)}`);
}

/**
 * Middleware of the app layout: every page below it has a signed-in user, or the visitor goes to
 * sign-in; a change (form action) sent from another site is refused with a 403 page.
 */
export const requireSignedInMiddleware: MiddlewareFunction<Response> = async ({ request, context }) => {
  assertSameOrigin(request, "page");
  const user = await getSessionUser(request);
  if (!user) throw loginRedirect(request);
  context.set(callerContext, { user, via: "session" });
};

/**
 * Middleware of the /api/v1 prefix: records the caller (Bearer key or session cookie); refuses
 * only a cookie-authenticated change from another site (the guards refuse the rest).
 */
export const identifyApiCallerMiddleware: MiddlewareFunction<Response> = async ({ request, context }) => {
  const caller = await identifyFromRequest(request);
  refuseCrossSiteCookieCall(request, caller);
  context.set(callerContext, caller);
};

/** Only the cookie rides along on a forged cross-site request; a Bearer key never does. */
function refuseCrossSiteCookieCall(request: Request, caller: Caller): void {
  if (caller.via === "session") assertApiCookieRequest(request);
}

function callerFrom(context: Readonly<RouterContextProvider>): Caller {
  const caller = context.get(callerContext);
  if (!caller) throw new Error("No caller in the router context: the route is not under an authenticating middleware.");
  return caller;
}

/**
 * Page guard: the signed-in user, or a redirect to the sign-in page. Called with the request (a
 * route outside the app layout), it also refuses a change sent from another site.
 */
export async function requireUser(source: GuardSource): Promise<SessionUser> {
  if (!(source instanceof Request)) {
    const { user } = callerFrom(source);
    if (!user) throw new Error("The app layout middleware let a signed-out visitor through.");
    return user;
  }
  assertSameOrigin(source, "page");
  const user = await getSessionUser(source);
  if (!user) throw loginRedirect(source);
  return user;
}

/** Page guard: signed in with one of the roles (admins pass), else a 403 page. */
export async function requireRole(source: GuardSource, ...roles: Role[]): Promise<SessionUser> {
  const user = await requireUser(source);
  if (!hasRole(user, roles)) {
    throw new Response("Your role does not give access to this page.", { status: 403, statusText: "Forbidden" });
  }
  return user;
}

/**
 * The caller of an API key, acting with the key's role inside its organisation, or why the key
 * is refused: malformed, unknown, expired, revoked, or stopped with its creator (deactivated or gone).
 */
async function apiKeyCaller(token: string): Promise<Caller> {
  const invalid = (reason: InvalidKeyReason): Caller => ({ user: null, via: "invalid-key", reason });
  if (!KEY_SHAPE.test(token)) return invalid("malformed");
  db();
  const key = await ApiKey.findOne({
    where: { keyHash: apiKeyHash(token) },
    include: [Organisation, { model: User, as: "creator", required: false }],
  });
  if (!key) return invalid("unknown");
  if (key.prefix === DEMO_KEY_PREFIX && !getEnv().DUSKLINE_LOCAL) return invalid("unknown");
  if (key.revokedAt) return invalid("revoked");
  if (key.expiresAt && key.expiresAt.getTime() <= Date.now()) return invalid("expired");
  const creator = (key as unknown as { creator?: User | null }).creator;
  if (!creator || !creator.active || key.createdBy === null) return invalid("stopped");
  // Coarse on purpose: one write a minute is enough to tell whether a key is in use.
  if (!key.lastUsedAt || Date.now() - key.lastUsedAt.getTime() > 60_000) await key.update({ lastUsedAt: new Date() });
  const user: SessionUser = {
    id: key.createdBy,
    organisationId: key.organisationId,
    organisationName: (key as unknown as { Organisation?: Organisation }).Organisation?.name ?? "",
    email: `api-key:${key.prefix}`,
    name: `API key "${key.name}"`,
    role: key.role,
    sessionId: `api-key:${key.id}`,
  };
  return { user, via: "api-key", key: { id: key.id, scopes: parseStoredScopes(key.scopes), rateLimitPerMinute: key.rateLimitPerMinute } };
}

function callerOf(source: GuardSource): Promise<Caller> | Caller {
  if (!(source instanceof Request)) return callerFrom(source);
  return identifyFromRequest(source).then((caller) => {
    refuseCrossSiteCookieCall(source, caller);
    return caller;
  });
}

function signedInCaller(caller: Caller): Exclude<Caller, { user: null }> {
  if (caller.via === "none") {
    throw problem(401, "Not signed in", "Send Authorization: Bearer <api key>, or sign in (session cookie).", {}, { "WWW-Authenticate": "Bearer" });
  }
  if (caller.via === "invalid-key") {
    const title = caller.reason === "malformed" ? "Malformed API key" : "Invalid API key";
    throw problem(401, title, INVALID_KEY_DETAIL[caller.reason], { reason: caller.reason }, { "WWW-Authenticate": 'Bearer error="invalid_token"' });
  }
  return caller;
}

/**
 * API guard: an `Authorization: Bearer <api key>` header or the session cookie; answers with
 * problem+json (401 without a valid credential, 403 when the role does not reach or a
 * cookie-authenticated change comes from another site).
 */
export async function requireApiUser(source: GuardSource, ...roles: Role[]): Promise<SessionUser> {
  const { user } = signedInCaller(await callerOf(source));
  if (roles.length && !hasRole(user, roles)) {
    throw problem(403, "Forbidden", `This endpoint needs one of the roles: ${roles.join(", ")}.`);
  }
  return user;
}

/** The scopes a caller holds: a scoped key's own, else those of the role it acts with. */
export function scopesOf(caller: { user: SessionUser; key?: ApiKeyGrant }): readonly ApiScope[] {
  return caller.key?.scopes ?? ROLE_SCOPES[caller.user.role];
}

/**
 * API guard by scope: 401 without a valid credential, 403 without the scope. A caller that acts
 * by role (a session, or a key made before scopes) must also have one of `roles` when given:
 * the same rule as the page, so the API never lets a role do more than its pages.
 */
export async function requireApiScope(source: GuardSource, scope: ApiScope, ...roles: Role[]): Promise<SessionUser> {
  const caller = signedInCaller(await callerOf(source));
  const key = caller.via === "api-key" ? caller.key : undefined;
  if (!scopesOf({ user: caller.user, key }).includes(scope)) {
    throw problem(403, "Missing scope", `This endpoint needs the scope ${scope}.`, { scope });
  }
  if (!key?.scopes && roles.length && !hasRole(caller.user, roles)) {
    throw problem(403, "Forbidden", `This endpoint needs one of the roles: ${roles.join(", ")}.`);
  }
  return caller.user;
}

/** Who a request's API limit is counted against, and that caller's limit per minute. */
export function rateLimitSubjectOf(context: Readonly<RouterContextProvider>, request: Request): { subject: string | null; limit: number } {
  const caller = callerFrom(context);
  const env = getEnv();
  if (caller.via === "api-key") return { subject: `key:${caller.key.id}`, limit: caller.key.rateLimitPerMinute ?? env.API_RATE_LIMIT_PER_MINUTE };
  if (caller.via === "session") return { subject: `user:${caller.user.id}`, limit: env.API_RATE_LIMIT_PER_MINUTE };
  const address = clientAddress(request);
  return { subject: address === null ? null : `address:${address}`, limit: env.API_ANON_RATE_LIMIT_PER_MINUTE };
}

async function identifyFromRequest(request: Request): Promise<Caller> {
  const token = bearerToken(request);
  if (token === null) {
    const user = await getSessionUser(request);
    return user ? { user, via: "session" } : { user: null, via: "none" };
  }
  return apiKeyCaller(token);
}

/** Where to go after sign-in: only a path on this site (see `sameOriginPath`), else the fallback. */
export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = "/"): string {
  return (typeof to === "string" && sameOriginPath(to)) || fallback;
}
