// The portfolio a manager works from: never-studied crossings listed, filters and sort in the URL,
// count tiles that link to the filtered view, the CSV of exactly that view, and the offline map.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import Papa from "papaparse";
import { closeDb } from "../../db/index";
import { signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let manager: Client;
let crossingName: string;
let crossingId: number;
let circuitId: number;

beforeAll(async () => {
  testDb();
  const engineer = await signIn("engineer@example.com");
  manager = await signIn("manager@example.com");
  const tag = randomUUID().slice(0, 6);
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Portfolio test ${tag}`, voltageKv: 230, phases: 3 })).json();
  circuitId = circuit.id;
  crossingName = `Unstudied gorge ${tag}`;
  const crossing = await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: crossingName, lat: 44.2, lon: -110.5, spanLength: { value: 400, unit: "m" }, kind: "canyon" });
  expect(crossing.status).toBe(201);
  crossingId = (await crossing.json()).id;
});
afterAll(async () => {
  await closeDb();
});

describe("portfolio", () => {
  it("lists a never-studied crossing as such, and under needs attention", async () => {
    const p = await (await manager.get("/api/v1/portfolio")).json();
    const row = p.rows.find((r: { crossingId: number }) => r.crossingId === crossingId);
    expect(row).toMatchObject({ crossing: crossingName, verdict: null, studyId: null, reviewState: "draft", reviewStale: false });
    expect(p.attention.map((r: { crossingId: number }) => r.crossingId)).toContain(crossingId);
    expect(p.counts["not-studied"]).toBeGreaterThanOrEqual(1);
    const html = await (await manager.get("/portfolio")).text();
    expect(html).toContain("never studied");
  });

  it("filters by the URL, and its count tiles link to filtered views", async () => {
    const all = await (await manager.get("/portfolio")).text();
    for (const href of ["/portfolio?verdict=go", "/portfolio?verdict=no-go", "/portfolio?verdict=not-studied", "/portfolio?review=stale", "/portfolio?attention=1"]) {
      expect(all).toContain(`href="${href}"`);
    }
    const notStudied = await (await manager.get("/portfolio?verdict=not-studied")).text();
    expect(notStudied).toMatch(new RegExp(`data-crossing="${crossingId}"`));
    const go = await (await manager.get("/portfolio?verdict=go")).text();
    expect(go).not.toMatch(new RegExp(`<tr data-crossing="${crossingId}"`));
    const sorted = await (await manager.get("/portfolio?sort=crossing&dir=desc")).text();
    expect(sorted).toMatch(/aria-sort="descending"/);
  });

  it("a view seen before shows a change at once (the kept view is per version of the data)", async () => {
    const engineer = await signIn("engineer@example.com");
    const view = `/portfolio?crossing=${encodeURIComponent(crossingName)}`;
    const before = await (await manager.get(view)).text();
    expect(before).toContain(`<tr data-crossing="${crossingId}"`);
    const again = await (await manager.get(view)).text();
    expect(again).toContain(`<tr data-crossing="${crossingId}"`);
    const added = await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: `${crossingName} east`, lat: 44.3, lon: -110.4, spanLength: { value: 300, unit: "m" }, kind: "canyon" });
    expect(added.status).toBe(201);
    const addedId = (await added.json()).id;
    const after = await (await manager.get(view)).text();
    expect(after).toContain(`<tr data-crossing="${crossingId}"`);
    expect(after).toContain(`<tr data-crossing="${addedId}"`);
    const deleted = await engineer.json(`/api/v1/crossings/${addedId}`, "DELETE");
    expect(deleted.status).toBe(204);
    expect(await (await manager.get(view)).text()).not.toContain(`<tr data-crossing="${addedId}"`);
  });

  it("exports exactly the filtered view as CSV with readable headers and words", async () => {
    const res = await manager.get(`/portfolio.csv?crossing=${encodeURIComponent(crossingName)}`);
    expect(res.status).toBe(200);
    const parsed = Papa.parse<Record<string, string>>((await res.text()).trim(), { header: true });
    expect(parsed.data).toHaveLength(1);
    expect(parsed.data[0]).toMatchObject({ Crossing: crossingName, Kind: "Canyon", Verdict: "Not studied", Review: "Draft", "Voltage (kV)": "230" });
    const none = await manager.get(`/portfolio.csv?crossing=${encodeURIComponent(crossingName)}&verdict=go`);
    expect((await none.text()).trim().split("\r\n")).toHaveLength(1);
  });

  it("draws the crossings on an offline map on the portfolio and the circuit page, each a link", async () => {
    const html = await (await manager.get("/portfolio")).text();
    expect(html).toContain('data-testid="crossings-map"');
    expect(html).toMatch(new RegExp(`<a(?=[^>]*href="/crossings/${crossingId}")(?=[^>]*data-crossing="${crossingId}")`));
    const circuitPage = await (await manager.get(`/circuits/${circuitId}`)).text();
    expect(circuitPage).toContain('data-testid="crossings-map"');
    expect(circuitPage).toContain(`aria-label="${crossingName}: Not studied, review draft"`);
  });
});
