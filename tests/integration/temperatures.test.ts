// Temperatures for cold-weather storage over HTTP (issue 13): a crossing's monthly normals (page,
// audit, nothing saved when refused) used by its studies; a load CSV's temperature column kept
// with the profile and used by studies and by /api/v1/feasibility; switched-out lines on the
// optimiser page checked against the profile's data.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { AuditEntry, Crossing, Job, Study, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let circuitId: number;
let crossingId: number;
let deviceId: number;
let studyId: number;
const NORMALS = [-12, -9, -2, 6, 13, 18, 21, 20, 14, 7, 0, -8];
// Invented: 40 days from 1 January 2025, hourly, 80 A in the day and 30 A at night, with the air
// at −15 °C every hour of January and +2 °C in February (monthly means −15 and 2 by construction).
const CSV = [
  "Timestamp,I [A],Air [F]",
  ...Array.from({ length: 40 * 24 }, (_, h) => {
    const t = new Date(Date.UTC(2025, 0, 1) + h * 3600_000);
    const celsius = t.getUTCMonth() === 0 ? -15 : 2;
    return `${t.toISOString()},${t.getUTCHours() >= 6 && t.getUTCHours() < 18 ? 80 : 30},${(celsius * 9) / 5 + 32}`;
  }),
].join("\n");
const MAPPING = `timestampColumn=Timestamp&currentColumn=${encodeURIComponent("I [A]")}&temperatureColumn=${encodeURIComponent("Air [F]")}&temperatureUnit=F`;
const device = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, storageWh: 60, coldDerating: [{ tempC: -20, usableFraction: 0.5 }, { tempC: 20, usableFraction: 1 }] };

beforeAll(async () => {
  testDb();
  const demo = (await User.findOne({ where: { email: "engineer@example.com" } }))!;
  const email = `temperatures-${randomUUID().slice(0, 8)}@example.com`;
  await User.create({ organisationId: demo.organisationId, email, name: "Temperature test engineer", role: "engineer", passwordHash: await hashPassword("temperature-test-pass-1"), active: true });
  engineer = await signIn(email, "temperature-test-pass-1");
  circuitId = (await (await engineer.json("/api/v1/circuits", "POST", { name: `Temperatures ${randomUUID().slice(0, 6)}`, voltageKv: 69, phases: 1 })).json()).id;
  crossingId = (await (await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: "Cold crossing", lat: 47, lon: -93, spanLength: { value: 600, unit: "ft" }, kind: "river" })).json()).id;
  const made = await engineer.json("/api/v1/devices", "POST", { name: `Cold device ${randomUUID().slice(0, 6)}`, ...device });
  expect(made.status, await made.clone().text()).toBe(201);
  deviceId = (await made.json()).id;
});
afterAll(async () => {
  await closeDb();
});

describe("a crossing's monthly normal temperatures", () => {
  it("eleven values are refused naming the field, and nothing is saved or audited", async () => {
    const audits = await AuditEntry.count({ where: { entity: "crossing", entityId: String(crossingId) } });
    const res = await engineer.post(`/crossings/${crossingId}/temperatures`, { monthlyC: NORMALS.slice(0, 11).join(" "), source: "Invented station" });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('id="monthlyC-error"');
    expect((await Crossing.findByPk(crossingId))!.temperatureNormals).toBeNull();
    expect(await AuditEntry.count({ where: { entity: "crossing", entityId: String(crossingId) } })).toBe(audits);
  });

  it("saved on the crossing page with their source, audited, and shown", async () => {
    const res = await engineer.post(`/crossings/${crossingId}/temperatures`, { monthlyC: NORMALS.join(", "), source: "Invented station, 1991–2020" });
    expect(res.status, await res.clone().text()).toBe(302);
    expect((await Crossing.findByPk(crossingId))!.temperatureNormals).toEqual({ monthlyC: NORMALS, source: "Invented station, 1991–2020" });
    const entry = await AuditEntry.findOne({ where: { action: "crossing.temperature-normals-updated", entityId: String(crossingId) }, order: [["id", "DESC"]] });
    expect(entry!.detail).toMatchObject({ monthlyC: NORMALS, source: "Invented station, 1991–2020" });
    const html = await (await engineer.get(`/crossings/${crossingId}`)).text();
    expect(html).toContain("Monthly normal temperatures");
    expect(html).toContain("Source: Invented station, 1991–2020");
  });
});

describe("a load CSV's temperature column", () => {
  let profileId: number;

  it("keeps the monthly means with the profile (°F read and stored as °C)", async () => {
    const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?${MAPPING}`, { method: "POST", body: CSV, headers: { cookie: engineer.cookie, "content-type": "text/csv" } });
    expect(up.status, await up.clone().text()).toBe(201);
    const profile = (await up.json()).profile;
    profileId = profile.id;
    // 31 × 24 readings in January at −15 °C; 9 × 24 in February at 2 °C.
    expect(profile.temperature).toEqual({ column: "Air [F]", unit: "F", months: { "2025-01": { meanC: -15, readings: 744 }, "2025-02": { meanC: 2, readings: 216 } } });
  });

  it("a study uses the recorded months, and the crossing's normals where nothing was recorded", async () => {
    const res = await engineer.json("/api/v1/studies", "POST", { crossingId, profileId, deviceProfileId: deviceId, schedule: { kind: "always" }, params: {} });
    expect(res.status, await res.clone().text()).toBe(201);
    const study = (await Study.findByPk((await res.json()).id))!;
    const inputs = study.inputs as { params: { monthlyTemperatureC?: number[]; recordedTemperatureC?: Record<string, number> } };
    expect(inputs.params.monthlyTemperatureC).toEqual(NORMALS); // the crossing's, not typed in the request
    expect(inputs.params.recordedTemperatureC).toEqual({ "2025-01": -15, "2025-02": 2 });
    const byMonth = (study.results as { coldCost: { byMonth: { month: string; temperatureC: number }[] } }).coldCost.byMonth;
    expect(byMonth.map((m) => [m.month, m.temperatureC])).toEqual([["2025-01", -15], ["2025-02", 2]]);
    studyId = study.id;
  });

  it("a study that took the crossing's normals says so when they change; one given its own temperatures does not", async () => {
    const own = await engineer.json("/api/v1/studies", "POST", { crossingId, profileId, deviceProfileId: deviceId, schedule: { kind: "always" }, params: { monthlyTemperatureC: NORMALS } });
    expect(own.status, await own.clone().text()).toBe(201);
    const ownId = (await own.json()).id;
    const changed = "monthly normal temperatures have changed since";
    const page = async (id: number) => (await engineer.get(`/studies/${id}`)).text();
    expect(await page(studyId)).not.toContain(changed);
    const warmer = NORMALS.map((t) => t + 1);
    const saved = await engineer.post(`/crossings/${crossingId}/temperatures`, { monthlyC: warmer.join(" "), source: "Invented station, revised" });
    expect(saved.status).toBe(302);
    try {
      expect(await page(studyId)).toContain(changed);
      expect(await page(ownId)).not.toContain(changed);
    } finally {
      await engineer.post(`/crossings/${crossingId}/temperatures`, { monthlyC: NORMALS.join(", "), source: "Invented station, 1991–2020" });
    }
    expect(await page(studyId)).not.toContain(changed);
  });

  it("POST /api/v1/feasibility reads the column from csvOptions and derates at the recorded means", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", {
      csv: CSV,
      csvOptions: { timestampColumn: "Timestamp", currentColumn: "I [A]", temperatureColumn: "Air [F]", temperatureUnit: "F" },
      location: { lat: 47, lon: -93 },
      schedule: { kind: "always" },
      device,
      monthlyTemperatureC: NORMALS,
      policy: { minKnownHours: 100 },
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = await res.json();
    expect(body.coldCost.byMonth.map((m: { temperatureC: number }) => m.temperatureC)).toEqual([-15, 2]);
  });

  it("the optimiser page refuses a switched-out line outside the profile's data, naming the line, and starts no job", async () => {
    const before = await Job.count({ where: { kind: "optimise.crossing" } });
    const res = await engineer.post(`/crossings/${crossingId}/optimise`, {
      profileId: String(profileId),
      [`use-${deviceId}`]: "on",
      [`unitCost-${deviceId}`]: "900",
      storageSizesWh: "0 20 80",
      storageCostPerWh: "1",
      storageLifeYears: "8",
      switchedOut: "Inside, 2025-01-10, 2025-01-12\nLast year, 2024-03-01, 2024-03-05",
    });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain("Switched-out line 2 (&quot;Last year&quot;) lies outside the data of load profile");
    expect(await Job.count({ where: { kind: "optimise.crossing" } })).toBe(before);
  });
});
