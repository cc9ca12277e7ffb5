// Each role's home page lists what waits for it (issue 10, "Home pages by role"): the engineer's
// profiles with quality problems and studies to re-run, the consultant's crossings without a
// recommended option, the manager's review counts, the admin's keys and recent changes.
import { beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let consultant: Client;
let manager: Client;
let admin: Client;
const tag = randomUUID().slice(0, 6);
const DEVICE = { name: `Home device ${tag}`, minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 0, chargeEfficiency: 0.9 };
let crossingName: string;
let profileName: string;
let deviceId: number;

/** The text of one list on the home page (its section, by test id). */
async function listText(c: Client, id: string): Promise<string> {
  const html = await (await c.get("/")).text();
  const start = html.indexOf(`data-testid="${id}"`);
  expect(start, `${id} on the home page`).toBeGreaterThan(-1);
  return html.slice(start, html.indexOf("</section>", start));
}

beforeAll(async () => {
  testDb();
  [engineer, consultant, manager, admin] = await Promise.all(["engineer", "consultant", "manager", "admin"].map((r) => signIn(`${r}@example.com`)));
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Home circuit ${tag}`, voltageKv: 115, phases: 1 })).json();
  // Two days at 5 minutes with 12 hours of samples missing (coverage under 95 %).
  const start = Date.UTC(2025, 5, 1);
  const rows = Array.from({ length: 576 }, (_, i) => i).filter((i) => i < 216 || i >= 360).map((i) => `${new Date(start + i * 300_000).toISOString()},${100 + (i % 7)}`);
  profileName = `Gappy export ${tag}`;
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=${encodeURIComponent(profileName)}`, {
    method: "POST",
    body: ["Time,Amps", ...rows].join("\n"),
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  const profileId = (await up.json()).profile.id;
  crossingName = `Home crossing ${tag}`;
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: crossingName, lat: 40, lon: -100, spanLength: { value: 1000, unit: "ft" }, kind: "river" })).json();
  const device = await engineer.json("/api/v1/devices", "POST", DEVICE);
  expect(device.status).toBe(201);
  deviceId = (await device.json()).id;
  const study = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId, deviceProfileId: deviceId, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } });
  expect(study.status).toBe(201);
});

describe("home pages by role", () => {
  it("the engineer sees the gappy profile, and the study once its device profile is edited", async () => {
    expect(await listText(engineer, "list-quality")).toContain(profileName);
    // Known time: the period runs 575 steps of 5 min (47.92 h); the gap runs from sample 215 to
    // 360, 145 steps (12.08 h) unknown: 35.83 / 47.92 = 74.8 %.
    expect(await listText(engineer, "list-quality")).toContain("74.8 % coverage");
    expect(await listText(engineer, "list-rerun")).not.toContain(crossingName);
    expect((await engineer.json(`/api/v1/devices/${deviceId}`, "PUT", { ...DEVICE, loadW: 5 })).status).toBe(200);
    const rerun = await listText(engineer, "list-rerun");
    expect(rerun).toContain(crossingName);
    expect(rerun).toContain("has been edited since");
  });

  it("the consultant sees the crossing without a recommended option", async () => {
    expect(await listText(consultant, "list-no-option")).toContain(crossingName);
  });

  it("the manager sees review counts, and the admin the keys and the latest changes", async () => {
    const managerHome = await (await manager.get("/")).text();
    expect(managerHome).toContain("Reviews");
    expect(managerHome).toMatch(/crossings approved · \d+ draft/);
    const adminHome = await (await admin.get("/")).text();
    expect(adminHome).toContain("API keys");
    const recent = await listText(admin, "list-recent");
    // The changes above are in the audit log: the list shows the latest as sentences with their time.
    expect(recent).toContain("<li");
    expect(recent).toMatch(/\d{4}-\d\d-\d\d \d\d:\d\d UTC/);
  });
});
