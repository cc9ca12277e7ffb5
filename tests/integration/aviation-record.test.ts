// A crossing's aviation record (structure numbers, determination) and the 14 CFR 77.9 notice
// check on the crossing page. Worked case from the rule text [published: 14 CFR 77.9(b)(1)]:
// a 150 ft structure 12,000 ft from an airport whose longest runway is 6,000 ft, at the same
// elevation → surface 12,000 / 100 = 120 ft, exceeded by 30 ft: notice required.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { AuditEntry, Crossing } from "../../db/models";
import { signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let consultant: Client;
let crossingId: number;

beforeAll(async () => {
  testDb();
  [engineer, consultant] = await Promise.all([signIn("engineer@example.com"), signIn("consultant@example.com")]);
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Aviation line ${randomUUID().slice(0, 6)}`, voltageKv: 138, phases: 3 })).json();
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Airfield edge", lat: 38.5, lon: -98, spanLength: { value: 1000, unit: "ft" }, kind: "airport-vicinity" })).json();
  crossingId = crossing.id;
});
afterAll(async () => {
  await closeDb();
});

describe("aviation record and notice check", () => {
  it("asks for the support heights before it checks", async () => {
    const html = await (await engineer.get(`/crossings/${crossingId}`)).text();
    expect(html).toContain("State the support heights in the span and marking details to check whether notice to the FAA is required.");
  });

  it("records structure numbers and the determination, and shows the 77.9(b)(1) result on the crossing page", async () => {
    expect((await consultant.post(`/crossings/${crossingId}/details`, { supportHeightA: "150", supportHeightB: "150", surfaceLevel: "0", ruleSet: "faa", icaoColour: "red", costCurrency: "USD" })).status).toBe(302);
    const saved = await consultant.post(`/crossings/${crossingId}/aviation`, {
      structureNumberA: "T-114",
      structureNumberB: "T-115",
      siteElevation: "500",
      nearestKind: "airport",
      nearestDistance: "12000",
      nearestLongestRunway: "6000",
      nearestElevation: "500",
      determinationNumber: "2026-ACE-0417-OE",
      determinationDate: "2026-11-20",
      determinationRequires: "marking and red lighting per chapters 3 and 4",
    });
    expect(saved.status).toBe(302);
    const row = (await Crossing.findByPk(crossingId))!;
    expect(row.aviationRecord).toMatchObject({ structureNumberA: "T-114", nearestDistance: 12000, determinationNumber: "2026-ACE-0417-OE" });
    expect(await AuditEntry.count({ where: { action: "crossing.aviation-record-updated", entityId: String(crossingId) } })).toBe(1);
    const html = await (await engineer.get(`/crossings/${crossingId}`)).text();
    expect(html).toContain("A: T-114 · B: T-115");
    expect(html).toContain("Aeronautical study 2026-ACE-0417-OE of 2026-11-20: requires marking and red lighting per chapters 3 and 4");
    expect(html).toContain("Notice to the FAA is required for the 150 ft support (14 CFR 77.9).");
    expect(html).toMatch(/77\.9\(b\)\(1\): [^<]*120 ft[^<]*30 ft/);
  });

  it("refuses an airport without its runway length, beside the field, and saves nothing", async () => {
    const before = (await Crossing.findByPk(crossingId))!.aviationRecord;
    const res = await consultant.post(`/crossings/${crossingId}/aviation`, { nearestKind: "airport", nearestDistance: "4000", nearestElevation: "10", siteElevation: "0" });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('id="nearestLongestRunway-error"');
    expect((await Crossing.findByPk(crossingId))!.aviationRecord).toEqual(before);
  });
});
