// Two app processes on one database are interchangeable: sessions, sign-in limits and records
// live in MariaDB, so a user signed in on one instance works on the other.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "../../db/index";
import { ApiKey, LoadProfile, Study, User } from "../../db/models";
import { apiKeyHash, newApiKey } from "../../app/utils/api-keys.server";
import { baseUrl, client, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { secondPort, startApp, type AppProcess } from "../support/app-process";
import { createScene, dayCsv, studyBody, uploadCsv, type Scene } from "./fixtures";

let second: AppProcess;
let engineer: Client;
let scene: Scene;

beforeAll(async () => {
  testDb();
  second = await startApp(secondPort());
});
afterAll(async () => {
  await second?.stop();
  await closeDb();
});

/** The same client, talking to another instance. */
function on(url: string, c: Client, path: string, init: RequestInit = {}) {
  return fetch(url + path, { redirect: "manual", ...init, headers: { cookie: c.cookie, "x-forwarded-for": c.address, ...(init.headers ?? {}) } });
}

describe("two app instances on one database", () => {
  it("signs in on the first, uploads on the second, runs a study on the first", async () => {
    expect(second.url).not.toBe(baseUrl());
    engineer = await signIn("engineer@example.com"); // on the first instance
    scene = await createScene(engineer);

    const page = await on(second.url, engineer, `/circuits/${scene.circuitId}`);
    expect(page.status).toBe(200);
    const up = await uploadCsv(engineer, scene.circuitId, dayCsv(2, 150), "uploaded on the second instance", second.url);
    expect(up.status).toBe(201);
    const profileId = (await up.json()).profile.id;
    expect((await LoadProfile.findByPk(profileId))?.circuitId).toBe(scene.circuitId);

    const study = await engineer.json("/api/v1/studies", "POST", { ...studyBody(scene), profileId });
    expect(study.status).toBe(201);
    const { id } = await study.json();
    expect((await Study.findByPk(id))?.profileId).toBe(profileId);
    const read = await on(second.url, engineer, `/api/v1/studies/${id}`);
    expect(read.status).toBe(200);
    expect((await read.json()).profileId).toBe(profileId);
  });

  it("signing out on one instance ends the session on both", async () => {
    const manager = await signIn("manager@example.com");
    expect((await on(second.url, manager, "/portfolio")).status).toBe(200);
    const out = await on(second.url, manager, "/logout", { method: "POST" });
    expect([302, 303]).toContain(out.status);
    const after = await manager.get("/portfolio");
    expect(after.status).toBe(302);
    expect(after.headers.get("location")).toContain("/login");
  });

  it("counts failed sign-ins across instances (the limits live in the database)", async () => {
    const address = client().address;
    // A made-up account: its failures count all the same, and no real account is locked.
    const email = `nobody-${address.replace(/\./g, "-")}@example.com`;
    const attempt = (url: string) =>
      fetch(`${url}/login`, {
        method: "POST",
        redirect: "manual",
        body: new URLSearchParams({ email, password: "not the password" }),
        headers: { "content-type": "application/x-www-form-urlencoded", "x-forwarded-for": address },
      });
    // Five failures for the account, alternating instances: the next one is refused on either.
    for (let i = 0; i < 5; i++) expect((await attempt(i % 2 ? second.url : baseUrl())).status).toBe(401);
    expect((await attempt(second.url)).status).toBe(429);
    expect((await attempt(baseUrl())).status).toBe(429);
  });

  it("shares the API request limit of a key across instances (counts in the database)", async () => {
    const admin = (await User.findOne({ where: { email: "admin@example.com" } }))!;
    const { key, prefix } = newApiKey();
    await ApiKey.create({ organisationId: admin.organisationId, name: `Shared limit ${prefix}`, prefix, keyHash: apiKeyHash(key), role: "engineer", createdBy: admin.id, scopes: JSON.stringify(["circuits:read"]), rateLimitPerMinute: 4 });
    const call = (url: string) => fetch(`${url}/api/v1/circuits?limit=1`, { headers: { authorization: `Bearer ${key}` } });
    // A fresh minute, so the calls cannot straddle two windows.
    const secondsLeft = 60 - new Date().getUTCSeconds();
    if (secondsLeft < 15) await new Promise((r) => setTimeout(r, secondsLeft * 1000 + 200));
    const statuses = [];
    for (let i = 0; i < 4; i++) statuses.push((await call(i % 2 ? second.url : baseUrl())).status);
    expect(statuses).toEqual([200, 200, 200, 200]);
    // The fifth call is refused on either instance.
    const first = await call(baseUrl());
    const other = await call(second.url);
    expect([first.status, other.status]).toEqual([429, 429]);
    expect(Number(other.headers.get("retry-after"))).toBeGreaterThanOrEqual(1);
    expect(other.headers.get("ratelimit-remaining")).toBe("0");
  });
});
