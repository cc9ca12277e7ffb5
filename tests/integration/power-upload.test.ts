// Power exports (issue 9): MW/MVA/kW/kVA converted to current at the circuit's line-to-line
// voltage on upload, and through csvOptions of the feasibility API.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let circuitId: number;

// Two days of 10-minute readings of a steady 100 MW.
const start = Date.UTC(2025, 2, 1);
const rows = Array.from({ length: 288 }, (_, i) => `${new Date(start + i * 600_000).toISOString()},100,0`);
const csv = ["Time,P [MW],Q [MVAr]", ...rows].join("\n");

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `230 kV line ${randomUUID().slice(0, 6)}`, voltageKv: 230, phases: 3 })).json();
  circuitId = circuit.id;
});
afterAll(async () => {
  await closeDb();
});

const upload = (query: string) =>
  fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?${query}`, { method: "POST", body: csv, headers: { cookie: engineer.cookie, "content-type": "text/csv" } });

describe("upload in MW", () => {
  it("converts at the circuit's 230 kV by default and says so in the quality report", async () => {
    const res = await upload("timestampColumn=Time&currentColumn=P%20%5BMW%5D&unit=MW");
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.quality.conversion).toContain("230 kV line-to-line");
    expect(body.quality.conversion).toContain("pf = 1");
    const page = await (await engineer.get(`/profiles/${body.profile.id}`)).text();
    expect(page).toContain("Converted from power.");
  });

  it("takes another voltage and a reactive column from the query", async () => {
    const res = await upload("timestampColumn=Time&currentColumn=P%20%5BMW%5D&unit=MW&voltageKv=115&reactiveColumn=Q%20%5BMVAr%5D");
    expect(res.status).toBe(201);
    expect((await res.json()).quality.conversion).toMatch(/115 kV line-to-line; S = √\(P² \+ Q²\)/);
  });
});

describe("POST /api/v1/feasibility with csvOptions in MW", () => {
  const base = { location: { lat: 47, lon: 8 }, device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4 }, schedule: { kind: "always" } };

  it("100 MW at 230 kV, pf 1 is 251.0 A throughout", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...base, csv, csvOptions: { timestampColumn: "Time", currentColumn: "P [MW]", unit: "MW", voltageKv: 230 } });
    expect(res.status).toBe(200);
    const r = await res.json();
    expect(r.current.exceeded.p50A).toBeCloseTo(251.02, 1);
    expect(r.quality.conversion).toContain("230 kV");
  });

  it("a power unit without voltageKv is a 422 that names voltageKv", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...base, csv, csvOptions: { timestampColumn: "Time", currentColumn: "P [MW]", unit: "MW" } });
    expect(res.status).toBe(422);
    const problem = await res.json();
    expect(problem.detail).toContain("voltageKv");
    expect(problem.errors).toEqual([expect.objectContaining({ path: "csvOptions.voltageKv" })]);
  });
});
