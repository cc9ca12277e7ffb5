import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { Study } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { CSV_COLUMNS } from "../../shared/portfolio";

let engineer: Client;
let crossingId: number;
let profileId: number;
let deviceProfileId: number;

const DEVICE = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 0, chargeEfficiency: 0.9 };

// Two days of 5-minute samples: 100 A for the first day, 10 A for the second.
function twoDays(): [string, number][] {
  const out: [string, number][] = [];
  const start = Date.UTC(2025, 5, 1);
  for (let i = 0; i < 576; i++) out.push([new Date(start + i * 300_000).toISOString(), i < 288 ? 100 : 10]);
  return out;
}

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Study test ${randomUUID().slice(0, 6)}`, voltageKv: 115, phases: 1 })).json();
  const crossing = await (
    await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Test crossing", lat: 40, lon: -100, spanLength: { value: 900, unit: "ft" }, kind: "river" })
  ).json();
  crossingId = crossing.id;
  const csv = ["Time,Amps", ...twoDays().map(([t, a]) => `${t},${a}`)].join("\n");
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps`, {
    method: "POST",
    body: csv,
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  profileId = (await up.json()).profile.id;
  const devices = await engineer.post("/devices/new", { name: `Test device ${randomUUID().slice(0, 6)}`, ...Object.fromEntries(Object.entries(DEVICE).map(([k, v]) => [k, String(v)])) });
  expect(devices.status).toBe(302);
  deviceProfileId = Number(devices.headers.get("location")!.split("/").pop());
});
afterAll(async () => {
  await closeDb();
});

describe("POST /api/v1/feasibility (stateless)", () => {
  const base = { location: { lat: 40, lon: -100 }, device: DEVICE, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } };

  it("computes hours at or above the minimum with the exact linear crossing", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...base, samples: twoDays() });
    expect(res.status).toBe(200);
    const r = await res.json();
    // Worked by hand: 287 intervals of 5 min at 100 A, then the 100 → 10 A interval is at or
    // above 40 A for (100 − 40) / (100 − 10) × 5 min = 3.33 min; the rest is at 10 A.
    const above = (287 * 5 + (60 / 90) * 5) / 60;
    const known = (575 * 5) / 60;
    expect(r.period.knownHours).toBeCloseTo(known, 6);
    expect(r.current.hoursAtOrAboveMin).toBeCloseTo(above, 3);
    // No storage, and harvest ≥ load wherever I ≥ 40 A: lit exactly then.
    expect(r.lighting.litHours).toBeCloseTo(above, 3);
    expect(r.lighting.darkHours).toBeCloseTo(known - above, 3);
    expect(r.lighting.longestDarkStretchHours).toBeCloseTo(known - above, 3);
    expect(r.verdict.status).toBe("no-go");
    expect(r.quality.validSamples).toBe(576);
  });

  it("gives the same answer from CSV text", async () => {
    const csv = ["Time;Amps", ...twoDays().map(([t, a]) => `${t};${a}`)].join("\n");
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...base, csv, csvOptions: { timestampColumn: "Time", currentColumn: "Amps" } });
    expect(res.status).toBe(200);
    const r = await res.json();
    expect(r.current.hoursAtOrAboveMin).toBeCloseTo((287 * 5 + (60 / 90) * 5) / 60, 3);
  });

  it("names each bad field", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { location: { lat: 95 }, device: { minCurrentA: 40 } });
    expect(res.status).toBe(400);
    const body = await res.json();
    const paths = body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["location.lat", "location.lon", "device.harvestW", "device.loadW"]));
  });

  it("rejects an invalid harvest expression with 422 naming the problem", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...base, samples: twoDays(), device: { ...DEVICE, harvestW: "0.004 * X^2" } });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.errors[0].path).toBe("device.harvestW");
    expect(body.detail).toContain('"X"');
  });

  it("refuses a signed-out caller and malformed JSON", async () => {
    const anon = await fetch(`${baseUrl()}/api/v1/feasibility`, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
    expect(anon.status).toBe(401);
    const bad = await fetch(`${baseUrl()}/api/v1/feasibility`, { method: "POST", headers: { cookie: engineer.cookie, "content-type": "application/json" }, body: "{not json" });
    expect(bad.status).toBe(400);
    expect((await bad.json()).title).toBe("Malformed JSON");
  });
});

describe("saved studies", () => {
  it("runs through the page action, saves inputs and results, and shows the results page with the caution", async () => {
    const res = await engineer.post(`/crossings/${crossingId}/studies/new`, {
      profileId: String(profileId),
      deviceProfileId: String(deviceProfileId),
      scheduleKind: "always",
      phase: "A",
      interpolation: "linear",
      loadScale: "1",
    });
    expect(res.status).toBe(302);
    const studyId = Number(res.headers.get("location")!.split("/").pop());
    const row = await Study.findByPk(studyId);
    expect(row!.crossingId).toBe(crossingId);
    expect(row!.verdict).toBe("insufficient-data"); // 48 h of data is far below 8,000 known hours
    expect(row!.knownHours).toBeCloseTo((575 * 5) / 60, 6);
    expect((row!.results as { lighting: { darkHours: number } }).lighting.darkHours).toBeCloseTo(row!.darkHours, 9);
    const page = await engineer.get(`/studies/${studyId}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Planning aid only.");
    expect(html).toContain("Insufficient data");
    expect(html).toContain("Load-duration curve");

    // The page is kept until the organisation's next audited change: a renamed crossing shows at once.
    const renamed = `Renamed crossing ${randomUUID().slice(0, 6)}`;
    const edit = await engineer.post(`/crossings/${crossingId}/edit`, { name: renamed, lat: "40", lon: "-100", spanLengthValue: "900", spanLengthUnit: "ft", kind: "river" });
    expect(edit.status).toBe(302);
    const again = await (await engineer.get(`/studies/${studyId}`)).text();
    expect(again).toContain(renamed);
    expect(html).not.toContain(renamed);
    // And back, for the tests below.
    expect((await engineer.post(`/crossings/${crossingId}/edit`, { name: "Test crossing", lat: "40", lon: "-100", spanLengthValue: "900", spanLengthUnit: "ft", kind: "river" })).status).toBe(302);
    expect(await (await engineer.get(`/studies/${studyId}`)).text()).not.toContain(renamed);
  });

  it("shows the field error when the form is incomplete", async () => {
    const res = await engineer.post(`/crossings/${crossingId}/studies/new`, { profileId: "", deviceProfileId: String(deviceProfileId), scheduleKind: "night", loadScale: "-1" });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain("Choose a load profile.");
    expect(html).toContain("Load scale factor must be above zero.");
  });

  it("runs through the API, reads back, and recomputes a what-if without saving", async () => {
    const before = await Study.count();
    const res = await engineer.json("/api/v1/studies", "POST", { crossingId, profileId, deviceProfileId, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } });
    expect(res.status).toBe(201);
    const study = await res.json();
    expect(study.results.verdict.status).toBe("no-go");
    // At 10 A the harvest (0.4 W) cannot carry the 4 W load whatever the minimum current,
    // so only storage helps: 4 W through the dark 23.94 h ≈ 95.8 Wh (worked by hand).
    expect(study.results.solvers.maxMinCurrent.reachable).toBe(false);
    expect(study.results.solvers.minStorage.reachable).toBe(true);
    expect(study.results.solvers.minStorage.value).toBeGreaterThan(94);
    expect(study.results.solvers.minStorage.value).toBeLessThan(99);
    expect(await Study.count()).toBe(before + 1);
    const read = await (await engineer.get(`/api/v1/studies/${study.id}`)).json();
    expect(read.results.lighting.darkHours).toBeCloseTo(study.results.lighting.darkHours, 9);

    // What-if 200 Wh of storage: full at the start, it carries the whole 10 A day.
    const wi = await engineer.json(`/api/v1/studies/${study.id}/what-if`, "POST", { storageWh: 200 });
    expect(wi.status).toBe(200);
    const w = await wi.json();
    expect(w.saved.darkHours).toBeGreaterThan(23);
    expect(w.summary.darkHours).toBeCloseTo(0, 6);
    expect(w.summary.verdict).toBe("go");
    expect(await Study.count()).toBe(before + 1);

    const bad = await engineer.json(`/api/v1/studies/${study.id}/what-if`, "POST", { minCurrentA: 5000 });
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].path).toBe("minCurrentA");
  });

  it("says when the device profile changed since the run, and re-runs on request keeping the old run", async () => {
    const created = await (await engineer.json("/api/v1/studies", "POST", { crossingId, profileId, deviceProfileId, schedule: { kind: "always" } })).json();
    const fresh = await (await engineer.get(`/studies/${created.id}`)).text();
    expect(fresh).not.toContain("Inputs changed.");

    const edit = await engineer.post(`/devices/${deviceProfileId}`, {
      intent: "save",
      name: `Edited device ${randomUUID().slice(0, 6)}`,
      ...Object.fromEntries(Object.entries({ ...DEVICE, storageWh: 200 }).map(([k, v]) => [k, String(v)])),
    });
    expect(edit.status).toBe(200);
    const stale = await (await engineer.get(`/studies/${created.id}`)).text();
    expect(stale).toContain("Inputs changed.");
    expect(stale).toContain("has been edited since");

    const rerun = await engineer.post(`/studies/${created.id}`, {});
    expect(rerun.status).toBe(302);
    const newId = Number(rerun.headers.get("location")!.split("/").pop());
    expect(newId).toBeGreaterThan(created.id);
    const again = await (await engineer.get(`/api/v1/studies/${newId}`)).json();
    expect(again.inputs.device.storageWh).toBe(200);
    expect(again.results.lighting.darkHours).toBeCloseTo(0, 6);
    const old = await (await engineer.get(`/api/v1/studies/${created.id}`)).json();
    expect(old.inputs.device.storageWh).toBe(0);
    expect(old.results.lighting.darkHours).toBeGreaterThan(23);
  });

  it("lists the study in the portfolio (JSON and CSV)", async () => {
    const p = await (await engineer.get("/api/v1/portfolio")).json();
    const row = p.rows.find((r: { crossingId: number }) => r.crossingId === crossingId);
    const latest = await Study.findOne({ where: { crossingId }, order: [["id", "DESC"]] });
    expect(row.studyId).toBe(latest!.id);
    expect(row.verdict).toBe(latest!.verdict);
    expect(p.counts[latest!.verdict]).toBeGreaterThanOrEqual(1);
    const csv = await (await engineer.get("/portfolio.csv")).text();
    expect(csv.split("\r\n")[0]).toBe(CSV_COLUMNS.join(","));
    expect(csv).toContain("Test crossing");
  });
});

describe("a study whose load profile is deleted", () => {
  it("keeps its saved results readable and says it cannot be recomputed", async () => {
    const crossing = await (await engineer.get(`/api/v1/crossings/${crossingId}`)).json();
    const csv = ["Time,Amps", ...twoDays().map(([t, a]) => `${t},${a}`)].join("\n");
    const up = await fetch(`${baseUrl()}/api/v1/circuits/${crossing.circuitId}/profiles?timestampColumn=Time&currentColumn=Amps&name=Short-lived`, {
      method: "POST",
      body: csv,
      headers: { cookie: engineer.cookie, "content-type": "text/csv" },
    });
    const shortLived = (await up.json()).profile.id;
    const study = await (await engineer.json("/api/v1/studies", "POST", { crossingId, profileId: shortLived, deviceProfileId, schedule: { kind: "always" } })).json();
    const del = await fetch(`${baseUrl()}/api/v1/profiles/${shortLived}`, { method: "DELETE", headers: { cookie: engineer.cookie } });
    expect(del.status).toBe(204);

    const page = await engineer.get(`/studies/${study.id}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("its load profile has been deleted");
    expect(html).toContain("the current chart is not available");
    const read = await (await engineer.get(`/api/v1/studies/${study.id}`)).json();
    expect(read.profileId).toBeNull();
    expect(read.results.lighting.darkHours).toBeCloseTo(study.results.lighting.darkHours, 9);
    const wi = await engineer.json(`/api/v1/studies/${study.id}/what-if`, "POST", { storageWh: 10 });
    expect(wi.status).toBe(409);
  });
});

describe("OpenAPI document", () => {
  it("is generated from the request schemas", async () => {
    const res = await fetch(`${baseUrl()}/api/v1/openapi.json`);
    expect(res.status).toBe(200);
    const doc = await res.json();
    expect(doc.openapi).toBe("3.1.0");
    expect(Object.keys(doc.paths)).toEqual(expect.arrayContaining(["/feasibility", "/circuits", "/circuits/{circuitId}/profiles", "/studies", "/markers/layout"]));
    const req = doc.components.schemas.FeasibilityRequest;
    expect(req.required).toEqual(expect.arrayContaining(["location", "device"]));
    expect(req.properties.device.properties.harvestW.type).toBe("string");
  });
});
