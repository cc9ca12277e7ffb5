// Issue 9: replacing a profile's data keeps its studies readable (they keep the data they ran on),
// circuits carry a time zone (pages show local times, the grid counts local clock time), and the
// chart zoom lives in the URL with the selected phase and month pressed.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { AuditEntry, LoadProfile, LoadProfileVersion } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;

// Hourly rows from `fromHour` (hours after 1 March 2025 UTC) for `hours` hours at `amps(i)`.
function hourly(fromHour: number, hours: number, amps: (i: number) => number, header = "Time,Amps"): string {
  const start = Date.UTC(2025, 2, 1) + fromHour * 3_600_000;
  return [header, ...Array.from({ length: hours }, (_, i) => `${new Date(start + i * 3_600_000).toISOString()},${amps(i)}`)].join("\n");
}

const send = (method: string, path: string, body: string, who = engineer) => fetch(`${baseUrl()}${path}`, { method, body, headers: { cookie: who.cookie, "content-type": "text/csv" } });

async function circuitWithCrossing(extra: Record<string, unknown> = {}) {
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Versions ${randomUUID().slice(0, 6)}`, voltageKv: 66, phases: 1, ...extra })).json();
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Versioned crossing", lat: 41.9, lon: -87.6, spanLength: { value: 400, unit: "m" }, kind: "river" })).json();
  return { circuit, crossing };
}

async function device() {
  const dev = await engineer.post("/devices/new", { name: `Versions device ${randomUUID().slice(0, 6)}`, minCurrentA: "40", maxCurrentA: "2000", harvestW: "0.1*I", loadW: "4" });
  return Number(dev.headers.get("location")!.split("/").pop());
}

/** The aria-pressed state of each button named `name` in a page, by its value. */
function pressed(page: string, name: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [tag] of page.matchAll(/<button[^>]*>/g)) {
    if (!tag.includes(`name="${name}"`)) continue;
    out[tag.match(/value="([^"]*)"/)![1]] = tag.match(/aria-pressed="([^"]*)"/)![1];
  }
  return out;
}

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
});
afterAll(async () => {
  await closeDb();
});

describe("PUT /api/v1/profiles/{id}: replace a profile's data", () => {
  it("replaces samples and quality report; a study run before keeps its data, figures and what-if", async () => {
    const { circuit, crossing } = await circuitWithCrossing();
    // 10 days at 100 A: always lit. The replacement is 30 A for 5 days: always below the 40 A minimum.
    const first = await send("POST", `/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=Replaced`, hourly(0, 240, () => 100));
    expect(first.status).toBe(201);
    const id = (await first.json()).profile.id;
    const deviceProfileId = await device();
    const study = await (await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId: id, deviceProfileId, schedule: { kind: "always" } })).json();
    expect(study.inputs.profile).toMatchObject({ version: 1 });
    expect(study.inputs.profile.fingerprint).toMatch(/^[0-9a-f]{64}$/);
    expect(study.results.lighting.darkHours).toBe(0);

    const res = await send("PUT", `/api/v1/profiles/${id}?timestampColumn=Time&currentColumn=Amps&file=corrected.csv`, hourly(0, 120, () => 30));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.keptForStudies).toBe(true);
    expect(body.profile).toMatchObject({ samples: 120, dataVersion: 2, sourceFile: "corrected.csv" });
    expect(body.profile.fingerprint).not.toBe(study.inputs.profile.fingerprint);
    const row = await LoadProfile.findByPk(id);
    expect(row!.samples).toBe(120);
    expect((row!.quality as { validSamples: number }).validSamples).toBe(120);
    const kept = await LoadProfileVersion.findOne({ where: { profileId: id, version: 1 } });
    expect(kept).toMatchObject({ samples: 240, supersededBy: "replaced", fingerprint: study.inputs.profile.fingerprint });
    expect(await AuditEntry.count({ where: { action: "profile.replaced", entityId: String(id) } })).toBe(1);

    // The old study: same figures, says the data changed, and a what-if without a change still
    // recomputes the saved figures (it runs on the kept version 1, not on the 30 A data).
    const old = await (await engineer.get(`/api/v1/studies/${study.id}`)).json();
    expect(old.results.period.knownHours).toBeCloseTo(239, 9);
    const whatIf = await (await engineer.json(`/api/v1/studies/${study.id}/what-if`, "POST", { loadScale: 1 })).json();
    expect(whatIf.summary.darkHours).toBe(0);
    expect(whatIf.summary).toEqual(whatIf.saved);
    const page = await (await engineer.get(`/studies/${study.id}`)).text();
    expect(page).toContain("has changed since (appended or replaced: data version 1 then, 2 now)");
    expect(page).toContain("this page still shows the data the study ran on");
    // The chart summary covers the study's 10 days (the kept data), not the 5 days of the new data.
    expect(page).toMatch(/2025-03-01 00:00 UTC to 2025-03-10 2\d:\d\d UTC: lowest and highest current/);

    // A new study runs on the new data.
    const fresh = await (await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId: id, deviceProfileId, schedule: { kind: "always" } })).json();
    expect(fresh.inputs.profile.version).toBe(2);
    expect(fresh.results.lighting.litHours).toBe(0);
  });

  it("keeps nothing when no study used the data; a bad file or a consultant changes nothing", async () => {
    const { circuit } = await circuitWithCrossing();
    const id = (await (await send("POST", `/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=Alone`, hourly(0, 24, () => 100))).json()).profile.id;
    const replaced = await send("PUT", `/api/v1/profiles/${id}?timestampColumn=Time&currentColumn=Amps`, hourly(0, 48, () => 90));
    expect((await replaced.json()).keptForStudies).toBe(false);
    expect(await LoadProfileVersion.count({ where: { profileId: id } })).toBe(0);
    const pdf = await send("PUT", `/api/v1/profiles/${id}?timestampColumn=Time&currentColumn=Amps`, "%PDF-1.4\n1 0 obj\n");
    expect(pdf.status).toBe(422);
    const noColumn = await send("PUT", `/api/v1/profiles/${id}?timestampColumn=Time&currentColumn=Nope`, hourly(0, 24, () => 1));
    expect(noColumn.status).toBe(422);
    const consultant = await signIn("consultant@example.com");
    expect((await send("PUT", `/api/v1/profiles/${id}?timestampColumn=Time&currentColumn=Amps`, hourly(0, 24, () => 1), consultant)).status).toBe(403);
    const row = await LoadProfile.findByPk(id);
    expect(row).toMatchObject({ samples: 48, dataVersion: 2 });
  });
});

describe("time zones", () => {
  it("a circuit's zone is checked, shown on its pages with UTC on hover, and counted by the study's grid", async () => {
    const bad = await engineer.json("/api/v1/circuits", "POST", { name: `Zone ${randomUUID().slice(0, 6)}`, voltageKv: 66, phases: 1, timeZone: "Mars/Olympus" });
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors).toEqual([expect.objectContaining({ path: "timeZone", message: expect.stringContaining("IANA time zone") })]);
    const form = await engineer.post("/circuits/new", { name: `Zone form ${randomUUID().slice(0, 6)}`, voltageKv: "66", phases: "1", timeZone: "Nowhere/Town" });
    expect(form.status).toBe(400);
    expect(await form.text()).toContain("Not a known IANA time zone");

    const { circuit, crossing } = await circuitWithCrossing({ timeZone: "America/Chicago" });
    expect(circuit.timeZone).toBe("America/Chicago");
    const id = (await (await send("POST", `/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=Chicago`, hourly(0, 240, (i) => (i % 24 === 12 ? 10 : 100)))).json()).profile.id;
    const profilePage = await (await engineer.get(`/profiles/${id}`)).text();
    // 1 March 2025 00:00 UTC is 28 February 18:00 in Chicago (UTC−6 before 9 March).
    expect(profilePage).toContain('<time dateTime="2025-03-01T00:00:00.000Z" title="2025-03-01 00:00 UTC" class="figure">2025-02-28 18:00 UTC−6</time>');
    expect(profilePage).toContain("Times in <!-- -->America/Chicago");

    const deviceProfileId = await device();
    const study = await (await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId: id, deviceProfileId, schedule: { kind: "always" } })).json();
    expect(study.inputs.params.timeZone).toBe("America/Chicago");
    const grid = study.results.hourMonthBelowMin;
    expect(grid.timeBasis).toContain("America/Chicago");
    // Below the minimum at 12:00 UTC every day: 06:00 in Chicago until 9 March, 07:00 after.
    expect(grid.share[6][2]).toBeGreaterThan(0);
    expect(grid.share[7][1] ?? 0).toBe(0);
    expect(grid.share[12][2] ?? 0).toBe(0);
  });

  it("the admin sets the organisation's zone with a clear message for a bad one", async () => {
    const admin = await signIn("admin@example.com");
    const bad = await admin.post("/admin/policy", { intent: "timeZone", timeZone: "Europe/Atlantis" });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain("Not a known IANA time zone");
    const ok = await admin.post("/admin/policy", { intent: "timeZone", timeZone: "UTC" });
    expect(ok.status).toBe(200);
    expect(await ok.text()).toContain("Time zone set to UTC");
  });
});

describe("zoom in the URL", () => {
  it("presses the phase and month on show and keeps the zoom through a phase switch", async () => {
    const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Zoom ${randomUUID().slice(0, 6)}`, voltageKv: 66, phases: 3, timeZone: "Europe/Berlin" })).json();
    const csv = ["Time,IL1,IL2,IL3", ...Array.from({ length: 24 * 45 }, (_, i) => `${new Date(Date.UTC(2025, 2, 1) + i * 3_600_000).toISOString()},${100 + (i % 5)},${200},${300}`)].join("\n");
    const id = (await (await send("POST", `/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&phaseA=IL1&phaseB=IL2&phaseC=IL3&name=Zoomed`, csv)).json()).profile.id;
    const page = await (await engineer.get(`/profiles/${id}?phase=B&month=2025-03`)).text();
    expect(pressed(page, "phase")).toEqual({ A: "false", B: "true", C: "false", min: "false" });
    expect(pressed(page, "month")).toEqual({ "2025-03": "true", "2025-04": "false" });
    // The phase buttons carry the month, so switching phase keeps the zoom.
    expect(page).toContain('<input type="hidden" name="month" value="2025-03"/>');
    // A week of local dates: 2 to 8 March in Berlin, 168 h, bucketed at 0.28 h.
    const week = await (await engineer.get(`/profiles/${id}?phase=C&from=2025-03-02&to=2025-03-08`)).text();
    expect(week).toContain("from 2025-03-02 00:00 UTC+1 to 2025-03-09 00:00 UTC+1");
    expect(pressed(week, "phase").C).toBe("true");
    expect(Object.values(pressed(week, "month"))).toEqual(["false", "false"]);
    expect(week).toContain('<input type="hidden" name="from" value="2025-03-02"/>');
  });
});
