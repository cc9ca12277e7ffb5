import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { LoadProfile, LoadProfileSeries } from "../../db/models";
import { decodeAmps, decodeTimes } from "../../lib/series-codec";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

let engineer: Client;
let circuitId: number;

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  const res = await engineer.json("/api/v1/circuits", "POST", { name: `Upload test ${randomUUID().slice(0, 6)}`, voltageKv: 138, phases: 3 });
  expect(res.status).toBe(201);
  circuitId = (await res.json()).id;
});
afterAll(async () => {
  await closeDb();
});

function upload(csv: string | Blob, query: Record<string, string>, contentType = "text/csv") {
  return fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?${new URLSearchParams(query)}`, {
    method: "POST",
    body: csv,
    headers: { cookie: engineer.cookie, "x-forwarded-for": engineer.address, "content-type": contentType },
  });
}

// Two days of 15-minute samples in a historian-style export with a metadata line.
function sampleCsv(): string {
  const lines = ["# exported from a test historian", "Time;IA [kA];Quality"];
  const start = Date.UTC(2025, 0, 1);
  for (let i = 0; i < 192; i++) {
    const t = new Date(start + i * 900_000).toISOString();
    lines.push(`${t};${(0.1 + 0.001 * (i % 10)).toFixed(3).replace(".", ",")};${i === 5 ? 0 : 192}`);
  }
  return lines.join("\r\n") + "\r\n";
}

describe("circuits and crossings API", () => {
  it("creates, lists and reads circuits and crossings", async () => {
    const created = await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", {
      name: "North bank",
      lat: 44.1,
      lon: -101.2,
      spanLength: { value: 1200, unit: "ft" },
      kind: "river",
    });
    expect(created.status).toBe(201);
    const crossing = await created.json();
    expect(crossing).toMatchObject({ circuitId, name: "North bank", spanLength: { value: 1200, unit: "ft" }, kind: "river" });

    const list = await (await engineer.get("/api/v1/circuits")).json();
    expect(list.circuits.some((c: { id: number }) => c.id === circuitId)).toBe(true);
    const one = await (await engineer.get(`/api/v1/circuits/${circuitId}`)).json();
    expect(one.crossings.map((x: { name: string }) => x.name)).toContain("North bank");
  });

  it("rejects bad fields with problem+json naming each path", async () => {
    const res = await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: "", lat: 100, lon: 0, spanLength: { value: -1, unit: "yd" }, kind: "sea" });
    expect(res.status).toBe(400);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    const body = await res.json();
    const paths = body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["name", "lat", "spanLength.value", "spanLength.unit", "kind"]));
  });

  it("refuses a duplicate circuit name with 409 and a consultant's write with 403", async () => {
    const name = (await (await engineer.get(`/api/v1/circuits/${circuitId}`)).json()).name;
    const dup = await engineer.json("/api/v1/circuits", "POST", { name, voltageKv: 69, phases: 3 });
    expect(dup.status).toBe(409);
    expect((await dup.json()).errors[0]).toMatchObject({ path: "name" });
    const consultant = await signIn("consultant@example.com");
    const res = await consultant.json("/api/v1/circuits", "POST", { name: "x", voltageKv: 69, phases: 3 });
    expect(res.status).toBe(403);
  });

  it("answers 404 problem+json for another id and for unknown API paths", async () => {
    expect((await engineer.get("/api/v1/circuits/999999")).status).toBe(404);
    const res = await engineer.get("/api/v1/nothing-here");
    expect(res.status).toBe(404);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
  });
});

describe("profile upload", () => {
  it("streams a CSV in, stores it compactly and reports its quality", async () => {
    const res = await upload(sampleCsv(), { timestampColumn: "Time", currentColumn: "IA [kA]", unit: "kA", decimal: ",", qualityColumn: "Quality", name: "Two days" });
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.profile).toMatchObject({ name: "Two days", phases: ["A"], samples: 191, start: "2025-01-01T00:00:00.000Z" });
    expect(body.quality.rowsRead).toBe(192);
    expect(body.quality.invalid["bad-quality"]).toBe(1);
    expect(body.quality.medianIntervalSeconds).toBe(900);

    const row = await LoadProfileSeries.findByPk(body.profile.id);
    // Regular 15-minute times shrink to a few bytes (run-length deltas); amps are Float32.
    const times = decodeTimes(row!.times);
    expect(times.length).toBe(191);
    expect(row!.times.length).toBeLessThan(100);
    expect(times[0]).toBe(Date.UTC(2025, 0, 1) / 1000);
    expect(times[190] - times[189]).toBe(900);
    const amps = decodeAmps(row!.phaseA!);
    expect(row!.phaseA!.length).toBe(191 * 4);
    expect(amps[0]).toBeCloseTo(100, 3); // 0,100 kA → 100 A
    expect(amps[1]).toBeCloseTo(101, 3);
    expect(row!.phaseB).toBeNull();

    const listed = await (await engineer.get(`/api/v1/circuits/${circuitId}/profiles`)).json();
    expect(listed.profiles.find((p: { id: number }) => p.id === body.profile.id).quality.rowsRead).toBe(192);

    const page = await engineer.get(`/profiles/${body.profile.id}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Coverage by month");

    const del = await fetch(`${baseUrl()}/api/v1/profiles/${body.profile.id}`, { method: "DELETE", headers: { cookie: engineer.cookie } });
    expect(del.status).toBe(204);
    expect(await LoadProfileSeries.findByPk(body.profile.id)).toBeNull();
  });

  it("a failed upload saves nothing and names the problem", async () => {
    const before = await LoadProfile.count();
    const missing = await upload(sampleCsv(), { timestampColumn: "Time", currentColumn: "Amps" });
    expect(missing.status).toBe(422);
    expect((await missing.json()).detail).toContain('Column "Amps" is not in the header');

    const empty = await upload("", { timestampColumn: "Time", currentColumn: "IA" });
    expect(empty.status).toBe(422);
    expect((await empty.json()).title).toBe("Empty file");

    const zip = await upload(new Blob([new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 0, 1, 2, 3, 0, 0, 0])]), { timestampColumn: "Time", currentColumn: "IA" });
    expect(zip.status).toBe(422);
    expect((await zip.json()).detail).toContain("ZIP archive");

    const pdf = await upload("%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\n", { timestampColumn: "Time", currentColumn: "IA" });
    expect(pdf.status).toBe(422);
    expect((await pdf.json()).detail).toContain("PDF document");

    const binary = await upload(new Blob([new Uint8Array(2000).map((_, i) => (i * 37) % 256)]), { timestampColumn: "Time", currentColumn: "IA" });
    expect(binary.status).toBe(415);

    const garbage = ["Time,IA", ...Array.from({ length: 20 }, (_, i) => (i % 3 === 0 ? `2025-01-01T00:${String(i).padStart(2, "0")}:00Z,12` : `not a time,${i}`))].join("\n");
    const bad = await upload(garbage, { timestampColumn: "Time", currentColumn: "IA" });
    expect(bad.status).toBe(400);
    const problem = await bad.json();
    expect(problem.examples.length).toBeGreaterThan(0);
    expect(problem.examples.length).toBeLessThanOrEqual(10);
    expect(problem.examples[0]).toMatchObject({ line: expect.any(Number), problem: expect.any(String) });

    const badOption = await upload(sampleCsv(), { timestampColumn: "Time", currentColumn: "IA [kA]", timezone: "Mars/Olympus" });
    expect(badOption.status).toBe(400);
    expect((await badOption.json()).errors[0].path).toBe("timezone");

    expect(await LoadProfile.count()).toBe(before);
  });

  it("refuses a JSON body with 415", async () => {
    const res = await upload("{}", { timestampColumn: "Time", currentColumn: "IA" }, "application/json");
    expect(res.status).toBe(415);
  });
});

describe("circuit pages", () => {
  it("the new-circuit form shows field errors and saves nothing half-done", async () => {
    const res = await engineer.post("/circuits/new", { name: "", voltageKv: "abc", phases: "9" });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain("Enter a name.");
    expect(html).toContain("At most 6 phases.");
  });

  it("the new-circuit form creates and redirects to the circuit", async () => {
    const res = await engineer.post("/circuits/new", { name: `Form circuit ${randomUUID().slice(0, 6)}`, voltageKv: "69", phases: "3", normalRatingA: "" });
    expect(res.status).toBe(302);
    const page = await engineer.get(res.headers.get("location")!);
    expect(page.status).toBe(200);
    expect(await page.text()).toMatch(/Form circuit [0-9a-f]{6}/);
  });
});
