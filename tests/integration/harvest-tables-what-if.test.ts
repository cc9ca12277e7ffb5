// Issue 9: harvest curves typed as datasheet rows (API and form, row-named errors, nothing saved on
// bad input), the study page's what-if answering with its charts' data, and device comparison.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { DeviceProfile } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let viewer: Client;
const unique = () => randomUUID().slice(0, 8);
const ROWS = [
  { currentA: 20, watts: 0.5 },
  { currentA: 50, watts: 2 },
  { currentA: 100, watts: 6 },
  { currentA: 400, watts: 12 },
];
const device = (name: string, extra: Record<string, unknown> = {}) => ({ name, minCurrentA: 20, maxCurrentA: 1000, loadW: 4, harvestPoints: ROWS, ...extra });
const count = () => DeviceProfile.count();

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  viewer = await signIn("manager@example.com");
});
afterAll(async () => {
  await closeDb();
});

describe("harvest table through the device API", () => {
  it("creates, reads back and replaces a device given as rows", async () => {
    const res = await engineer.json("/api/v1/devices", "POST", device(`Table ${unique()}`));
    expect(res.status).toBe(201);
    const created = await res.json();
    expect(created.spec.harvestPoints).toEqual(ROWS);
    expect(created.spec.harvestW).toBeUndefined();
    const put = await engineer.json(`/api/v1/devices/${created.id}`, "PUT", device(created.name, { harvestPoints: [...ROWS, { currentA: 800, watts: 15 }] }));
    expect(put.status).toBe(200);
    expect((await put.json()).spec.harvestPoints).toHaveLength(5);
  });

  it("names the row of each bad value and saves nothing", async () => {
    const before = await count();
    const res = await engineer.json("/api/v1/devices", "POST", device(`Bad ${unique()}`, { harvestPoints: [{ currentA: 20, watts: 1 }, { currentA: 10, watts: 2 }, { currentA: 30, watts: -1 }] }));
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.errors).toContainEqual(expect.objectContaining({ path: "harvestPoints.1.currentA", message: "Row 2: currents must increase from one row to the next (10 A after 20 A)." }));
    expect(body.errors).toContainEqual(expect.objectContaining({ path: "harvestPoints.2.watts", message: "Row 3: the power cannot be negative (-1 W)." }));
    expect(await count()).toBe(before);
  });

  it("refuses an expression and a table together, and a PUT with a bad row leaves the profile as it was", async () => {
    const both = await engineer.json("/api/v1/devices", "POST", device(`Both ${unique()}`, { harvestW: "0.01*I" }));
    expect(both.status).toBe(400);
    expect((await both.json()).errors[0].path).toBe("harvestPoints");
    const created = await (await engineer.json("/api/v1/devices", "POST", device(`Keep ${unique()}`))).json();
    const put = await engineer.json(`/api/v1/devices/${created.id}`, "PUT", device(created.name, { harvestPoints: [{ currentA: 5, watts: "two" }, { currentA: 9, watts: 1 }] }));
    expect(put.status).toBe(400);
    expect((await put.json()).errors[0].path).toBe("harvestPoints.0.watts");
    expect((await DeviceProfile.findByPk(created.id))!.spec.harvestPoints).toEqual(ROWS);
  });

  it("a table gives the same study as the expression it samples exactly", async () => {
    // min(0.01·I, 10) is straight from (0, 0) to (1000 A, 10 W) and flat above: two rows say the same.
    const samples: [string, number][] = Array.from({ length: 288 }, (_, i) => [new Date(Date.UTC(2025, 0, 1) + i * 300_000).toISOString(), 300 + 250 * Math.sin(i / 20)]);
    const base = { samples, location: { lat: 45, lon: -100 }, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } };
    const shape = { minCurrentA: 60, maxCurrentA: 1500, loadW: 3, storageWh: 5 };
    const byExpression = await (await engineer.json("/api/v1/feasibility", "POST", { ...base, device: { ...shape, harvestW: "min(0.01*I, 10)" } })).json();
    const byTable = await (await engineer.json("/api/v1/feasibility", "POST", { ...base, device: { ...shape, harvestPoints: [{ currentA: 0, watts: 0 }, { currentA: 1000, watts: 10 }] } })).json();
    expect(byTable.lighting.darkHours).toBeCloseTo(byExpression.lighting.darkHours, 6);
    expect(byTable.lighting.litHours).toBeCloseTo(byExpression.lighting.litHours, 6);
    expect(byTable.verdict.status).toBe(byExpression.verdict.status);
  });
});

describe("harvest table through the device form", () => {
  const fields = (name: string, rows: [string, string][]) => ({
    name,
    minCurrentA: "20",
    maxCurrentA: "1000",
    loadW: "4",
    harvestMode: "table",
    ...Object.fromEntries(rows.flatMap(([c, w], i) => [[`harvestPoints.${i}.currentA`, c], [`harvestPoints.${i}.watts`, w]])),
  });

  it("saves the rows typed, decimal commas read, empty rows at the end dropped", async () => {
    const name = `Form table ${unique()}`;
    const res = await engineer.post("/devices/new", fields(name, [["20", "0,5"], ["50", "2"], ["100", "6"], ["", ""]]));
    expect(res.status).toBe(302);
    const saved = await DeviceProfile.findOne({ where: { name } });
    expect(saved!.spec.harvestPoints).toEqual([{ currentA: 20, watts: 0.5 }, { currentA: 50, watts: 2 }, { currentA: 100, watts: 6 }]);
  });

  it("answers 400 naming the row and saves nothing", async () => {
    const before = await count();
    const res = await engineer.post("/devices/new", fields(`Form bad ${unique()}`, [["20", "1"], ["15", "2"], ["40", "3"]]));
    expect(res.status).toBe(400);
    expect(await res.text()).toContain("Row 2: currents must increase from one row to the next (15 A after 20 A).");
    const text = await engineer.post("/devices/new", fields(`Form bad ${unique()}`, [["20", "1"], ["30", "2"], ["40", "abc"]]));
    expect(text.status).toBe(400);
    expect(await text.text()).toContain("Row 3: The power of each row must be a number.");
    expect(await count()).toBe(before);
  });

  it("shows a read-only role the values as text, not disabled inputs", async () => {
    const created = await (await engineer.json("/api/v1/devices", "POST", device(`Readable ${unique()}`))).json();
    const html = await (await viewer.get(`/devices/${created.id}`)).text();
    expect(html).toContain('data-testid="device-values"');
    expect(html).not.toMatch(/<input[^>]*name="minCurrentA"/);
    expect(html).not.toContain("<fieldset disabled");
    expect(html).toMatch(/<td class="figure">400<\/td><td class="figure">12<\/td>/);
  });

  it("compares ticked devices side by side with their figures", async () => {
    const one = await (await engineer.json("/api/v1/devices", "POST", device(`Cmp A ${unique()}`))).json();
    const two = await (await engineer.json("/api/v1/devices", "POST", { name: `Cmp B ${unique()}`, minCurrentA: 30, maxCurrentA: 2000, loadW: 4, harvestW: "min(0.004*I^2, 15)" })).json();
    const html = await (await viewer.get(`/devices?compare=${one.id}&compare=${two.id}`)).text();
    expect(html).toContain('data-testid="device-comparison"');
    // Carries the 4 W load: table device between 50 A (2 W) and 100 A (6 W): 50 + 50 × 2/4 = 75 A;
    // 0.004·I² = 4 W at I = √1000 = 31.6 A.
    expect(html).toContain(`carries its 4 W load from 75.0 A`);
    expect(html).toContain(`carries its 4 W load from 31.6 A`);
  });
});

describe("what-if on the study page", () => {
  it("answers with the recomputed charts' data, not only the figures, and saves nothing", async () => {
    const api = engineer;
    const { studies } = await (await api.get("/api/v1/studies?limit=1")).json();
    expect(studies.length).toBe(1);
    const id = studies[0].id;
    const saved = await (await api.get(`/api/v1/studies/${id}`)).json();
    const res = await api.json(`/api/v1/studies/${id}/what-if`, "POST", { minCurrentA: 1, storageWh: 0 });
    expect(res.status).toBe(200);
    const answer = await res.json();
    expect(answer.device.minCurrentA).toBe(1);
    expect(answer.charts.monthly.length).toBe(saved.results.monthly.length);
    expect(answer.charts.hourMonthBelowMin.share).toHaveLength(24);
    expect(answer.charts.loadDuration.length).toBeGreaterThan(0);
    const dark = (m: { darkHours: number }[]) => m.reduce((s, x) => s + x.darkHours, 0);
    expect(dark(answer.charts.monthly)).toBeCloseTo(answer.summary.darkHours, 6);
    // The page's own action answers a reader the same way (the fetcher's request).
    const page = await viewer.post(`/studies/${id}.data`, { intent: "what-if", minCurrentA: "1", storageWh: "0" });
    expect(page.status).toBe(200);
    const again = await viewer.post(`/studies/${id}`, { intent: "what-if", minCurrentA: "abc" });
    expect(again.status).toBe(400);
    expect(await again.text()).toContain("Minimum current must be a number of amperes.");
    expect((await (await api.get(`/api/v1/studies/${id}`)).json()).results.lighting.darkHours).toBe(saved.results.lighting.darkHours);
  });

  it("runs the same study with another device profile (devices compared on one study), saving nothing", async () => {
    const { studies } = await (await engineer.get("/api/v1/studies?limit=1")).json();
    const id = studies[0].id;
    const saved = await (await engineer.get(`/api/v1/studies/${id}`)).json();
    // Its own device profile, nothing changed: the saved figures again.
    const same = await (await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { deviceProfileId: saved.deviceProfileId })).json();
    expect(same.summary.darkHours).toBeCloseTo(saved.results.lighting.darkHours, 6);
    expect(same.summary.hoursBelowMin).toBeCloseTo(saved.results.current.hoursBelowMin, 6);
    // A device that needs 900 A is below its minimum at least as long as the saved one (a higher
    // minimum can only add time below it), and the answer names it with its own figures.
    const name = `Needs 900 A ${unique()}`;
    const other = await (await engineer.json("/api/v1/devices", "POST", device(name, { minCurrentA: 900 }))).json();
    const res = await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { deviceProfileId: other.id });
    expect(res.status, await res.clone().text()).toBe(200);
    const answer = await res.json();
    expect(answer.device).toMatchObject({ name, minCurrentA: 900, maxCurrentA: 1000, storageWh: 0 });
    expect(answer.summary.hoursBelowMin).toBeGreaterThanOrEqual(saved.results.current.hoursBelowMin - 1e-6);
    // Figures typed with it apply on top of its own.
    const withStorage = await (await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { deviceProfileId: other.id, storageWh: 50 })).json();
    expect(withStorage.device).toMatchObject({ name, minCurrentA: 900, storageWh: 50 });
    // The page's fetcher sends the choice as form text.
    const page = await viewer.post(`/studies/${id}.data`, { intent: "what-if", deviceProfileId: String(other.id), minCurrentA: "900", storageWh: "0" });
    expect(page.status).toBe(200);
    // An id that is not a device profile of the organisation is refused naming the field.
    const missing = await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { deviceProfileId: 999_999_999 });
    expect(missing.status).toBe(422);
    expect(JSON.stringify(await missing.json())).toContain("deviceProfileId");
    const wrongType = await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { deviceProfileId: "two" });
    expect(wrongType.status).toBe(400);
    expect((await (await engineer.get(`/api/v1/studies/${id}`)).json()).results.lighting.darkHours).toBe(saved.results.lighting.darkHours);
  });

  it("switches the line out for named periods (current 0 A inside) and names the line of a bad period", async () => {
    const { studies } = await (await engineer.get("/api/v1/studies?limit=1")).json();
    const id = studies[0].id;
    const saved = await (await engineer.get(`/api/v1/studies/${id}`)).json();
    // The first week of the study's period out of service: every hour of it is below any minimum.
    const start = Date.parse(saved.results.period.start);
    const week = { name: "First week out", start: new Date(start).toISOString(), end: new Date(start + 7 * 86_400_000).toISOString() };
    const res = await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { switchedOut: [week] });
    expect(res.status, await res.clone().text()).toBe(200);
    const answer = await res.json();
    expect(answer.summary.hoursBelowMin).toBeGreaterThan(saved.results.current.hoursBelowMin);
    // Below the minimum no longer than the known time outside the week plus the week (168 h).
    expect(answer.summary.hoursBelowMin - saved.results.current.hoursBelowMin).toBeLessThanOrEqual(168 + 1e-6);
    const backwards = await engineer.json(`/api/v1/studies/${id}/what-if`, "POST", { switchedOut: [{ ...week, start: week.end, end: week.start }] });
    expect(backwards.status).toBe(400);
    expect(JSON.stringify(await backwards.json())).toContain("A switched-out period must end after it starts.");
    // The page's form: one period a line; a bad line is named.
    const page = await viewer.post(`/studies/${id}`, { intent: "what-if", switchedOut: "Outage, 2025-04-02, 2025-04-01" });
    expect(page.status).toBe(400);
    expect(await page.text()).toContain("A switched-out period must end after it starts.");
    const good = await viewer.post(`/studies/${id}.data`, { intent: "what-if", switchedOut: `First week out, ${week.start.slice(0, 10)}, ${week.end.slice(0, 10)}` });
    expect(good.status).toBe(200);
    expect((await (await engineer.get(`/api/v1/studies/${id}`)).json()).results.current.hoursBelowMin).toBe(saved.results.current.hoursBelowMin);
  });

  it("offers the organisation's device profiles on the study page's what-if", async () => {
    const { studies } = await (await engineer.get("/api/v1/studies?limit=1")).json();
    const html = await (await viewer.get(`/studies/${studies[0].id}`)).text();
    expect(html).toContain('name="deviceProfileId"');
    expect(html).toContain("(this study&#x27;s)");
  });
});
