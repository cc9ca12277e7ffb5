// Issue 12: scoped keys (401 reasons, 403 without the scope, 404 across organisations, immediate
// revocation, expiry, the local demo key), the resources that had no API (device profiles, span
// details, lighting options and their comparison, profile quality, the study list), pages of
// lists, Idempotency-Key on the new POSTs, the per-key limit with its headers, /docs/api.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { ApiKey, DeviceProfile, IdempotencyKey, LightingOption, Organisation, User } from "../../db/models";
import { apiKeyHash, newApiKey } from "../../app/utils/api-keys.server";
import { hashPassword } from "../../lib/passwords";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

const tag = randomUUID().slice(0, 8);
let admin: Client;
let adminId: number;
let organisationId: number;

beforeAll(async () => {
  testDb();
  admin = await signIn("admin@example.com");
  const row = (await User.findOne({ where: { email: "admin@example.com" } }))!;
  adminId = row.id;
  organisationId = row.organisationId;
});
afterAll(async () => {
  await closeDb();
});

async function keyWith(fields: Partial<{ scopes: string[]; expiresAt: Date; revokedAt: Date; rateLimitPerMinute: number; organisationId: number; createdBy: number }> = {}) {
  const { key, prefix } = newApiKey();
  const { scopes, ...rest } = fields;
  const row = await ApiKey.create({
    organisationId,
    name: `API v1 test ${randomUUID().slice(0, 6)}`,
    prefix,
    keyHash: apiKeyHash(key),
    role: "engineer",
    createdBy: adminId,
    scopes: scopes ? JSON.stringify(scopes) : null,
    ...rest,
  });
  return { key, row };
}

function call(key: string, path: string, init: { method?: string; body?: unknown; headers?: Record<string, string> } = {}) {
  return fetch(baseUrl() + path, {
    method: init.method ?? "GET",
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
    headers: { authorization: `Bearer ${key}`, "content-type": "application/json", ...(init.headers ?? {}) },
  });
}

async function problemOf(res: Response) {
  expect(res.headers.get("content-type")).toContain("application/problem+json");
  return res.json();
}

const device = (name: string) => ({ name, minCurrentA: 30, maxCurrentA: 2000, harvestW: "min(0.005*I^2, 15)", loadW: 4, storageWh: 20 });
const option = (name: string) => ({
  name,
  kind: "solar",
  unitPrice: 2400,
  installationMethod: "helicopter",
  mobilisation: 8000,
  ratePerHour: 3000,
  minutesPerUnit: 20,
  annualMaintenance: 150,
  serviceLifeYears: 10,
  horizonYears: 30,
  discountRatePercent: 7,
  feasibilityStatus: "go",
  feasibilityJustification: "Clear sky at both supports.",
});

describe("scoped API keys", () => {
  it("are created on the admin page with scopes and an expiry, shown once with a copy button, stored as a hash", async () => {
    const name = `Scoped ${tag}`;
    const res = await admin.post("/admin/api-keys", { intent: "create", name, role: "manager", "scope:circuits:read": "on", "scope:portfolio:read": "on", expiresOn: "2099-12-31" });
    // 2099 is beyond five years ahead: refused, naming the field, nothing created.
    expect(res.status).toBe(400);
    expect(await res.text()).toContain("at most five years ahead");
    expect(await ApiKey.count({ where: { name } })).toBe(0);

    const lastDay = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
    const ok = await admin.post("/admin/api-keys", { intent: "create", name, role: "manager", "scope:circuits:read": "on", "scope:portfolio:read": "on", expiresOn: lastDay });
    expect(ok.status).toBe(200);
    const html = await ok.text();
    const key = html.match(/dsk_[0-9a-f]{8}_[A-Za-z0-9_-]{43}/)![0];
    expect(html).toContain("Copy key");
    const row = (await ApiKey.findOne({ where: { name } }))!;
    expect(row.keyHash).toBe(apiKeyHash(key));
    expect(key.startsWith(row.prefix)).toBe(true);
    expect(JSON.parse(row.scopes!)).toEqual(["circuits:read", "portfolio:read"]);
    // Valid through the whole last day (UTC).
    expect(row.expiresAt!.toISOString()).toBe(new Date(Date.parse(`${lastDay}T00:00:00Z`) + 86_400_000).toISOString());

    expect((await call(key, "/api/v1/portfolio")).status).toBe(200);
    const refused = await call(key, "/api/v1/devices");
    expect(refused.status).toBe(403);
    expect(await problemOf(refused)).toMatchObject({ title: "Missing scope", scope: "devices:read" });

    // The list shows the key's scopes, expiry and last use; the secret never again.
    const page = await (await admin.get("/admin/api-keys")).text();
    expect(page).toContain("circuits:read, portfolio:read");
    expect(page).not.toContain(key);
    expect((await ApiKey.findByPk(row.id))!.lastUsedAt).not.toBeNull();
  });

  it("refuse with 401 and the reason: missing, malformed, unknown, expired, revoked", async () => {
    const missing = await fetch(baseUrl() + "/api/v1/circuits");
    expect(missing.status).toBe(401);
    expect((await problemOf(missing)).title).toBe("Not signed in");

    const malformed = await call("short", "/api/v1/circuits");
    expect(malformed.status).toBe(401);
    expect((await problemOf(malformed)).reason).toBe("malformed");
    const spaces = await fetch(baseUrl() + "/api/v1/circuits", { headers: { authorization: "Bearer " } });
    expect(spaces.status).toBe(401);

    const unknown = await call(newApiKey().key, "/api/v1/circuits");
    expect((await problemOf(unknown)).reason).toBe("unknown");

    const expired = await keyWith({ expiresAt: new Date(Date.now() - 1000) });
    const e = await call(expired.key, "/api/v1/circuits");
    expect(e.status).toBe(401);
    expect((await problemOf(e)).reason).toBe("expired");

    // Revocation on the admin page stops the key on its very next call.
    const live = await keyWith();
    expect((await call(live.key, "/api/v1/circuits")).status).toBe(200);
    expect((await admin.post("/admin/api-keys", { intent: "revoke", keyId: String(live.row.id) })).status).toBe(200);
    const r = await call(live.key, "/api/v1/circuits");
    expect(r.status).toBe(401);
    expect((await problemOf(r)).reason).toBe("revoked");
  });

  it("answer 404 for another organisation's records, whatever the scopes", async () => {
    const org = await Organisation.create({ name: `Elsewhere ${tag}` });
    const other = await User.create({ organisationId: org.id, email: `elsewhere-${tag}@example.com`, name: "Elsewhere admin", role: "admin", passwordHash: await hashPassword("irrelevant-pass-1") });
    const theirs = await DeviceProfile.create({ organisationId: org.id, name: `Their sphere ${tag}`, spec: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0, storageWh: 0, chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20 } });
    const { key } = await keyWith({ scopes: ["devices:read", "devices:write"] });
    expect((await call(key, `/api/v1/devices/${theirs.id}`)).status).toBe(404);
    expect((await call(key, `/api/v1/devices/${theirs.id}`, { method: "PUT", body: device("Mine now") })).status).toBe(404);
    // …and their key sees nothing of ours.
    const ours = (await DeviceProfile.findOne({ where: { organisationId } }))!;
    const { key: theirKey } = await keyWith({ organisationId: org.id, createdBy: other.id, scopes: ["devices:read"] });
    expect((await call(theirKey, `/api/v1/devices/${ours.id}`)).status).toBe(404);
    const list = await (await call(theirKey, "/api/v1/devices")).json();
    expect(list.devices.map((d: { id: number }) => d.id)).toEqual([theirs.id]);
  });

  it("include the local demo key with every scope (DUSKLINE_LOCAL only)", async () => {
    const demo = await call(process.env.DEMO_API_KEY ?? "dl_demo_local_only_key", "/api/v1/devices");
    expect(demo.status).toBe(200);
    const row = (await ApiKey.findOne({ where: { prefix: "dl_demo" } }))!;
    expect(JSON.parse(row.scopes!)).toContain("webhooks:manage");
  });
});

describe("resources through the page services", () => {
  it("device profiles: create (201, Location), read, replace, retire; the engine checks the expression", async () => {
    const { key } = await keyWith({ scopes: ["devices:read", "devices:write"] });
    const name = `API sphere ${tag}`;
    const created = await call(key, "/api/v1/devices", { method: "POST", body: device(name) });
    expect(created.status, await created.clone().text()).toBe(201);
    const body = await created.json();
    expect(created.headers.get("location")).toBe(`/api/v1/devices/${body.id}`);
    expect(body).toMatchObject({ name, retired: false, spec: { minCurrentA: 30, storageWh: 20 } });
    const got = await (await call(key, `/api/v1/devices/${body.id}`)).json();
    expect(got.spec.harvestW).toBe("min(0.005*I^2, 15)");
    const put = await call(key, `/api/v1/devices/${body.id}`, { method: "PUT", body: { ...device(name), minCurrentA: 25 } });
    expect((await put.json()).spec.minCurrentA).toBe(25);
    const retired = await call(key, `/api/v1/devices/${body.id}`, { method: "DELETE" });
    expect((await retired.json()).retired).toBe(true);
    expect((await DeviceProfile.findByPk(body.id))!.retired).toBe(true);
    // A harvest that is negative somewhere is the engine's refusal, the same as on the page.
    const bad = await call(key, "/api/v1/devices", { method: "POST", body: { ...device(`Bad ${tag}`), harvestW: "I - 1000" } });
    expect(bad.status).toBe(400);
    expect(await DeviceProfile.count({ where: { name: `Bad ${tag}` } })).toBe(0);
  });

  it("crossing details, lighting options CRUD and the comparison", async () => {
    const consultant = await signIn("consultant@example.com");
    const engineer = await signIn("engineer@example.com");
    const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Options line ${tag}`, voltageKv: 115, phases: 3 })).json();
    const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Options creek", lat: 38.6, lon: -92.2, spanLength: { value: 900, unit: "ft" }, kind: "river" })).json();

    const details = await consultant.json(`/api/v1/crossings/${crossing.id}/details`, "PUT", { ruleSet: "faa", highestWire: "shield" });
    expect(details.status, await details.clone().text()).toBe(200);
    const d = await details.json();
    expect(d.details).toMatchObject({ ruleSet: "faa", highestWire: "shield" });
    expect(d.plan.ok).toBe(true);
    expect(d.plan.layout.count).toBeGreaterThan(0);
    expect((await (await engineer.get(`/api/v1/crossings/${crossing.id}/details`)).json()).details.highestWire).toBe("shield");

    const made = await consultant.json(`/api/v1/crossings/${crossing.id}/options`, "POST", option("Solar beacons"));
    expect(made.status, await made.clone().text()).toBe(201);
    const solar = await made.json();
    expect(made.headers.get("location")).toBe(`/api/v1/crossings/${crossing.id}/options/${solar.id}`);
    const cheap = await (await consultant.json(`/api/v1/crossings/${crossing.id}/options`, "POST", { ...option("Cheaper solar"), unitPrice: 100 })).json();
    const put = await consultant.json(`/api/v1/crossings/${crossing.id}/options/${solar.id}`, "PUT", { ...option("Solar beacons"), unitPrice: 2600 });
    expect((await put.json()).unitPrice).toBe(2600);

    const comparison = await (await engineer.get(`/api/v1/crossings/${crossing.id}/comparison`)).json();
    expect(comparison.options.map((o: { id: number }) => o.id).sort()).toEqual([solar.id, cheap.id].sort());
    // Both are "go"; the cheaper one is recommended (the same rule as the crossing page).
    expect(comparison.comparison.recommendation.id).toBe(String(cheap.id));

    expect((await consultant.json(`/api/v1/crossings/${crossing.id}/options/${cheap.id}`, "DELETE")).status).toBe(204);
    expect(await LightingOption.count({ where: { crossingId: crossing.id } })).toBe(1);
    // A manager reads but may not change options (the page's rule).
    const manager = await signIn("manager@example.com");
    expect((await manager.json(`/api/v1/crossings/${crossing.id}/options`, "POST", option("Nope"))).status).toBe(403);
    expect((await manager.get(`/api/v1/crossings/${crossing.id}/options`)).status).toBe(200);
  });

  it("profile quality and the study list (by crossing)", async () => {
    const engineer = await signIn("engineer@example.com");
    const { studies } = await (await engineer.get("/api/v1/studies?limit=1")).json();
    expect(studies).toHaveLength(1);
    const first = studies[0];
    expect(first.results).toBeUndefined();
    const ofCrossing = await (await engineer.get(`/api/v1/studies?crossingId=${first.crossingId}&limit=500`)).json();
    expect(ofCrossing.studies.every((s: { crossingId: number }) => s.crossingId === first.crossingId)).toBe(true);
    expect(ofCrossing.studies.map((s: { id: number }) => s.id)).toContain(first.id);
    const quality = await (await engineer.get(`/api/v1/profiles/${first.profileId}/quality`)).json();
    expect(quality.profileId).toBe(first.profileId);
    expect(quality.quality).toBeTypeOf("object");
  });
});

describe("lists", () => {
  it("page with limit and an opaque cursor until next is null, each item once, in creation order", async () => {
    const engineer = await signIn("engineer@example.com");
    const made: number[] = [];
    for (let i = 0; i < 3; i++) made.push((await (await engineer.json("/api/v1/circuits", "POST", { name: `Paged ${tag} ${i}`, voltageKv: 69, phases: 3 })).json()).id);
    const seen: number[] = [];
    let cursor: string | null = null;
    for (let pages = 0; pages < 1000; pages++) {
      const res = await engineer.get(`/api/v1/circuits?limit=2${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`);
      const page: { circuits: { id: number }[]; next: string | null } = await res.json();
      expect(page.circuits.length).toBeLessThanOrEqual(2);
      seen.push(...page.circuits.map((c) => c.id));
      cursor = page.next;
      if (!cursor) break;
    }
    expect(new Set(seen).size).toBe(seen.length);
    expect(seen).toEqual([...seen].sort((a, b) => a - b));
    for (const id of made) expect(seen).toContain(id);
    // Default page size 50.
    const all = await (await engineer.get("/api/v1/circuits")).json();
    expect(all.circuits.length).toBe(Math.min(50, seen.length));
  });
});

describe("Idempotency-Key on the new POSTs", () => {
  it("replays a device creation: same id, one row; another body under the key is a 422", async () => {
    const { key } = await keyWith({ scopes: ["devices:write"] });
    const idem = randomUUID();
    const name = `Idempotent sphere ${tag}`;
    const first = await call(key, "/api/v1/devices", { method: "POST", body: device(name), headers: { "Idempotency-Key": idem } });
    const again = await call(key, "/api/v1/devices", { method: "POST", body: device(name), headers: { "Idempotency-Key": idem } });
    expect(first.status).toBe(201);
    expect(again.status).toBe(201);
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect((await again.json()).id).toBe((await first.json()).id);
    expect(await DeviceProfile.count({ where: { name } })).toBe(1);
    const other = await call(key, "/api/v1/devices", { method: "POST", body: device(`${name} 2`), headers: { "Idempotency-Key": idem } });
    expect(other.status).toBe(422);
    expect(await DeviceProfile.count({ where: { name: `${name} 2` } })).toBe(0);
    expect(await IdempotencyKey.count({ where: { key: idem } })).toBe(1);
  });

  it("replays a computation (marker layout) with the same answer", async () => {
    const { key } = await keyWith({ scopes: ["feasibility:run"] });
    const idem = randomUUID();
    const body = { ruleSet: "faa", spanLength: { value: 1200, unit: "ft" } };
    const first = await call(key, "/api/v1/markers/layout", { method: "POST", body, headers: { "Idempotency-Key": idem } });
    const again = await call(key, "/api/v1/markers/layout", { method: "POST", body, headers: { "Idempotency-Key": idem } });
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect(await again.json()).toEqual(await first.json());
  });
});

describe("rate limit per key", () => {
  it("answers 429 with Retry-After past the key's limit, and RateLimit-* on every answer", async () => {
    const { key } = await keyWith({ scopes: ["circuits:read"], rateLimitPerMinute: 3 });
    // A fresh minute, so the three calls cannot straddle two windows.
    const secondsLeft = 60 - new Date().getUTCSeconds();
    if (secondsLeft < 10) await new Promise((r) => setTimeout(r, secondsLeft * 1000 + 200));
    const answers = [];
    for (let i = 0; i < 4; i++) answers.push(await call(key, "/api/v1/circuits?limit=1"));
    expect(answers.map((a) => a.status)).toEqual([200, 200, 200, 429]);
    expect(answers.map((a) => a.headers.get("ratelimit-remaining"))).toEqual(["2", "1", "0", "0"]);
    expect(answers[0].headers.get("ratelimit-limit")).toBe("3");
    const retry = Number(answers[3].headers.get("retry-after"));
    expect(retry).toBeGreaterThanOrEqual(1);
    expect(retry).toBeLessThanOrEqual(60);
    expect((await problemOf(answers[3])).status).toBe(429);
    // Another key is counted on its own.
    const { key: other } = await keyWith({ scopes: ["circuits:read"], rateLimitPerMinute: 3 });
    expect((await call(other, "/api/v1/circuits?limit=1")).status).toBe(200);
  });

  it("counts concurrent calls exactly: each one reads back its own count", async () => {
    const { key } = await keyWith({ scopes: ["circuits:read"], rateLimitPerMinute: 5 });
    const secondsLeft = 60 - new Date().getUTCSeconds();
    if (secondsLeft < 10) await new Promise((r) => setTimeout(r, secondsLeft * 1000 + 200));
    const answers = await Promise.all(Array.from({ length: 8 }, () => call(key, "/api/v1/circuits?limit=1")));
    const allowed = answers.filter((a) => a.status === 200);
    expect(allowed).toHaveLength(5);
    expect(answers.filter((a) => a.status === 429)).toHaveLength(3);
    // Counts 1..5 each came back once: remaining 4, 3, 2, 1, 0.
    expect(allowed.map((a) => a.headers.get("ratelimit-remaining")).sort()).toEqual(["0", "1", "2", "3", "4"]);
  });
});

describe("reference page", () => {
  it("/docs/api renders every path of the served document, with no outside script or font", async () => {
    const doc = await (await fetch(baseUrl() + "/api/v1/openapi.json")).json();
    const res = await fetch(baseUrl() + "/docs/api");
    expect(res.status).toBe(200);
    const html = await res.text();
    for (const path of Object.keys(doc.paths)) expect(html).toContain(path.replace(/&/g, "&amp;"));
    expect(html).toContain("RateLimit-Remaining");
    expect(html).not.toMatch(/<script[^>]+src="https?:\/\//);
    expect(html).not.toMatch(/<link[^>]+href="https?:\/\//);
  });
});
