import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { ApiKey } from "../../db/models";
import { apiKeyHash } from "../../app/utils/api-keys.server";
import { baseUrl, signIn } from "../support/http";
import { testDb } from "../support/db";
import { ROLE_SCOPES } from "../../shared/api-scopes";

beforeAll(() => {
  testDb();
});
afterAll(async () => {
  await closeDb();
});

async function createKey(role: "engineer" | "consultant" | "manager") {
  const admin = await signIn("admin@example.com");
  const name = `Historian bridge ${randomUUID().slice(0, 6)}`;
  // The form's checkboxes, ticked for the scopes of the role.
  const scopes = Object.fromEntries(ROLE_SCOPES[role].map((s) => [`scope:${s}`, "on"]));
  const res = await admin.post("/admin/api-keys", { intent: "create", name, role, ...scopes });
  expect(res.status).toBe(200);
  const html = await res.text();
  const key = html.match(/dsk_[0-9a-f]{8}_[A-Za-z0-9_-]{43}/)?.[0];
  expect(key).toBeTruthy();
  return { admin, key: key!, name };
}

const call = (key: string, path: string, init: RequestInit = {}) =>
  fetch(baseUrl() + path, { ...init, headers: { authorization: `Bearer ${key}`, "content-type": "application/json", ...(init.headers ?? {}) } });

describe("API keys", () => {
  it("are shown once, stored only as a hash, and authenticate API calls with their role", async () => {
    const { key, name } = await createKey("engineer");
    const row = await ApiKey.findOne({ where: { name } });
    expect(row!.keyHash).toBe(apiKeyHash(key));
    expect(JSON.stringify(row!.toJSON())).not.toContain(key);

    const list = await call(key, "/api/v1/circuits");
    expect(list.status).toBe(200);
    const created = await call(key, "/api/v1/circuits", { method: "POST", body: JSON.stringify({ name: `Via key ${randomUUID().slice(0, 6)}`, voltageKv: 69, phases: 3 }) });
    expect(created.status).toBe(201);
    expect((await ApiKey.findOne({ where: { name } }))!.lastUsedAt).not.toBeNull();
  });

  it("limit a manager-role key to reading and computing", async () => {
    const { key } = await createKey("manager");
    expect((await call(key, "/api/v1/portfolio")).status).toBe(200);
    const write = await call(key, "/api/v1/circuits", { method: "POST", body: JSON.stringify({ name: "Nope", voltageKv: 69, phases: 3 }) });
    expect(write.status).toBe(403);
  });

  it("refuse unknown and revoked keys with 401 problem+json", async () => {
    const unknown = await call("dsk_00000000_notakey", "/api/v1/circuits");
    expect(unknown.status).toBe(401);
    expect(unknown.headers.get("content-type")).toBe("application/problem+json");
    expect((await unknown.json()).title).toBe("Invalid API key");

    const { admin, key, name } = await createKey("engineer");
    const row = await ApiKey.findOne({ where: { name } });
    const revoke = await admin.post("/admin/api-keys", { intent: "revoke", keyId: String(row!.id) });
    expect(revoke.status).toBe(200);
    expect((await call(key, "/api/v1/circuits")).status).toBe(401);
  });

  it("can only be managed by admins", async () => {
    const engineer = await signIn("engineer@example.com");
    expect((await engineer.get("/admin/api-keys")).status).toBe(403);
  });
});
