// Idempotency-Key on the JSON creates: a retry replays the first answer, concurrent retries
// make one record, another body under the same key is a 422.
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "../../db/index";
import { Circuit, IdempotencyKey } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let consultant: Client;

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  consultant = await signIn("consultant@example.com");
});
afterAll(async () => {
  await closeDb();
});

function post(c: Client, path: string, body: unknown, key?: string) {
  return fetch(baseUrl() + path, {
    method: "POST",
    body: JSON.stringify(body),
    headers: { cookie: c.cookie, "x-forwarded-for": c.address, "content-type": "application/json", ...(key === undefined ? {} : { "Idempotency-Key": key }) },
  });
}

describe("Idempotency-Key", () => {
  it("replays the first response for the same key and body, and refuses another body", async () => {
    const key = randomUUID();
    const body = { name: `Idempotent ${key.slice(0, 8)}`, voltageKv: 69, phases: 3 };
    const first = await post(engineer, "/api/v1/circuits", body, key);
    expect(first.status).toBe(201);
    const created = await first.json();
    const second = await post(engineer, "/api/v1/circuits", body, key);
    expect(second.status).toBe(201);
    expect(second.headers.get("idempotent-replayed")).toBe("true");
    expect(second.headers.get("location")).toBe(`/api/v1/circuits/${created.id}`);
    expect(await second.json()).toEqual(created);
    expect(await Circuit.count({ where: { name: body.name } })).toBe(1);

    const other = await post(engineer, "/api/v1/circuits", { ...body, voltageKv: 138 }, key);
    expect(other.status).toBe(422);
    expect(other.headers.get("content-type")).toContain("application/problem+json");
    expect((await other.json()).errors).toEqual([expect.objectContaining({ path: "Idempotency-Key" })]);
    expect(await Circuit.count({ where: { name: body.name } })).toBe(1);
  });

  it("makes one record when the same request arrives five times at once", async () => {
    const key = randomUUID();
    const body = { name: `Concurrent ${key.slice(0, 8)}`, voltageKv: 69, phases: 3 };
    const answers = await Promise.all(Array.from({ length: 5 }, () => post(engineer, "/api/v1/circuits", body, key)));
    expect(answers.map((a) => a.status)).toEqual([201, 201, 201, 201, 201]);
    const ids = new Set(await Promise.all(answers.map(async (a) => (await a.json()).id)));
    expect(ids.size).toBe(1);
    expect(await Circuit.count({ where: { name: body.name } })).toBe(1);
    expect(await IdempotencyKey.count({ where: { key } })).toBe(1);
  });

  it("keeps keys per organisation and leaves requests without a key alone", async () => {
    const name = `Unkeyed ${randomUUID().slice(0, 8)}`;
    expect((await post(engineer, "/api/v1/circuits", { name, voltageKv: 69, phases: 3 })).status).toBe(201);
    // Without a key a repeat is a new request: here refused as a duplicate name, as before.
    expect((await post(engineer, "/api/v1/circuits", { name, voltageKv: 69, phases: 3 })).status).toBe(409);

    const bad = await post(engineer, "/api/v1/circuits", { name: `${name} b`, voltageKv: 69, phases: 3 }, "has spaces in it");
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].path).toBe("Idempotency-Key");
    // A consultant may not create circuits: the key does not change the answer.
    expect((await post(consultant, "/api/v1/circuits", { name: `${name} c`, voltageKv: 69, phases: 3 }, randomUUID())).status).toBe(403);
  });

  it("keeps a key 24 hours: an older record is not replayed", async () => {
    const key = randomUUID();
    const body = { name: `Expired ${key.slice(0, 8)}`, voltageKv: 69, phases: 3 };
    const first = await (await post(engineer, "/api/v1/circuits", body, key)).json();
    await IdempotencyKey.update({ createdAt: new Date(Date.now() - 25 * 3600_000) }, { where: { key } });
    // Same key a day later: a new request, here refused because the name is now taken.
    const later = await post(engineer, "/api/v1/circuits", body, key);
    expect(later.status).toBe(409);
    expect(later.headers.get("idempotent-replayed")).toBeNull();
    expect(await Circuit.count({ where: { name: body.name } })).toBe(1);
    expect(first.id).toBeGreaterThan(0);
  });
});
