// Security checks against the served build (issue 8, "Security"): cross-site changes, open
// redirects, one-time links under concurrency, CSV formulas, the local mailbox, mailed links and
// the Host header, API keys of deactivated admins, sign-in and reset-request limits.
import { ROLE_SCOPES } from "../../shared/api-scopes";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import http from "node:http";
import Papa from "papaparse";
import { closeDb } from "../../db/index";
import { ApiKey, Circuit, RateLimitHit, SignInAttempt, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { RESET_LIMITS, THROTTLE } from "../../lib/sign-in-throttle";
import { baseUrl, client, newAddress, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { firstLink, waitForMail } from "../support/mail";

const EVIL = "https://evil.example";
const appUrl = () => process.env.APP_URL ?? baseUrl();

let engineer: Client;
let admin: Client;

beforeAll(async () => {
  testDb();
  [engineer, admin] = await Promise.all([signIn("engineer@example.com"), signIn("admin@example.com")]);
});
afterAll(async () => {
  await closeDb();
});

const unique = (what: string) => `${what} ${randomUUID().slice(0, 8)}`;

async function makeUser(role: User["role"] = "engineer", password = "a-good-long-password") {
  const demoAdmin = await User.findOne({ where: { email: "admin@example.com" } });
  return User.create({
    organisationId: demoAdmin!.organisationId,
    email: `s-${randomUUID().slice(0, 8)}@example.com`,
    name: unique("Security Person"),
    role,
    passwordHash: await hashPassword(password),
  });
}

async function createKey(by: Client, role: "engineer" | "consultant" | "manager" = "engineer") {
  // The form's scope checkboxes, ticked for the scopes of the role.
  const scopes = Object.fromEntries(ROLE_SCOPES[role].map((s) => [`scope:${s}`, "on"]));
  const res = await by.post("/admin/api-keys", { intent: "create", name: unique("Key"), role, ...scopes });
  expect(res.status).toBe(200);
  const key = (await res.text()).match(/dsk_[0-9a-f]{8}_[A-Za-z0-9_-]{43}/)?.[0];
  expect(key).toBeTruthy();
  return key!;
}

const withKey = (key: string, path: string, init: RequestInit = {}) =>
  fetch(baseUrl() + path, { ...init, redirect: "manual", headers: { authorization: `Bearer ${key}`, "content-type": "application/json", ...(init.headers ?? {}) } });

/** A POST with the session cookie and chosen browser headers (fetch adds none of its own). */
const cookiePost = (c: Client, path: string, body: string, headers: Record<string, string>) =>
  fetch(baseUrl() + path, { method: "POST", redirect: "manual", body, headers: { cookie: c.cookie, "x-forwarded-for": c.address, ...headers } });

describe("cross-site changes", () => {
  it("a cookie-authenticated API post from another site is refused with 403 problem+json, nothing saved", async () => {
    const variants: Record<string, string>[] = [{ origin: EVIL }, { "sec-fetch-site": "cross-site" }, { "sec-fetch-site": "same-site", origin: "https://sibling.example" }];
    for (const headers of variants) {
      const name = unique("Forged circuit");
      const res = await cookiePost(engineer, "/api/v1/circuits", JSON.stringify({ name, voltageKv: 69, phases: 3 }), { "content-type": "application/json", ...headers });
      expect(res.status, JSON.stringify(headers)).toBe(403);
      expect(res.headers.get("content-type")).toBe("application/problem+json");
      expect((await res.json()).title).toBe("Cross-site request refused");
      expect(await Circuit.count({ where: { name } })).toBe(0);
    }
  });

  it("a cookie-authenticated JSON post sent as text/plain is refused (415), nothing saved", async () => {
    for (const type of ["text/plain", "text/plain; charset=application/json", "application/x-www-form-urlencoded"]) {
      const name = unique("Plain circuit");
      const res = await cookiePost(engineer, "/api/v1/circuits", JSON.stringify({ name, voltageKv: 69, phases: 3 }), { "content-type": type });
      expect(res.status, type).toBe(415);
      expect(await Circuit.count({ where: { name } })).toBe(0);
    }
  });

  it("the same post from this site is accepted", async () => {
    const name = unique("Same-site circuit");
    const res = await cookiePost(engineer, "/api/v1/circuits", JSON.stringify({ name, voltageKv: 69, phases: 3 }), {
      "content-type": "application/json",
      origin: new URL(baseUrl()).origin,
      "sec-fetch-site": "same-origin",
    });
    expect(res.status).toBe(201);
    expect(await Circuit.count({ where: { name } })).toBe(1);
  });

  it("a Bearer-key call is exempt: the same cross-site headers do not stop it", async () => {
    const key = await createKey(admin);
    const name = unique("Key circuit");
    const res = await withKey(key, "/api/v1/circuits", { method: "POST", body: JSON.stringify({ name, voltageKv: 69, phases: 3 }), headers: { origin: EVIL, "sec-fetch-site": "cross-site" } });
    expect(res.status).toBe(201);
    expect(await Circuit.count({ where: { name } })).toBe(1);
  });

  it("a form action posted from another site gets a 403 page, nothing saved", async () => {
    const name = unique("Forged form circuit");
    const body = new URLSearchParams({ name, voltageKv: "69", phases: "3" }).toString();
    const res = await cookiePost(engineer, "/circuits/new", body, { "content-type": "application/x-www-form-urlencoded", "sec-fetch-site": "cross-site" });
    expect(res.status).toBe(403);
    expect(await res.text()).toContain("sent from another site");
    expect(await Circuit.count({ where: { name } })).toBe(0);
  });

  it("a form action with another site's Origin is refused before it runs, nothing saved", async () => {
    const name = unique("Forged origin circuit");
    const body = new URLSearchParams({ name, voltageKv: "69", phases: "3" }).toString();
    const res = await cookiePost(engineer, "/circuits/new", body, { "content-type": "application/x-www-form-urlencoded", origin: EVIL });
    // React Router's own origin check answers 400 before the route's guard (which would say 403).
    expect([400, 403]).toContain(res.status);
    expect(await Circuit.count({ where: { name } })).toBe(0);
  });

  it("sign-in, sign-out and reset requests from another site are refused too", async () => {
    const login = await fetch(baseUrl() + "/login", {
      method: "POST",
      redirect: "manual",
      body: new URLSearchParams({ email: "engineer@example.com", password: "duskline-demo" }),
      headers: { "sec-fetch-site": "cross-site", "x-forwarded-for": newAddress() },
    });
    expect(login.status).toBe(403);
    expect(login.headers.get("set-cookie")).toBeNull();
    const c = await signIn("manager@example.com");
    const logout = await cookiePost(c, "/logout", "", { "sec-fetch-site": "cross-site" });
    expect(logout.status).toBe(403);
    expect((await c.get("/")).status).toBe(200);
  });
});

describe("redirect after sign-in", () => {
  it.each(["/\\evil.example", "//evil.example", "/%5Cevil.example", "/%2F%2Fevil.example", "https://evil.example", "/\t/evil.example", "\\/evil.example"])(
    "redirectTo=%j lands on / (never another host)",
    async (redirectTo) => {
      const res = await client().post("/login", { email: "consultant@example.com", password: "duskline-demo", redirectTo });
      expect(res.status).toBe(302);
      expect(res.headers.get("location")).toBe("/");
    },
  );

  it("a path on this site is kept", async () => {
    const res = await client().post("/login", { email: "consultant@example.com", password: "duskline-demo", redirectTo: "/portfolio?sort=verdict" });
    expect(res.headers.get("location")).toBe("/portfolio?sort=verdict");
  });
});

describe("one-time links under concurrency", () => {
  async function raceFiveUses(link: URL) {
    const passwords = Array.from({ length: 5 }, (_, i) => `race-password-${i}-${randomUUID().slice(0, 6)}`);
    const results = await Promise.all(passwords.map((p) => client().post(link.pathname, { password: p, confirm: p })));
    const winners = results.map((r, i) => (r.status === 302 ? passwords[i] : null)).filter((p): p is string => p !== null);
    return { statuses: results.map((r) => r.status), winners, losers: passwords.filter((p) => !winners.includes(p)) };
  }

  it("five concurrent uses of one reset link: exactly one succeeds, and its password is the one set", async () => {
    const user = await makeUser();
    expect((await client().post("/forgot-password", { email: user.email })).status).toBe(200);
    const link = firstLink((await waitForMail(user.email, "Reset")).text);
    const { statuses, winners, losers } = await raceFiveUses(link);
    expect(winners, `statuses ${statuses}`).toHaveLength(1);
    expect(statuses.filter((s) => s === 410)).toHaveLength(4);
    await signIn(user.email, winners[0]);
    expect((await client().post("/login", { email: user.email, password: losers[0] })).status).toBe(401);
  });

  it("five concurrent uses of one invitation link: exactly one succeeds", async () => {
    const email = `race-${randomUUID().slice(0, 8)}@example.com`;
    expect((await admin.post("/admin/users", { intent: "invite", email, name: "Rae Race", role: "manager" })).status).toBe(200);
    const link = firstLink((await waitForMail(email, "invited")).text);
    const { statuses, winners } = await raceFiveUses(link);
    expect(winners, `statuses ${statuses}`).toHaveLength(1);
    await signIn(email, winners[0]);
  });
});

describe("CSV export", () => {
  it("portfolio.csv writes a formula-like crossing name as quoted text with a leading quote", async () => {
    const circuitName = unique("@SUM(1+1)");
    const circuit = await engineer.json("/api/v1/circuits", "POST", { name: circuitName, voltageKv: 138, phases: 3 });
    expect(circuit.status).toBe(201);
    const evilName = `=cmd|' /C calc'!A0 ${randomUUID().slice(0, 6)}`;
    const crossing = await engineer.json(`/api/v1/circuits/${(await circuit.json()).id}/crossings`, "POST", {
      name: evilName,
      lat: 40.2,
      lon: -98.4,
      spanLength: { value: 1000, unit: "ft" },
      kind: "river",
    });
    expect(crossing.status).toBe(201);

    const res = await engineer.get("/portfolio.csv");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    const text = await res.text();
    expect(text).toContain(`"'${evilName}"`);
    const rows = Papa.parse<Record<string, string>>(text.trim(), { header: true }).data;
    const row = rows.find((r) => r.Crossing.includes(evilName));
    expect(row?.Crossing).toBe(`'${evilName}`);
    expect(row?.Circuit).toBe(`'${circuitName}`);
    // No cell anywhere in the file starts like a formula.
    for (const r of rows) for (const cell of Object.values(r)) expect(cell, cell).not.toMatch(/^[=+\-@\t\r]/);
  });
});

describe("local mailbox (/dev/mail)", () => {
  it("sends a signed-out visitor to sign in", async () => {
    const res = await client().get("/dev/mail");
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toBe("/login?redirectTo=%2Fdev%2Fmail");
  });

  it("refuses a signed-in engineer (403) and shows the admin the messages", async () => {
    expect((await engineer.get("/dev/mail")).status).toBe(403);
    const page = await admin.get("/dev/mail");
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Local mailbox");
  });
});

/** A raw request with a Host header of our choosing (fetch does not let one be set). */
function postWithHost(path: string, body: string, headers: Record<string, string>): Promise<number> {
  const url = new URL(baseUrl() + path);
  return new Promise((resolve, reject) => {
    const req = http.request(
      { host: url.hostname, port: url.port, path, method: "POST", headers: { "content-type": "application/x-www-form-urlencoded", "content-length": Buffer.byteLength(body), ...headers } },
      (res) => {
        res.resume();
        res.on("end", () => resolve(res.statusCode ?? 0));
      },
    );
    req.on("error", reject);
    req.end(body);
  });
}

describe("mailed links", () => {
  const hostile = { host: "evil.example", "x-forwarded-host": "evil.example", "x-forwarded-proto": "https" };

  it("a reset link is built from APP_URL whatever Host the request names", async () => {
    const user = await makeUser();
    const status = await postWithHost("/forgot-password", new URLSearchParams({ email: user.email }).toString(), { ...hostile, "x-forwarded-for": newAddress() });
    expect(status).toBe(200);
    const link = firstLink((await waitForMail(user.email, "Reset")).text);
    expect(link.origin).toBe(new URL(appUrl()).origin);
    expect(link.hostname).not.toBe("evil.example");
  });

  it("an invitation link is built from APP_URL whatever Host the request names", async () => {
    const email = `host-${randomUUID().slice(0, 8)}@example.com`;
    const body = new URLSearchParams({ intent: "invite", email, name: "Hal Host", role: "manager" }).toString();
    const status = await postWithHost("/admin/users", body, { ...hostile, cookie: admin.cookie, "x-forwarded-for": admin.address });
    expect(status).toBe(200);
    const link = firstLink((await waitForMail(email, "invited")).text);
    expect(link.origin).toBe(new URL(appUrl()).origin);
  });
});

describe("API keys of a deactivated admin", () => {
  it("stop with 401 when their creator is deactivated, show as stopped, and work again once another admin takes them over", async () => {
    const second = await makeUser("admin");
    const secondAdmin = await signIn(second.email, "a-good-long-password");
    const key = await createKey(secondAdmin);
    expect((await withKey(key, "/api/v1/circuits")).status).toBe(200);

    expect((await admin.post("/admin/users", { intent: "deactivate", userId: String(second.id) })).status).toBe(200);
    const refused = await withKey(key, "/api/v1/circuits");
    expect(refused.status).toBe(401);
    expect(refused.headers.get("content-type")).toBe("application/problem+json");
    expect(await (await admin.get("/admin/api-keys")).text()).toContain("stopped: creator deactivated");

    const row = await ApiKey.findOne({ where: { createdBy: second.id } });
    expect((await admin.post("/admin/api-keys", { intent: "take-over", keyId: String(row!.id) })).status).toBe(200);
    expect((await withKey(key, "/api/v1/circuits")).status).toBe(200);
  });
});

describe("sign-in throttling", () => {
  it("20 failures on made-up e-mails from many clients do not lock out a real account (no global lockout)", async () => {
    for (let i = 0; i < THROTTLE.lockAddressAfter; i++) {
      expect((await client().post("/login", { email: `nobody-${randomUUID().slice(0, 8)}@example.com`, password: "guess-guess-guess" })).status).toBe(401);
    }
    const user = await makeUser();
    const c = client();
    expect((await c.post("/login", { email: user.email, password: "a-good-long-password" })).status).toBe(302);
    // Each attempt was counted under its own client's address.
    expect(await SignInAttempt.count({ where: { email: user.email, ip: c.address, success: true } })).toBe(1);
  });

  it("an address with 20 recent failures is refused while the same account signs in from elsewhere", async () => {
    const address = newAddress();
    await SignInAttempt.bulkCreate(
      Array.from({ length: THROTTLE.lockAddressAfter }, () => ({ email: `made-up-${randomUUID().slice(0, 8)}@example.com`, ip: address, success: false })),
    );
    const user = await makeUser();
    const blocked = await client("", address).post("/login", { email: user.email, password: "a-good-long-password" });
    expect(blocked.status).toBe(429);
    expect((await client().post("/login", { email: user.email, password: "a-good-long-password" })).status).toBe(302);
  });

  it("a deactivated account is named only to someone who knows its password", async () => {
    const user = await makeUser();
    await user.update({ active: false });
    const wrong = await client().post("/login", { email: user.email, password: "not-the-password" });
    expect(wrong.status).toBe(401);
    expect(await wrong.text()).not.toContain("deactivated");
  });
});

describe("reset-request limits", () => {
  it(`a request for one e-mail beyond ${RESET_LIMITS.perEmail} within the hour gets 429 with Retry-After`, async () => {
    const user = await makeUser();
    for (let i = 0; i < RESET_LIMITS.perEmail; i++) expect((await client().post("/forgot-password", { email: user.email })).status).toBe(200);
    const res = await client().post("/forgot-password", { email: user.email });
    expect(res.status).toBe(429);
    expect(Number(res.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await res.text()).toContain("Too many reset requests");
    // Counted in MariaDB, so every app instance sees it.
    expect(await RateLimitHit.count({ where: { action: "password-reset", subject: `email:${user.email}` } })).toBe(RESET_LIMITS.perEmail);
  });

  it(`one address asking for ${RESET_LIMITS.perAddress} different e-mails is stopped at the next`, async () => {
    const c = client();
    for (let i = 0; i < RESET_LIMITS.perAddress; i++) expect((await c.post("/forgot-password", { email: `probe-${randomUUID().slice(0, 8)}@example.com` })).status).toBe(200);
    expect((await c.post("/forgot-password", { email: `probe-${randomUUID().slice(0, 8)}@example.com` })).status).toBe(429);
    // Another address is not affected.
    expect((await client().post("/forgot-password", { email: `probe-${randomUUID().slice(0, 8)}@example.com` })).status).toBe(200);
  });
});
