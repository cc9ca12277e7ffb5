// The organisation's rule book through the pages and the API, in an organisation of this
// test's own (so a changed value never moves another test's layout). Values are the shipped
// defaults: 200 ft spacing [published: AC 70/7460-1K ¶34.a(2)(a)]; the colour sequence
// [from memory (AC 70/7460-1K ¶34.a(2)(b))], shipped as "unconfirmed".
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { AuditEntry, DeviceProfile, Organisation, RuleBookChange, RuleBookRule, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { baseUrl, DEMO_PASSWORD, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

const tag = randomUUID().slice(0, 8);
let orgId: number;
let engineer: Client;
let consultant: Client;
let manager: Client;
let crossingId: number;
let studyId: number;

const layout = (c: Client) => c.json("/api/v1/markers/layout", "POST", { ruleSet: "faa", spanLength: { value: 1000, unit: "ft" } });

beforeAll(async () => {
  testDb();
  const org = await Organisation.create({ name: `Rule book ${tag}` });
  orgId = org.id;
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const role of ["engineer", "consultant", "manager"] as const) {
    await User.create({ organisationId: orgId, email: `rules-${role}-${tag}@example.com`, name: `Rules ${role[0].toUpperCase()}${role.slice(1)}`, role, passwordHash });
  }
  [engineer, consultant, manager] = await Promise.all(["engineer", "consultant", "manager"].map((r) => signIn(`rules-${r}-${tag}@example.com`)));
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Rules line ${tag}`, voltageKv: 138, phases: 3 })).json();
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Rule river", lat: 35.2, lon: -97.4, spanLength: { value: 1000, unit: "ft" }, kind: "river" })).json();
  crossingId = crossing.id;
  const start = Date.UTC(2025, 5, 1);
  const rows = Array.from({ length: 288 }, (_, i) => `${new Date(start + i * 300_000).toISOString()},100`);
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps`, {
    method: "POST",
    body: ["Time,Amps", ...rows].join("\n"),
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  const device = await DeviceProfile.create({ organisationId: orgId, name: `Rules marker ${tag}`, spec: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0, storageWh: 0, chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20 } });
  const study = await engineer.json("/api/v1/studies", "POST", { crossingId, profileId: (await up.json()).profile.id, deviceProfileId: device.id, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } });
  expect(study.status).toBe(201);
  studyId = (await study.json()).id;
});
afterAll(async () => {
  await closeDb();
});

describe("default rule set of a new crossing", () => {
  it("follows the location unless chosen: FAA in Kansas, ICAO in Germany, the choice wins", async () => {
    const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Where line ${tag}`, voltageKv: 115, phases: 3 })).json();
    const create = async (body: Record<string, unknown>) => {
      const res = await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { spanLength: { value: 300, unit: "m" }, kind: "river", ...body });
      expect(res.status).toBe(201);
      return (await res.json()).details.ruleSet;
    };
    expect(await create({ name: "Kansas", lat: 38.5, lon: -98 })).toBe("faa");
    expect(await create({ name: "Rhine", lat: 50, lon: 7 })).toBe("icao");
    expect(await create({ name: "Rhine by choice", lat: 50, lon: 7, ruleSet: "faa" })).toBe("faa");
    const bad = await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Bad", lat: 50, lon: 7, spanLength: { value: 300, unit: "m" }, kind: "river", ruleSet: "easa" });
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors).toEqual([expect.objectContaining({ path: "ruleSet" })]);
    // The page form: empty choice = from the location.
    const page = await engineer.post(`/circuits/${circuit.id}/crossings/new`, { name: "Guam form", lat: "13.45", lon: "144.78", spanLengthValue: "300", spanLengthUnit: "m", kind: "river", ruleSet: "" });
    expect(page.status).toBe(302);
    const id = page.headers.get("location")!.split("/").pop();
    expect((await (await engineer.get(`/api/v1/crossings/${id}`)).json()).details.ruleSet).toBe("faa");
  });
});

describe("support-structure lights on the crossing page", () => {
  it("are drawn and listed where lit markers do not suit the wires (FAA shield wire 40 ft above the conductor)", async () => {
    const details = await consultant.post(`/crossings/${crossingId}/details`, { supportHeightA: "120", supportHeightB: "120", highestWire: "shield", wireSeparation: "40", ruleSet: "faa", icaoColour: "red", costCurrency: "USD" });
    expect(details.status).toBe(302);
    const html = await (await engineer.get(`/crossings/${crossingId}`)).text();
    expect(html).toContain("Line-powered lit markers are not suitable here.");
    for (const light of ["A-top", "A-middle", "A-bottom", "B-top", "B-middle", "B-bottom"]) expect(html).toContain(`data-support-light="${light}"`);
    expect(html).toContain('data-testid="support-lights"');
    expect(html).toContain("flash midway, then top, then catenary low point at about 60 flashes a minute");
    // 2 supports × 3 levels × 1 light [from memory: the unconfirmed rule faa.support-light-levels].
    expect(html).toMatch(/data-testid="support-light-count"[^>]*>6 lights</);
  });
});

describe("outage reporting on the study page", () => {
  // More than 30 minutes → report for a NOTAM, and the return to service [published: FAA light
  // outage reporting guidance; 47 CFR 17.48].
  it("says what a reportable outage asks of the operator, with the rule's source and status", async () => {
    const html = await (await engineer.get(`/studies/${studyId}`)).text();
    expect(html).toContain('data-testid="outage-reporting"');
    expect(html).toContain("reported at once for a notice to airmen (NOTAM), and the light&#x27;s return to service is reported too");
    expect(html).toContain("FAA light outage reporting guidance; 47 CFR 17.48 (registered antenna structures)");
    expect(html).toContain("published: checked against FAA light outage reporting guidance");
  });
});

describe("rule book", () => {
  it("is seeded from the shipped defaults with their statuses, and says them in plain words, never 'from memory'", async () => {
    const page = await engineer.get("/rules");
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("unconfirmed: not yet checked against the text of AC 70/7460-1K ¶34.a(2)(b)");
    expect(html).not.toMatch(/from memory/i);
    const rows = await RuleBookRule.findAll({ where: { organisationId: orgId } });
    expect(rows.find((r) => r.ruleKey === "faa.colour-sequence")?.status).toBe("unconfirmed");
    expect(rows.find((r) => r.ruleKey === "faa.spacing")).toMatchObject({ status: "published", edition: "K", ruleValues: { value: 200, unit: "ft" } });
    // The crossing page says once, near the top, which unconfirmed rules the layout rests on.
    const crossing = await (await engineer.get(`/crossings/${crossingId}`)).text();
    expect(crossing.match(/data-testid="rule-book-notice"/g)).toHaveLength(1);
    // The colour sequence and the lit-marker rule; the wires do not suit lit markers, so the support
    // lights are in use and their light type and levels (both unconfirmed) are listed too.
    expect(crossing).toContain("This layout rests on 4 unconfirmed rules");
    expect(crossing).toContain("Support-structure light type (AC 70/7460-1K)");
    expect(crossing).toContain("Support-light levels and lights per level (AC 70/7460-1K)");
    expect(crossing).toContain('href="/rules/faa.colour-sequence"');
    expect(crossing).toContain("The rules used mix editions K and L of AC 70/7460-1");
    expect(crossing).not.toMatch(/from memory/i);
  });

  it("only admins and consultants confirm; a confirmation records edition, paragraph, date and who, with history and audit", async () => {
    const refused = await engineer.post("/rules/faa.colour-sequence", { edition: "M", paragraph: "¶3.5.1.4", confirmedOn: "2026-12-01" });
    expect(refused.status).toBe(403);
    const done = await consultant.post("/rules/faa.colour-sequence", { edition: "M", paragraph: "¶3.5.1.4", confirmedOn: "2026-12-01", quote: "Markers should be", value_allEndColourBelowCount: "4" });
    expect(done.status).toBe(200);
    expect(await done.text()).toContain("Rule confirmed.");
    const row = (await RuleBookRule.findOne({ where: { organisationId: orgId, ruleKey: "faa.colour-sequence" } }))!;
    expect(row).toMatchObject({ status: "published", edition: "M", paragraph: "¶3.5.1.4", confirmedByName: "Rules Consultant", confirmedOn: "2026-12-01", quote: "Markers should be" });
    const changes = await RuleBookChange.findAll({ where: { ruleId: row.id } });
    expect(changes.map((c) => [c.action, c.statusBefore, c.sourceBefore, c.sourceAfter])).toEqual([["confirm", "unconfirmed", "AC 70/7460-1K ¶34.a(2)(b)", "AC 70/7460-1M ¶3.5.1.4"]]);
    expect(await AuditEntry.count({ where: { organisationId: orgId, action: "rule.confirmed", entityId: "faa.colour-sequence" } })).toBe(1);
    const crossing = await (await engineer.get(`/crossings/${crossingId}`)).text();
    expect(crossing).toContain("confirmed by Rules Consultant on 2026-12-01 against AC 70/7460-1M ¶3.5.1.4");
    expect(crossing).toContain("This layout rests on 3 unconfirmed rules");
  });

  it("an override changes the layout of this organisation only, keeps the old value, and makes an approval that relied on it stale", async () => {
    expect((await engineer.json(`/api/v1/crossings/${crossingId}/review`, "POST", { action: "submit", comment: "Rule book test." })).status).toBe(200);
    expect((await manager.json(`/api/v1/crossings/${crossingId}/review`, "POST", { action: "approve", comment: "Not this year.", decision: "do-not-proceed" })).status).toBe(200);
    expect((await (await layout(engineer)).json()).count).toBe(4);

    const done = await consultant.post("/rules/faa.spacing", { edition: "M", paragraph: "¶3.5.1.3", confirmedOn: "2026-12-02", value_value: "150", note: "Local authority asks for 150 ft." });
    expect(done.status).toBe(200);
    // 1,000 ft at ≤ 150 ft: 7 intervals, 6 markers; another organisation keeps 200 ft → 4.
    expect((await (await layout(engineer)).json()).count).toBe(6);
    const demo = await signIn("engineer@example.com");
    expect((await (await layout(demo)).json()).count).toBe(4);

    const row = (await RuleBookRule.findOne({ where: { organisationId: orgId, ruleKey: "faa.spacing" } }))!;
    const change = (await RuleBookChange.findOne({ where: { ruleId: row.id }, order: [["id", "DESC"]] }))!;
    expect(change).toMatchObject({ action: "override", valuesBefore: { value: 200, unit: "ft" }, valuesAfter: { value: 150, unit: "ft" }, note: "Local authority asks for 150 ft." });
    expect(await AuditEntry.count({ where: { organisationId: orgId, action: "rule.overridden", entityId: "faa.spacing" } })).toBe(1);
    const { review } = await (await engineer.get(`/api/v1/crossings/${crossingId}/review`)).json();
    expect(review.stale).toBe(true);
    expect(review.staleReasons).toContain(`the rule book's value of "Marker spacing" (faa.spacing), which the layout relied on, has changed`);
    const history = await (await engineer.get("/rules/faa.spacing")).text();
    expect(history).toContain("changed the value from 200 ft to 150 ft and confirmed it against AC 70/7460-1M ¶3.5.1.3");
  });
});
