import { randomBytes } from "node:crypto";
import { LRUCache } from "lru-cache";
import { createCookieSessionStorage, redirect } from "react-router";
import { QueryTypes } from "sequelize";
import { Session, type User } from "../../db/models";
import { db } from "./db.server";
import { getEnv } from "./env.server";
import { clientAddress } from "./http.server";

const SESSION_DAYS = 7;

let storage: ReturnType<typeof createStorage> | undefined;
function createStorage() {
  const env = getEnv();
  const secure = env.APP_URL.startsWith("https:");
  return createCookieSessionStorage<{ sessionId: string }>({
    cookie: {
      // Over https the __Host- prefix makes browsers refuse the cookie from any other host or path;
      // plain http (a developer's machine) cannot use it, as it requires Secure.
      name: secure ? "__Host-duskline" : "__duskline",
      httpOnly: true,
      sameSite: "lax",
      path: "/",
      secrets: [env.SESSION_SECRET],
      secure,
      maxAge: SESSION_DAYS * 24 * 3600,
    },
  });
}
function sessionStorage() {
  storage ??= createStorage();
  return storage;
}

export interface SessionUser {
  id: number;
  organisationId: number;
  organisationName: string;
  email: string;
  name: string;
  role: User["role"];
  sessionId: string;
}

/**
 * Cookie headers already verified, with the session id they carry. Checking the cookie's
 * signature (an HMAC through webcrypto) was about a twentieth of a cached page's CPU, and a
 * signed header always carries the same id; whether that session is still valid is asked of the
 * database on every request all the same. Only verified headers are kept, so forged ones cannot
 * push them out.
 */
const verifiedCookies = new LRUCache<string, string>({ max: 5_000 });

async function readSessionId(request: Request): Promise<string | undefined> {
  const header = request.headers.get("Cookie");
  const known = header ? verifiedCookies.get(header) : undefined;
  if (known) return known;
  const session = await sessionStorage().getSession(header);
  const sessionId: string | undefined = session.get("sessionId");
  if (header && sessionId && header.length <= 2_048) verifiedCookies.set(header, sessionId);
  return sessionId;
}

/**
 * The signed-in user, or null when the cookie is absent, revoked, expired or the user inactive.
 * Every request of a signed-in user asks this, so it is one primary-key lookup with two joins,
 * read as plain rows (no model instances): revocation stays immediate on every instance.
 */
export async function getSessionUser(request: Request): Promise<SessionUser | null> {
  const sessionId = await readSessionId(request);
  if (!sessionId) return null;
  const [row] = await db().query<{ id: number; organisationId: number; organisationName: string; email: string; name: string; role: User["role"] }>(
    `SELECT u.id, u.organisation_id AS organisationId, o.name AS organisationName, u.email, u.name, u.role
       FROM sessions s
       JOIN users u ON u.id = s.user_id AND u.active
       JOIN organisations o ON o.id = u.organisation_id
      WHERE s.id = :sessionId AND s.expires_at > :now`,
    { replacements: { sessionId, now: new Date() }, type: QueryTypes.SELECT },
  );
  return row ? { ...row, sessionId } : null;
}

/** Starts a fresh session row (a new id at every sign-in) and redirects with its cookie. */
export async function createUserSession(request: Request, userId: number, redirectTo: string): Promise<Response> {
  db();
  const previous = await readSessionId(request);
  if (previous) await Session.destroy({ where: { id: previous } });
  const id = randomBytes(32).toString("hex");
  await Session.create({
    id,
    userId,
    expiresAt: new Date(Date.now() + SESSION_DAYS * 24 * 3600 * 1000),
    ip: clientAddress(request),
    userAgent: request.headers.get("user-agent")?.slice(0, 300) ?? null,
  });
  const session = await sessionStorage().getSession();
  session.set("sessionId", id);
  return redirect(redirectTo, { headers: { "Set-Cookie": await sessionStorage().commitSession(session) } });
}

/** Deletes the session row, so the old cookie stops working everywhere. */
export async function destroyUserSession(request: Request): Promise<Response> {
  db();
  const cookieSession = await sessionStorage().getSession(request.headers.get("Cookie"));
  const id = cookieSession.get("sessionId");
  if (id) await Session.destroy({ where: { id } });
  return redirect("/login", { headers: { "Set-Cookie": await sessionStorage().destroySession(cookieSession) } });
}

export async function endSessionsOfUser(userId: number): Promise<number> {
  db();
  return Session.destroy({ where: { userId } });
}
