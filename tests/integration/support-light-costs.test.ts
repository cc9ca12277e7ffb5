// Lights on the supports costed for the crossing's support-light layout, and the wires at the top:
// through the API (details, options, comparison, portfolio) and the page actions, with bad input
// refused by field and nothing half-saved.
//
// Support lights: top, catenary low point and midway [published: Aeronautical Information Manual
// 2-2-3], intermediate levels where two would be more than 105 m apart and one light per level
// [from memory: the unconfirmed rule icao.support-light-levels]. Several wires at the top: ICAO marks
// each [unconfirmed: Duskline's working rule icao.top-wires]. Spheres 60 cm at most 30 m apart
// [published: Annex 14 Vol. I ch. 6].
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { AuditEntry, Crossing, LightingOption } from "../../db/models";
import { signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { TOWER_LIGHTS_OPTION } from "../support/support-lights-option";

let engineer: Client;
let consultant: Client;
let crossingId: number;
const crossingName = `Tall river ${randomUUID().slice(0, 6)}`;

const details = {
  ruleSet: "icao",
  supportHeightA: 300,
  supportHeightB: 300,
  attachmentHeightA: 290,
  attachmentHeightB: 290,
  topWireCount: 2,
  topWireSeparation: 12,
};

const supportsOption = TOWER_LIGHTS_OPTION;

beforeAll(async () => {
  testDb();
  [engineer, consultant] = await Promise.all([signIn("engineer@example.com"), signIn("consultant@example.com")]);
  const circuit = await engineer.json("/api/v1/circuits", "POST", { name: `Support lights ${randomUUID().slice(0, 6)}`, voltageKv: 400, phases: 3 });
  const crossing = await engineer.json(`/api/v1/circuits/${(await circuit.json()).id}/crossings`, "POST", {
    name: crossingName,
    lat: 47.1,
    lon: 8.4,
    spanLength: { value: 3000, unit: "m" },
    kind: "river",
    ruleSet: "icao",
  });
  expect(crossing.status).toBe(201);
  crossingId = (await crossing.json()).id;
});
afterAll(async () => {
  await closeDb();
});

const comparison = async () => (await (await consultant.get(`/api/v1/crossings/${crossingId}/comparison`)).json()) as {
  options: { name: string; effectiveUnits: number; unitsSource: string; unitsBasis: string }[];
  comparison: { rows: { name: string; capital: number; installation: number }[] };
};

describe("wires at the highest point in the span details", () => {
  it("are saved through the API and mark each wire (ICAO)", async () => {
    const res = await consultant.json(`/api/v1/crossings/${crossingId}/details`, "PUT", details);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.details).toMatchObject({ topWireCount: 2, topWireSeparation: 12 });
    // 3,000 m at ≤ 30 m: 100 intervals, 99 positions, on each of 2 wires = 198 markers.
    expect(body.plan.layout.count).toBe(198);
    expect(body.plan.layout.wiresAtTop).toEqual({ count: 2, method: "each", markersPerWire: [99, 99] });
    expect(body.plan.layout.references.map((r: { key: string }) => r.key)).toEqual(expect.arrayContaining(["icao.top-wires", "icao.placement"]));
  });

  it("refuse bad values naming the field, through the API, and save nothing", async () => {
    const before = await AuditEntry.count({ where: { action: "crossing.details-updated", entityId: String(crossingId) } });
    const zero = await consultant.json(`/api/v1/crossings/${crossingId}/details`, "PUT", { ...details, topWireCount: 0, supportHeightA: 310 });
    expect(zero.status).toBeGreaterThanOrEqual(400);
    expect(zero.status).toBeLessThan(500);
    expect((await zero.json()).errors).toEqual([expect.objectContaining({ path: "topWireCount", message: "At least one wire." })]);
    const alone = await consultant.json(`/api/v1/crossings/${crossingId}/details`, "PUT", { ...details, topWireCount: 1, supportHeightA: 310 });
    expect(alone.status).toBeGreaterThanOrEqual(400);
    expect((await alone.json()).errors).toEqual([expect.objectContaining({ path: "topWireSeparation", message: expect.stringContaining("needs at least 2 wires") })]);
    const row = await Crossing.findByPk(crossingId);
    expect([row?.topWireCount, row?.supportHeightA]).toEqual([2, 300]);
    expect(await AuditEntry.count({ where: { action: "crossing.details-updated", entityId: String(crossingId) } })).toBe(before);
  });

  it("refuse a fractional count beside the field on the page, and save nothing", async () => {
    const res = await consultant.post(`/crossings/${crossingId}/details`, { ruleSet: "icao", supportHeightA: "310", topWireCount: "2.5", topWireSeparation: "12" });
    expect(res.status).toBe(400);
    expect(await res.text()).toMatch(/id="topWireCount-error"[^>]*>[^<]*A whole number of wires/);
    const row = await Crossing.findByPk(crossingId);
    expect([row?.topWireCount, row?.supportHeightA]).toEqual([2, 300]);
  });
});

describe("lights on the supports follow the support-light layout", () => {
  it("are costed for the layout's count, which the span moves, in the comparison and the portfolio", async () => {
    const created = await consultant.json(`/api/v1/crossings/${crossingId}/options`, "POST", supportsOption);
    expect(created.status).toBe(201);
    expect((await created.json()).units).toBeNull();

    // Span 3,000 m, sag not stated: 3 % = 90 m, low point 200 m, 100 m under the 300 m tops → 3 levels, 2 × 3 × 1 = 6 lights.
    let view = await comparison();
    let option = view.options.find((o) => o.name === supportsOption.name)!;
    expect([option.effectiveUnits, option.unitsSource]).toEqual([6, "support lights"]);
    expect(option.unitsBasis).toMatch(/^support-light layout: 2 structures × 3 levels × 1 light per level = 6/);
    let row = view.comparison.rows.find((r) => r.name === supportsOption.name)!;
    expect(row.capital).toBe(15_000); // 6 × 2,500
    expect(row.installation).toBe(4_080); // 3,000 + 240 × (6 × 45 / 60 h)
    const portfolioRow = async () => (await (await consultant.get("/api/v1/portfolio")).json()).rows.find((r: { crossingId: number }) => r.crossingId === crossingId);
    const portfolioBefore = await portfolioRow();

    // Span 8,000 m: sag min(240, 0.8 × 290 = 232) = 232 m, low point 58 m, 242 m under the tops → 4 levels, 8 lights.
    const moved = await engineer.json(`/api/v1/crossings/${crossingId}`, "PUT", { name: crossingName, lat: 47.1, lon: 8.4, spanLength: { value: 8000, unit: "m" }, kind: "river" });
    expect(moved.status).toBe(200);
    expect(await AuditEntry.count({ where: { action: "crossing.updated", entityId: String(crossingId) } })).toBe(1);
    view = await comparison();
    option = view.options.find((o) => o.name === supportsOption.name)!;
    expect(option.effectiveUnits).toBe(8);
    row = view.comparison.rows.find((r) => r.name === supportsOption.name)!;
    expect(row.capital).toBe(20_000); // 8 × 2,500
    expect(row.installation).toBe(4_440); // 3,000 + 240 × (8 × 45 / 60 h)
    const portfolioAfter = await portfolioRow();
    // Equivalent annual cost at 0 %: (capital + installation) / 20 + 400 a year.
    expect(portfolioBefore?.equivalentAnnualCost).toBeCloseTo((15_000 + 4_080) / 20 + 400, 6);
    expect(portfolioAfter?.equivalentAnnualCost).toBeCloseTo((20_000 + 4_440) / 20 + 400, 6);
  });

  it("show the count and where it came from on the crossing page, and the notice lists the support-light rules", async () => {
    const html = await (await consultant.get(`/crossings/${crossingId}`)).text();
    expect(html).toContain("from the support-light layout: 2 structures × 4 levels × 1 light per level = 8");
    const notice = html.slice(html.indexOf('data-testid="rule-book-notice"'), html.indexOf("</div>", html.indexOf('data-testid="rule-book-notice"')));
    for (const title of ["Support-structure light type", "Support-light levels and lights per level", "Several wires at the highest point", "Wire marked"]) expect(notice).toContain(title);
    expect(html.match(/data-support-light="A-/g)).toHaveLength(4);
  });

  it("the option form leaves units empty and says the layout's count", async () => {
    const html = await (await consultant.get(`/crossings/${crossingId}/options/new?kind=structure-supply`)).text();
    expect(html).toMatch(/id="units"[^>]*value=""/);
    expect(html).toContain("Leave empty to follow the support-light layout (now 2 structures × 4 levels × 1 light per level = 8");
    const stated = await LightingOption.findOne({ where: { crossingId, name: supportsOption.name } });
    expect(stated?.units).toBeNull();
  });
});
