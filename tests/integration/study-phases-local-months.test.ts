// Issue 9 leftovers: the study form offers only the load profile's phases and the server refuses
// another before running; the profile page counts coverage by the circuit's local months.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { Study } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { formatPercent } from "../../shared/format";

let engineer: Client;

const send = (path: string, body: string) => fetch(`${baseUrl()}${path}`, { method: "POST", body, headers: { cookie: engineer.cookie, "content-type": "text/csv" } });

/** Hourly rows from `startIso`, `hours` of them, leaving out the hours `skip` holds. */
function hourly(startIso: string, hours: number, header: string, row: (i: number) => string, skip: (i: number) => boolean = () => false): string {
  const start = Date.parse(startIso);
  const rows = Array.from({ length: hours }, (_, i) => i).filter((i) => !skip(i));
  return [header, ...rows.map((i) => `${new Date(start + i * 3_600_000).toISOString()},${row(i)}`)].join("\n");
}

async function circuitWithCrossing(extra: Record<string, unknown>) {
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Leftovers ${randomUUID().slice(0, 6)}`, voltageKv: 66, ...extra })).json();
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Leftover crossing", lat: 52.5, lon: 13.4, spanLength: { value: 400, unit: "m" }, kind: "river" })).json();
  return { circuit, crossing };
}

/** The option values of the study form's phase select. */
function phaseOptions(page: string): string[] {
  const select = page.match(/<select[^>]*id="paramsPhase"[^>]*>([\s\S]*?)<\/select>/)![1];
  return [...select.matchAll(/<option[^>]*value="([^"]*)"/g)].map((m) => m[1]);
}

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
});
afterAll(async () => {
  await closeDb();
});

describe("study phases", () => {
  it("a single-phase profile offers only its phase, and B is refused with a 422 naming the phase before anything runs", async () => {
    const { circuit, crossing } = await circuitWithCrossing({ phases: 1 });
    const upload = await send(`/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=One%20phase`, hourly("2025-03-01T00:00:00Z", 72, "Time,Amps", () => "100"));
    expect(upload.status).toBe(201);
    const profileId = (await upload.json()).profile.id;
    const dev = await engineer.post("/devices/new", { name: `Leftover device ${randomUUID().slice(0, 6)}`, minCurrentA: "40", maxCurrentA: "2000", harvestW: "0.1*I", loadW: "4" });
    const deviceProfileId = Number(dev.headers.get("location")!.split("/").pop());

    const form = await (await engineer.get(`/crossings/${crossing.id}/studies/new`)).text();
    expect(phaseOptions(form)).toEqual(["A"]);

    const before = await Study.count({ where: { crossingId: crossing.id } });
    const api = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId, deviceProfileId, schedule: { kind: "always" }, params: { phase: "B" } });
    expect(api.status).toBe(422);
    const problem = await api.json();
    expect(problem.errors).toEqual([expect.objectContaining({ path: "params.phase", message: "Phase B is not in this load profile; it has A." })]);

    const page = await engineer.post(`/crossings/${crossing.id}/studies/new`, { profileId: String(profileId), deviceProfileId: String(deviceProfileId), scheduleKind: "always", phase: "C", interpolation: "linear", loadScale: "1" });
    expect(page.status).toBe(400);
    expect(await page.text()).toContain("Phase C is not in this load profile; it has A.");
    expect(await Study.count({ where: { crossingId: crossing.id } })).toBe(before);

    // Its own phase runs.
    const ok = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId, deviceProfileId, schedule: { kind: "always" }, params: { phase: "A" } });
    expect(ok.status).toBe(201);
  });

  it("a three-phase profile offers A, B, C and the lowest of them", async () => {
    const { circuit, crossing } = await circuitWithCrossing({ phases: 3 });
    const csv = hourly("2025-03-01T00:00:00Z", 48, "Time,I_L1,I_L2,I_L3", () => "100,110,120");
    const upload = await send(`/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&phaseA=I_L1&phaseB=I_L2&phaseC=I_L3&name=Three`, csv);
    expect(upload.status).toBe(201);
    expect(phaseOptions(await (await engineer.get(`/crossings/${crossing.id}/studies/new`)).text())).toEqual(["A", "B", "C", "min"]);
  });
});

describe("study period dates", () => {
  it("are days of the circuit's calendar: 2 March in Berlin begins at 23:00 UTC on 1 March", async () => {
    const { circuit, crossing } = await circuitWithCrossing({ phases: 1, timeZone: "Europe/Berlin" });
    const upload = await send(`/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=Berlin%20period`, hourly("2025-03-01T00:00:00Z", 24 * 6, "Time,Amps", () => "100"));
    const profileId = (await upload.json()).profile.id;
    const dev = await engineer.post("/devices/new", { name: `Period device ${randomUUID().slice(0, 6)}`, minCurrentA: "40", maxCurrentA: "2000", harvestW: "0.1*I", loadW: "4" });
    const deviceProfileId = String(dev.headers.get("location")!.split("/").pop());
    const page = await (await engineer.get(`/crossings/${crossing.id}/studies/new`)).text();
    expect(page).toContain("Period from (date in Europe/Berlin)");
    const res = await engineer.post(`/crossings/${crossing.id}/studies/new`, { profileId: String(profileId), deviceProfileId, scheduleKind: "always", phase: "A", periodStart: "2025-03-02", periodEnd: "2025-03-04" });
    expect(res.status).toBe(302);
    const study = await Study.findByPk(Number(res.headers.get("location")!.split("/").pop()));
    const params = (study!.inputs as { params: { periodStart: string; periodEnd: string } }).params;
    expect([params.periodStart, params.periodEnd]).toEqual(["2025-03-01T23:00:00.000Z", "2025-03-03T23:00:00.000Z"]);
  });
});

describe("coverage by month on the profile page", () => {
  it("counts the circuit's local months (Berlin) while the stored report keeps UTC months", async () => {
    const { circuit } = await circuitWithCrossing({ phases: 1, timeZone: "Europe/Berlin" });
    // 31 Jan 2025 12:00 UTC → 1 Feb 12:00 UTC hourly, 20:00–22:00 UTC missing: a 4 h hole (unknown).
    const csv = hourly("2025-01-31T12:00:00Z", 25, "Time,Amps", () => "100", (i) => i >= 8 && i <= 10);
    const upload = await send(`/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps&name=Berlin%20months`, csv);
    expect(upload.status).toBe(201);
    const profileId = (await upload.json()).profile.id;

    // Stored (UTC months), by hand: January 12:00–24:00 UTC holds 8 known hours of 12.
    const stored = (await (await engineer.get(`/api/v1/profiles/${profileId}/quality`)).json()).quality.monthlyCoverage;
    expect(stored.map((m: { month: string }) => m.month)).toEqual(["2025-01", "2025-02"]);
    expect(stored[0].coverage).toBeCloseTo(8 / 12, 12);

    // The page, by hand: Berlin's February begins 31 Jan 23:00 UTC, so January is 11 h with 7 known.
    const page = await (await engineer.get(`/profiles/${profileId}`)).text();
    expect(page).toContain(`Months of the circuit&#x27;s calendar (Europe/Berlin): 2025-01: ${formatPercent(7 / 11, 1)}; 2025-02: ${formatPercent(1, 1)}`);
  });
});
