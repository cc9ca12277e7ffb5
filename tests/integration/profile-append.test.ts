// Appending a newer export to a load profile (issue 9): the newer upload wins over its time span,
// the quality report is rebuilt, studies keep their results and say the profile changed.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { LoadProfile } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let circuitId: number;

// Hourly rows from `fromHour` (hours after 1 March 2025 UTC) for `hours` hours at `amps`.
function hourly(fromHour: number, hours: number, amps: number): string {
  const start = Date.UTC(2025, 2, 1) + fromHour * 3_600_000;
  return ["Time,Amps", ...Array.from({ length: hours }, (_, i) => `${new Date(start + i * 3_600_000).toISOString()},${amps}`)].join("\n");
}

const post = (path: string, body: string) => fetch(`${baseUrl()}${path}`, { method: "POST", body, headers: { cookie: engineer.cookie, "content-type": "text/csv" } });

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  circuitId = (await (await engineer.json("/api/v1/circuits", "POST", { name: `Append ${randomUUID().slice(0, 6)}`, voltageKv: 66, phases: 1 })).json()).id;
});
afterAll(async () => {
  await closeDb();
});

describe("POST /api/v1/profiles/{id}/append", () => {
  it("grows a profile month by month; the newer upload wins where it overlaps", async () => {
    // 10 days at 100 A, then a newer export from day 8 to day 20 at 200 A.
    const first = await post(`/api/v1/circuits/${circuitId}/profiles?timestampColumn=Time&currentColumn=Amps&name=Growing`, hourly(0, 240, 100));
    expect(first.status).toBe(201);
    const id = (await first.json()).profile.id;
    const crossing = await (await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: "Append crossing", lat: 50, lon: 7, spanLength: { value: 400, unit: "m" }, kind: "river" })).json();
    const dev = await engineer.post("/devices/new", { name: `Append device ${randomUUID().slice(0, 6)}`, minCurrentA: "40", maxCurrentA: "2000", harvestW: "0.1*I", loadW: "4" });
    const deviceProfileId = Number(dev.headers.get("location")!.split("/").pop());
    const study = await (await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId: id, deviceProfileId, schedule: { kind: "always" } })).json();

    const res = await post(`/api/v1/profiles/${id}/append?timestampColumn=Time&currentColumn=Amps&file=march-b.csv`, hourly(192, 288, 200));
    expect(res.status).toBe(200);
    const body = await res.json();
    // Stored hours 192–239 (48 samples) lie in the new span and are replaced; 192 + 288 remain.
    expect(body).toMatchObject({ added: 288, replaced: 48 });
    const row = await LoadProfile.findByPk(id);
    expect(row!.samples).toBe(480);
    expect(row!.endAt.toISOString()).toBe(new Date(Date.UTC(2025, 2, 1) + 479 * 3_600_000).toISOString());
    const quality = row!.quality as { validSamples: number; rowsRead: number; coverage: number; warnings: string[] };
    expect(quality.validSamples).toBe(480);
    expect(quality.rowsRead).toBe(240 + 288);
    expect(quality.coverage).toBeCloseTo(1, 9);
    expect(quality.warnings.at(-1)).toContain("48 stored samples in that span were replaced (the newer upload wins)");

    // A study of the profile: 100 A until hour 192, then 200 A (the newer values).
    const after = await (await engineer.json("/api/v1/feasibility", "POST", {
      csv: hourly(0, 192, 100) + "\n" + hourly(192, 288, 200).split("\n").slice(1).join("\n"),
      csvOptions: { timestampColumn: "Time", currentColumn: "Amps" },
      location: { lat: 50, lon: 7 },
      device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "0.1*I", loadW: 4 },
      schedule: { kind: "always" },
    })).json();
    const rerun = await (await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId: id, deviceProfileId, schedule: { kind: "always" } })).json();
    expect(rerun.results.current.exceeded).toEqual(after.current.exceeded);
    expect(rerun.results.period.knownHours).toBeCloseTo(479, 9);

    // The earlier study keeps its figures and says the profile changed.
    const old = await (await engineer.get(`/api/v1/studies/${study.id}`)).json();
    expect(old.results.period.knownHours).toBeCloseTo(239, 9);
    const page = await (await engineer.get(`/studies/${study.id}`)).text();
    expect(page).toContain("has changed since (appended or replaced: data version 1 then, 2 now)");
  });

  it("refuses other phases, a bad file and a consultant, and changes nothing", async () => {
    const first = await post(`/api/v1/circuits/${circuitId}/profiles?timestampColumn=Time&currentColumn=Amps&name=Fixed`, hourly(0, 24, 100));
    const id = (await first.json()).profile.id;
    const three = ["Time,IA,IB,IC", `2025-03-02T00:00:00Z,1,2,3`, `2025-03-02T01:00:00Z,1,2,3`].join("\n");
    const phases = await post(`/api/v1/profiles/${id}/append?timestampColumn=Time&phaseA=IA&phaseB=IB&phaseC=IC`, three);
    expect(phases.status).toBe(422);
    expect((await phases.json()).detail).toContain("Map the same phases to append");
    const pdf = await post(`/api/v1/profiles/${id}/append?timestampColumn=Time&currentColumn=Amps`, "%PDF-1.4\n1 0 obj\n");
    expect(pdf.status).toBe(422);
    const consultant = await signIn("consultant@example.com");
    const denied = await fetch(`${baseUrl()}/api/v1/profiles/${id}/append?timestampColumn=Time&currentColumn=Amps`, { method: "POST", body: hourly(24, 24, 100), headers: { cookie: consultant.cookie, "content-type": "text/csv" } });
    expect(denied.status).toBe(403);
    expect((await LoadProfile.findByPk(id))!.samples).toBe(24);
  });
});
