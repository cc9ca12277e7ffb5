import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { AuditEntry, Crossing, LightingOption, User } from "../../db/models";
import { presentValueOfOption } from "../../lib/costs";
import { seedCrossingDetailsAndOptions } from "../../app/services/crossing-demo.server";
import { formatMoney } from "../../shared/format";
import { signIn, client, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let consultant: Client;
let manager: Client;
let crossingId: number;

beforeAll(async () => {
  testDb();
  [engineer, consultant, manager] = await Promise.all([signIn("engineer@example.com"), signIn("consultant@example.com"), signIn("manager@example.com")]);
  const circuit = await engineer.json("/api/v1/circuits", "POST", { name: `Options test ${randomUUID().slice(0, 6)}`, voltageKv: 138, phases: 3 });
  expect(circuit.status).toBe(201);
  const crossing = await engineer.json(`/api/v1/circuits/${(await circuit.json()).id}/crossings`, "POST", {
    name: "Test river",
    lat: 40.2,
    lon: -98.4,
    spanLength: { value: 1000, unit: "ft" },
    kind: "river",
  });
  expect(crossing.status).toBe(201);
  crossingId = (await crossing.json()).id;
});
afterAll(async () => {
  await closeDb();
});

const layout = (c: Client, body: unknown) => c.json("/api/v1/markers/layout", "POST", body);

describe("POST /api/v1/markers/layout", () => {
  // Spacing ≤ 200 ft [published: AC 70/7460-1K ¶34.a(2)(a)]; orange–white–yellow–orange
  // [from memory (AC 70/7460-1K ¶34.a(2)(b))] — tests/reference/markers.md.
  it("FAA 1,000 ft → 4 markers, orange–white–yellow–orange, every 200 ft", async () => {
    const res = await layout(manager, { ruleSet: "faa", spanLength: { value: 1000, unit: "ft" }, runwayEndCriticalArea: false });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.count).toBe(4);
    expect(body.positions.map((p: { colour: string }) => p.colour)).toEqual(["orange", "white", "yellow", "orange"]);
    expect(body.positions.map((p: { distanceFromSupportA: { value: number } }) => p.distanceFromSupportA.value)).toEqual([200, 400, 600, 800]);
    expect(body.spacing).toEqual({ value: 200, unit: "ft" });
    expect(body.maxSpacing).toEqual({ value: 200, unit: "ft" });
    expect(body.markerDiameter).toEqual({ value: 36, unit: "in" });
    expect(body.references.some((r: { section: string; status: string }) => r.section.includes("¶34.a(2)(a)") && r.status === "published")).toBe(true);
  });

  // 60 cm spheres at most 30 m apart [published: Annex 14 as transposed in French arrêté of 23 April 2018, §5.2.1].
  it("ICAO 300 m with 60 cm spheres → 9 markers, lengths in metres", async () => {
    const res = await layout(consultant, { ruleSet: "icao", spanLength: { value: 300, unit: "m" }, markerDiameter: { value: 60, unit: "cm" } });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.count).toBe(9);
    expect(body.spacing).toEqual({ value: 30, unit: "m" });
    expect(body.positions[8].distanceFromSupportA).toEqual({ value: 270, unit: "m" });
  });

  it("answers 400 problem+json naming each bad path", async () => {
    const res = await layout(engineer, { ruleSet: "easa", spanLength: { value: -5, unit: "yd" } });
    expect(res.status).toBe(400);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    const paths = (await res.json()).errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["ruleSet", "spanLength.value", "spanLength.unit"]));

    const looser = await layout(engineer, { ruleSet: "faa", spanLength: { value: 1000, unit: "ft" }, maxSpacing: { value: 300, unit: "ft" } });
    expect(looser.status).toBe(400);
    const errors = (await looser.json()).errors;
    expect(errors).toEqual([expect.objectContaining({ path: "maxSpacing", message: expect.stringContaining("looser than the rule") })]);
  });

  it("needs a session", async () => {
    const res = await layout(client(), { ruleSet: "faa", spanLength: { value: 1000, unit: "ft" } });
    expect(res.status).toBe(401);
  });
});

describe("span and marking details", () => {
  it("are saved through the page form and read back through the API", async () => {
    const res = await consultant.post(`/crossings/${crossingId}/details`, {
      supportHeightA: "150",
      supportHeightB: "140",
      attachmentHeightA: "135",
      attachmentHeightB: "125",
      sagKind: "midspan-sag",
      sagValue: "40",
      surfaceLevel: "-10",
      highestWire: "shield",
      wireSeparation: "15",
      runwayEndDistance: "",
      ruleSet: "faa",
      markerDiameterValue: "",
      markerDiameterUnit: "in",
      icaoColour: "red",
      litPhase: "B",
      costCurrency: "usd",
    });
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toBe(`/crossings/${crossingId}`);

    const read = await (await engineer.get(`/api/v1/crossings/${crossingId}`)).json();
    expect(read.details).toEqual({
      supportHeightA: 150,
      supportHeightB: 140,
      attachmentHeightA: 135,
      attachmentHeightB: 125,
      sagKind: "midspan-sag",
      sagValue: 40,
      surfaceLevel: -10,
      highestWire: "shield",
      wireSeparation: 15,
      topWireCount: null,
      topWireSeparation: null,
      runwayEndDistance: null,
      runwayEndCriticalArea: false,
      ruleSet: "faa",
      markerDiameter: null,
      icaoColour: "red",
      litPhase: "B",
      costCurrency: "USD",
    });
    const audit = await AuditEntry.findOne({ where: { action: "crossing.details-updated", entityId: String(crossingId) } });
    expect(audit?.detail).toMatchObject({ wireSeparation: 15, litPhase: "B" });

    // The crossing page now draws the span with its 4 markers (1,000 ft at ≤ 200 ft), lit and suitable
    // (shield wire 15 ft above the conductor, within about 20 ft [from memory (AC 70/7460-1L)]).
    const html = await (await manager.get(`/crossings/${crossingId}`)).text();
    expect(html.match(/data-marker="\d+"/g)).toHaveLength(4);
    expect(html.match(/data-lit-device="\d+"/g)).toHaveLength(4);
    expect(html).toContain("Line-powered lit markers suit this crossing");
    expect(html).toContain("Planning aid only.");
  });

  it("have a form for engineers and consultants only", async () => {
    const page = await consultant.get(`/crossings/${crossingId}/details`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Span and marking details");
    expect(html).toMatch(/id="wireSeparation"[^>]*value="15"/);
    expect((await manager.get(`/crossings/${crossingId}/details`)).status).toBe(403);
    expect((await manager.post(`/crossings/${crossingId}/details`, { ruleSet: "icao" })).status).toBe(403);
  });

  it("show errors beside the fields and save nothing when the heights contradict each other", async () => {
    const res = await consultant.post(`/crossings/${crossingId}/details`, {
      supportHeightA: "100",
      attachmentHeightA: "120",
      sagKind: "midspan-sag",
      sagValue: "",
      ruleSet: "faa",
      markerDiameterValue: "10",
      markerDiameterUnit: "in",
    });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain("cannot be above the support");
    expect(html).toContain("Give both how the sag is stated and its value");
    const row = await Crossing.findByPk(crossingId);
    expect(row?.attachmentHeightA).toBe(135);
  });

  it("refuse a sphere smaller than the rule allows, beside the diameter field", async () => {
    const res = await consultant.post(`/crossings/${crossingId}/details`, { ruleSet: "faa", markerDiameterValue: "12", markerDiameterUnit: "in" });
    expect(res.status).toBe(400);
    expect(await res.text()).toMatch(/id="markerDiameterValue-error"[^>]*>[^<]*at least 20 in/);
  });
});

describe("lighting options", () => {
  const unlit = {
    name: "Plain spheres",
    kind: "unlit",
    units: "",
    unitPrice: "900",
    installationMethod: "helicopter",
    mobilisation: "12000",
    ratePerHour: "4500",
    minutesPerUnit: "20",
    annualMaintenance: "40",
    serviceLifeYears: "25",
    horizonYears: "40",
    discountRatePercent: "8",
    feasibilityStatus: "go",
    feasibilityJustification: "No night flying near this river in the test scenario.",
  };

  it("a manager reads the comparison but cannot add an option", async () => {
    expect((await manager.post(`/crossings/${crossingId}/options/new`, unlit)).status).toBe(403);
    expect((await manager.get(`/crossings/${crossingId}/options/new`)).status).toBe(403);
    expect(await LightingOption.count({ where: { crossingId } })).toBe(0);
  });

  it("options are compared and the cheapest go option recommended, with reasons", async () => {
    const first = await consultant.post(`/crossings/${crossingId}/options/new`, unlit);
    expect(first.status).toBe(302);
    const solar = await engineer.post(`/crossings/${crossingId}/options/new`, {
      ...unlit,
      name: "Solar lit",
      kind: "solar",
      unitPrice: "4200",
      annualMaintenance: "600",
      serviceLifeYears: "10",
      feasibilityStatus: "no-go",
      feasibilityJustification: "North-facing bank, shaded all winter.",
    });
    expect(solar.status).toBe(302);
    const lineFed = await consultant.post(`/crossings/${crossingId}/options/new`, { ...unlit, name: "Line-fed", kind: "line-powered", unitPrice: "6500", feasibilityStatus: "", feasibilityJustification: "" });
    expect(lineFed.status).toBe(302);

    const stored = await LightingOption.findOne({ where: { crossingId, name: "Plain spheres" } });
    expect(stored).toMatchObject({ units: null, discountRate: 0.08, feasibilityStatus: "go" });
    expect((await LightingOption.findOne({ where: { crossingId, name: "Line-fed" } }))?.feasibilityStatus).toBeNull();

    // Expected figures from lib/costs for the layout's 4 markers.
    const expected = presentValueOfOption({
      name: "Plain spheres",
      kind: "unlit",
      units: 4,
      unitPrice: 900,
      installation: { method: "helicopter", mobilisation: 12000, ratePerHour: 4500, minutesPerUnit: 20 },
      outage: { needed: false, cost: 0 },
      annualMaintenance: 40,
      serviceLifeYears: 25,
      horizonYears: 40,
      discountRate: 0.08,
      feasibility: { status: "go", justification: "x" },
    });
    const page = await manager.get(`/crossings/${crossingId}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Recommended: Plain spheres");
    expect(html).toContain(formatMoney(expected.totalPV));
    expect(html).toContain("It is the only option rated go.");
    // Line-powered is rated from the (absent) study; it is never recommended without one.
    expect(html).toContain("No feasibility study of this crossing yet");
    expect(html).toContain("Cumulative cost over the horizon");
    // A manager sees no edit links.
    expect(html).not.toContain(`/crossings/${crossingId}/options/new`);
  });

  it("warns when no option is rated go", async () => {
    const plain = await LightingOption.findOne({ where: { crossingId, name: "Plain spheres" } });
    const res = await consultant.post(`/crossings/${crossingId}/options/${plain!.id}`, { ...unlit, feasibilityStatus: "no-go", feasibilityJustification: "Lighting is required after all." });
    expect(res.status).toBe(302);
    const html = await (await consultant.get(`/crossings/${crossingId}`)).text();
    expect(html).toContain("No option is rated go, so none is recommended.");
    expect(html).not.toContain("Recommended: ");
  });

  it("new options start from the invented demo figures of their kind", async () => {
    const html = await (await consultant.get(`/crossings/${crossingId}/options/new?kind=structure-supply`)).text();
    expect(html).toContain("Invented demo defaults");
    // Units empty: lights on the supports follow the support-light layout (2 supports × 3 levels × 1 light here).
    expect(html).toMatch(/id="units"[^>]*value=""/);
    expect(html).toContain("Leave empty to follow the support-light layout (now 2 structures × 3 levels × 1 light per level = 6");
    expect(html).toMatch(/id="unitPrice"[^>]*value="9000"/);
  });

  it("a stated option needs its feasibility and reasons; names are unique per crossing", async () => {
    const missing = await consultant.post(`/crossings/${crossingId}/options/new`, { ...unlit, name: "Another", feasibilityStatus: "", feasibilityJustification: "" });
    expect(missing.status).toBe(400);
    const html = await missing.text();
    expect(html).toContain("State whether this option is feasible here.");
    expect(html).toContain("Say why");
    const dup = await consultant.post(`/crossings/${crossingId}/options/new`, unlit);
    expect(dup.status).toBe(400);
    expect(await dup.text()).toContain("already has an option named");
  });

  it("is deleted with an audit entry", async () => {
    const solar = await LightingOption.findOne({ where: { crossingId, name: "Solar lit" } });
    const res = await engineer.post(`/crossings/${crossingId}/options/${solar!.id}`, { intent: "delete" });
    expect(res.status).toBe(302);
    expect(await LightingOption.findByPk(solar!.id)).toBeNull();
    expect(await AuditEntry.count({ where: { action: "lighting-option.deleted", entityId: String(solar!.id) } })).toBe(1);
  });
});

describe("demo crossings", () => {
  it("the seed fills details and options of the invented demo crossings, once", async () => {
    const organisationId = (await User.findOne({ where: { email: "consultant@example.com" } }))!.organisationId;
    await seedCrossingDetailsAndOptions(organisationId);
    const glimmer = await Crossing.findOne({ where: { organisationId, name: "Glimmer River crossing" } });
    expect(glimmer).not.toBeNull();
    const count = await LightingOption.count({ where: { crossingId: glimmer!.id } });
    expect(count).toBe(3);
    await seedCrossingDetailsAndOptions(organisationId);
    expect(await LightingOption.count({ where: { crossingId: glimmer!.id } })).toBe(count);

    // 1,450 ft at ≤ 200 ft → 8 intervals, 7 markers [published: AC 70/7460-1K ¶34.a(2)(a)].
    const html = await (await manager.get(`/crossings/${glimmer!.id}`)).text();
    expect(html.match(/data-marker="\d+"/g)).toHaveLength(7);
    const canyon = await Crossing.findOne({ where: { organisationId, name: "Hollowmere Canyon" } });
    expect(canyon?.ruleSet).toBe("icao");
    const saltbrook = await Crossing.findOne({ where: { organisationId, name: "Saltbrook airfield approach" } });
    // 300 ft in a runway-end critical area at ≤ 50 ft → 5 markers [published: AC 70/7460-1K ¶34.a(2)(a)].
    const airfield = await (await manager.get(`/crossings/${saltbrook!.id}`)).text();
    expect(airfield.match(/data-marker="\d+"/g)).toHaveLength(5);
  });
});
