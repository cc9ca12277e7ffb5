import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { createContext, redirect, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { Op } from "sequelize";
import { ApiKey, Organisation, SignInAttempt, User } from "../../db/models";
import { apiKeyHash, bearerToken } from "./api-keys.server";
import { verifyPassword } from "../../lib/passwords";
import { assessSignIn, THROTTLE } from "../../lib/sign-in-throttle";
import { signInSchema } from "../../shared/account-schemas";
import type { Role } from "../../shared/roles";
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
type Caller = { user: SessionUser; via: "session" | "api-key" } | { user: null; via: "none" | "invalid-key" };
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
 * The caller of an API key, acting with the key's role inside its organisation; null when unknown,
 * revoked, or when the admin who created it is deactivated or gone (a key stops with its creator).
 */
async function apiKeyUser(token: string): Promise<SessionUser | null> {
  db();
  const key = await ApiKey.findOne({
    where: { keyHash: apiKeyHash(token), revokedAt: null },
    include: [Organisation, { model: User, as: "creator", where: { active: true }, required: true }],
  });
  if (!key || key.createdBy === null) return null;
  // Coarse on purpose: one write a minute is enough to tell whether a key is in use.
  if (!key.lastUsedAt || Date.now() - key.lastUsedAt.getTime() > 60_000) await key.update({ lastUsedAt: new Date() });
  return {
    id: key.createdBy,
    organisationId: key.organisationId,
    organisationName: (key as unknown as { Organisation?: Organisation }).Organisation?.name ?? "",
    email: `api-key:${key.prefix}`,
    name: `API key "${key.name}"`,
    role: key.role,
    sessionId: `api-key:${key.id}`,
  };
}

/**
 * API guard: an `Authorization: Bearer <api key>` header or the session cookie; answers with
 * problem+json (401 without a valid credential, 403 when the role does not reach or a
 * cookie-authenticated change comes from another site).
 */
export async function requireApiUser(source: GuardSource, ...roles: Role[]): Promise<SessionUser> {
  const caller = source instanceof Request ? await identifyFromRequest(source) : callerFrom(source);
  if (source instanceof Request) refuseCrossSiteCookieCall(source, caller);
  if (!caller.user) {
    throw caller.via === "none"
      ? problem(401, "Not signed in", "Send Authorization: Bearer <api key>, or sign in (session cookie).", {}, { "WWW-Authenticate": "Bearer" })
      : problem(401, "Invalid API key", "The API key is unknown, revoked, or its creator has been deactivated.", {}, { "WWW-Authenticate": 'Bearer error="invalid_token"' });
  }
  if (roles.length && !hasRole(caller.user, roles)) {
    throw problem(403, "Forbidden", `This endpoint needs one of the roles: ${roles.join(", ")}.`);
  }
  return caller.user;
}

async function identifyFromRequest(request: Request): Promise<Caller> {
  const token = bearerToken(request);
  if (token === null) {
    const user = await getSessionUser(request);
    return user ? { user, via: "session" } : { user: null, via: "none" };
  }
  const user = token ? await apiKeyUser(token) : null;
  return user ? { user, via: "api-key" } : { user: null, via: "invalid-key" };
}

/** Where to go after sign-in: only a path on this site (see `sameOriginPath`), else the fallback. */
export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = "/"): string {
  return (typeof to === "string" && sameOriginPath(to)) || fallback;
}
