// Authorisation matrix: every route in app/routes.ts, requested (GET) by every kind of caller,
// against the expected outcome written in EXPECTED below. The route list is read from
// app/routes.ts itself, so a route added without an entry here fails the test.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import routes from "../../app/routes";
import { closeDb } from "../../db/index";
import { ApiKey, Circuit, Crossing, DeviceProfile, Job, LightingOption, LoadProfile, Study, User, Webhook } from "../../db/models";
import { apiKeyHash, newApiKey } from "../../app/utils/api-keys.server";
import { hashPassword } from "../../lib/passwords";
import { client, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

// key:reader holds the one scope circuits:read; key:expired and key:revoked stop at once.
const CALLERS = ["anon", "admin", "engineer", "consultant", "manager", "key:engineer", "key:consultant", "key:manager", "key:stopped", "key:reader", "key:expired", "key:revoked"] as const;
type Caller = (typeof CALLERS)[number];

// Outcomes: a status code, or "login" (302 to the sign-in page), or "home" (302 to /).
type Outcome = number | "login" | "home";
type Row = Record<Caller, Outcome>;

/** A page every signed-in role may read; keys are not sessions, so they are sent to sign in. */
const page: Row = { anon: "login", admin: 200, engineer: 200, consultant: 200, manager: 200, "key:engineer": "login", "key:consultant": "login", "key:manager": "login", "key:stopped": "login", "key:reader": "login", "key:expired": "login", "key:revoked": "login" };
const pageFor = (...roles: Caller[]): Row =>
  Object.fromEntries(CALLERS.map((c) => [c, page[c] === 200 ? (c === "admin" || roles.includes(c) ? 200 : 403) : page[c]])) as Row;
/** A JSON API route every role may read, by session or by key; a key whose creator has been deactivated stops. */
const api: Row = { anon: 401, admin: 200, engineer: 200, consultant: 200, manager: 200, "key:engineer": 200, "key:consultant": 200, "key:manager": 200, "key:stopped": 401, "key:reader": 200, "key:expired": 401, "key:revoked": 401 };
/** A JSON API route that needs another scope than circuits:read: the reader key gets 403. */
const apiFor = (scope: string, status = 200): Row => ({ ...Object.fromEntries(CALLERS.map((c) => [c, api[c] === 200 ? status : api[c]])), "key:reader": scope === "circuits:read" ? status : 403 }) as Row;
const apiStatus = (status: number): Row => apiFor("circuits:read", status);
/** A JSON API route for admins only (sessions, or a key with webhooks:manage; no role key is an admin). */
const adminApi: Row = { ...apiFor("webhooks:manage", 403), admin: 200 };
const everyone = (outcome: Outcome): Row => Object.fromEntries(CALLERS.map((c) => [c, outcome])) as Row;
/** Pages for signed-out visitors: a signed-in user is sent home. */
const signedOutPage: Row = { ...everyone(200), admin: "home", engineer: "home", consultant: "home", manager: "home" };

const EXPECTED: Record<string, Row> = {
  "/login": signedOutPage,
  "/logout": everyone("home"),
  "/forgot-password": everyone(200),
  // An unknown or used token is gone (410) for everyone.
  "/invite/:token": everyone(410),
  "/reset/:token": everyone(410),
  "/dev/mail": pageFor(),
  // The API reference is public, like the document it renders.
  "/docs/api": everyone(200),
  "/": page,
  "/circuits": page,
  "/circuits/new": pageFor("engineer"),
  "/circuits/:circuitId": page,
  "/circuits/:circuitId/edit": pageFor("engineer"),
  "/circuits/:circuitId/crossings/new": pageFor("engineer"),
  "/crossings/:crossingId": page,
  "/crossings/:crossingId/edit": pageFor("engineer"),
  "/crossings/:crossingId/details": pageFor("engineer", "consultant"),
  "/crossings/:crossingId/aviation": pageFor("engineer", "consultant"),
  "/crossings/:crossingId/temperatures": pageFor("engineer", "consultant"),
  "/crossings/:crossingId/options/new": pageFor("engineer", "consultant"),
  "/crossings/:crossingId/options/:optionId": pageFor("engineer", "consultant"),
  "/crossings/:crossingId/studies/new": pageFor("engineer"),
  // POST only (the review panel); the service decides who may make which move.
  "/crossings/:crossingId/review": { ...page, admin: 405, engineer: 405, consultant: 405, manager: 405 },
  "/studies/:studyId": page,
  "/studies/:studyId/report": page,
  "/studies/:studyId/report.pdf": page,
  "/jobs/:jobId": page,
  "/profiles/:profileId": page,
  "/devices": page,
  "/devices/new": pageFor("engineer"),
  "/devices/:deviceId": page,
  "/rules": page,
  "/rules/:ruleKey": page,
  "/portfolio": page,
  "/portfolio.csv": page,
  "/crossings/:crossingId/optimise": pageFor("engineer"),
  "/optimise": pageFor("engineer"),
  // The CSV of a fleet run names its job (?job=); without one it is a 400.
  "/optimise.csv": Object.fromEntries(CALLERS.map((c) => [c, pageFor("engineer")[c] === 200 ? 400 : pageFor("engineer")[c]])) as Row,
  "/admin/users": pageFor(),
  "/admin/policy": pageFor(),
  "/admin/api-keys": pageFor(),
  "/admin/webhooks": pageFor(),
  "/admin/audit": pageFor(),
  "/admin/audit.csv": pageFor(),
  "/api/v1/circuits": api,
  "/api/v1/circuits/:circuitId": api,
  "/api/v1/circuits/:circuitId/crossings": api,
  "/api/v1/circuits/:circuitId/profiles": api,
  "/api/v1/crossings/:crossingId": api,
  "/api/v1/crossings/:crossingId/review": api,
  "/api/v1/crossings/:crossingId/details": api,
  "/api/v1/crossings/:crossingId/options": api,
  "/api/v1/crossings/:crossingId/options/:optionId": api,
  "/api/v1/crossings/:crossingId/comparison": api,
  "/api/v1/devices": apiFor("devices:read"),
  "/api/v1/devices/:deviceId": apiFor("devices:read"),
  "/api/v1/profiles/:profileId": api,
  "/api/v1/profiles/:profileId/quality": api,
  "/api/v1/profiles/:profileId/append": everyone(405),
  "/api/v1/markers/layout": apiFor("feasibility:run", 405),
  "/api/v1/notice-check": everyone(405),
  "/api/v1/openapi.json": everyone(200),
  "/api/v1/portfolio": apiFor("portfolio:read"),
  "/api/v1/feasibility": everyone(405),
  "/api/v1/studies": apiFor("studies:read"),
  "/api/v1/studies/:studyId": apiFor("studies:read"),
  "/api/v1/studies/:studyId/what-if": everyone(405),
  "/api/v1/jobs/:jobId": apiFor("studies:read"),
  "/api/v1/optimise": everyone(405),
  // The matrix's job stays queued: its result is not there yet.
  "/api/v1/jobs/:jobId/result": apiFor("studies:read", 409),
  "/api/v1/circuits/:circuitId/studies": everyone(405),
  "/api/v1/webhooks": adminApi,
  "/api/v1/webhooks/:webhookId": adminApi,
  "/api/v1/webhooks/:webhookId/deliveries": adminApi,
  "/api/v1/studies/:studyId/report.pdf": apiFor("studies:read"),
  "/api/v1/*": everyone(404),
  "/*": everyone(404),
};

type RouteEntry = { path?: string; index?: boolean; children?: RouteEntry[] };

/** Every URL pattern that app/routes.ts declares (layouts contribute their children). */
function routePatterns(entries: RouteEntry[], parent = ""): string[] {
  return entries.flatMap((r) => {
    const here = r.path === undefined ? parent : `${parent}/${r.path}`.replace(/\/+/g, "/");
    const own = r.index || (r.path !== undefined && !r.children?.length) ? [here || "/"] : [];
    return [...own, ...routePatterns(r.children ?? [], here)];
  });
}

let ids: Record<string, string>;
const sessions: Partial<Record<Caller, Client>> = {};
const keys: Partial<Record<Caller, string>> = {};

async function createKey(organisationId: number, role: "engineer" | "consultant" | "manager", createdBy: number, extra: Partial<{ scopes: string; expiresAt: Date; revokedAt: Date }> = {}) {
  const { key, prefix } = newApiKey();
  await ApiKey.create({ organisationId, name: `Matrix ${role} ${randomUUID().slice(0, 6)}`, prefix, keyHash: apiKeyHash(key), role, createdBy, lastUsedAt: null, revokedAt: null, ...extra });
  return key;
}

beforeAll(async () => {
  testDb();
  const admin = (await User.findOne({ where: { email: "admin@example.com" } }))!;
  const org = admin.organisationId;
  const crossing = (await Crossing.findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!;
  const option = (await LightingOption.findOne({ where: { crossingId: crossing.id } })) ?? (await LightingOption.findOne({ order: [["id", "ASC"]] }));
  ids = {
    circuitId: String((await Circuit.findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!.id),
    crossingId: String(option?.crossingId ?? crossing.id),
    optionId: String(option!.id),
    studyId: String((await Study.findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!.id),
    profileId: String((await LoadProfile.findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!.id),
    deviceId: String((await DeviceProfile.findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!.id),
    token: "not-a-real-token",
    ruleKey: "faa.spacing",
    // A job of a kind no instance runs, so it stays queued (a done study job would redirect).
    jobId: String((await Job.create({ organisationId: org, kind: "matrix.idle", input: {}, createdBy: admin.id })).id),
    webhookId: String((await Webhook.create({ organisationId: org, url: "https://receiver.example/matrix", events: ["job.failed"], secret: "dlwhsec_matrix", createdBy: admin.id })).id),
  };
  for (const role of ["admin", "engineer", "consultant", "manager"] as const) sessions[role] = await signIn(`${role}@example.com`);
  for (const role of ["engineer", "consultant", "manager"] as const) keys[`key:${role}`] = await createKey(org, role, admin.id);
  keys["key:reader"] = await createKey(org, "engineer", admin.id, { scopes: JSON.stringify(["circuits:read"]) });
  keys["key:expired"] = await createKey(org, "engineer", admin.id, { expiresAt: new Date(Date.now() - 1000) });
  keys["key:revoked"] = await createKey(org, "engineer", admin.id, { revokedAt: new Date() });
  // A key whose creating admin has since been deactivated.
  const leaver = await User.create({ organisationId: org, email: `leaver-${randomUUID().slice(0, 8)}@example.com`, name: "Former administrator", role: "admin", passwordHash: await hashPassword("irrelevant-pass-1"), active: true });
  keys["key:stopped"] = await createKey(org, "engineer", leaver.id);
  await leaver.update({ active: false });
});
afterAll(async () => {
  // No deliveries to the made-up receiver after this file.
  await Webhook.destroy({ where: { id: Number(ids.webhookId) } });
  await closeDb();
});

function concrete(pattern: string): string {
  if (pattern.endsWith("*")) return pattern.replace("*", `no-such-page-${randomUUID().slice(0, 6)}`);
  return pattern.replace(/:(\w+)/g, (_, name: string) => {
    if (!(name in ids)) throw new Error(`No id for :${name}; add one to the test's ids.`);
    return ids[name];
  });
}

async function outcome(caller: Caller, path: string): Promise<Outcome> {
  const headers: Record<string, string> = {};
  if (caller.startsWith("key:")) headers.authorization = `Bearer ${keys[caller]}`;
  const c = sessions[caller] ?? client();
  const res = await c.get(path, { headers });
  await res.arrayBuffer();
  if (res.status === 302) {
    const location = res.headers.get("location") ?? "";
    if (location.startsWith("/login")) return "login";
    if (location === "/") return "home";
    return `302 ${location}` as unknown as Outcome;
  }
  return res.status;
}

describe("authorisation matrix", () => {
  const patterns = routePatterns(routes as RouteEntry[]);

  it("has an expected row for every route in app/routes.ts, and no row for a route that is gone", () => {
    expect(patterns.filter((p) => !(p in EXPECTED))).toEqual([]);
    expect(Object.keys(EXPECTED).filter((p) => !patterns.includes(p))).toEqual([]);
  });

  it.each(patterns.filter((p) => p in EXPECTED))("%s answers each caller as expected", async (pattern) => {
    const path = concrete(pattern);
    const actual = Object.fromEntries(await Promise.all(CALLERS.map(async (c) => [c, await outcome(c, path)] as const)));
    expect(actual).toEqual(EXPECTED[pattern]);
  });
});
