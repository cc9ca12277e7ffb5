// The study report end to end: a studied, signed-off crossing's report as a PDF (page route and
// API, session and key) and as the printable page; the text is read back with pdf.js.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { baseUrl, client, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { pdfText } from "../support/pdf";

let engineer: Client;
let manager: Client;
let crossingName: string;
let studyId: number;
let verdict: string;

const DEVICE = { minCurrentA: "40", maxCurrentA: "2000", harvestW: "min(0.004*I^2, 15)", loadW: "4", standbyW: "0.1", storageWh: "0", chargeEfficiency: "0.9" };

beforeAll(async () => {
  testDb();
  [engineer, manager] = await Promise.all(["engineer", "manager"].map((r) => signIn(`${r}@example.com`)));
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Report test ${randomUUID().slice(0, 6)}`, voltageKv: 69, phases: 1 })).json();
  // Two days of 5-minute samples: the first day well above the minimum, the second far below it.
  const start = Date.UTC(2025, 10, 1);
  const rows = Array.from({ length: 576 }, (_, i) => `${new Date(start + i * 300_000).toISOString()},${i < 288 ? 100 : 10}`);
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps`, {
    method: "POST",
    body: ["Time,Amps", ...rows].join("\n"),
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  const profileId = (await up.json()).profile.id;
  const device = await engineer.post("/devices/new", { name: `Report device ${randomUUID().slice(0, 6)}`, ...DEVICE });
  const deviceProfileId = Number(device.headers.get("location")!.split("/").pop());
  crossingName = `Report river ${randomUUID().slice(0, 6)}`;
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: crossingName, lat: 38.6, lon: -92.2, spanLength: { value: 900, unit: "ft" }, kind: "river" })).json();
  const study = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId, deviceProfileId, policy: { minKnownHours: 0, minCoverage: 0 } });
  expect(study.status).toBe(201);
  const saved = await study.json();
  studyId = saved.id;
  verdict = saved.verdict;
  const move = (c: Client, body: Record<string, unknown>) => c.json(`/api/v1/crossings/${crossing.id}/review`, "POST", body);
  expect((await move(engineer, { action: "submit", comment: "Report test submission." })).status).toBe(200);
  expect((await move(manager, { action: "approve", comment: "Do not fit here.", decision: "do-not-proceed" })).status).toBe(200);
});
afterAll(async () => {
  await closeDb();
});

const VERDICT_WORDS: Record<string, string> = { go: "Go", marginal: "Marginal", "no-go": "No-go", "insufficient-data": "Insufficient data" };

describe("study report", () => {
  it("downloads from the study page as a PDF naming the crossing, the verdict and the signer", async () => {
    const res = await engineer.get(`/studies/${studyId}/report.pdf`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toBe(`attachment; filename="duskline-study-${studyId}-report.pdf"`);
    // Its own caching rule, alone (the server's no-store default does not add a second one).
    expect(res.headers.get("cache-control")).toBe("private, no-store");
    const read = await pdfText(new Uint8Array(await res.arrayBuffer()));
    expect(read.text).toContain(crossingName);
    expect(read.text).toContain(`Verdict: ${VERDICT_WORDS[verdict]}`);
    expect(read.text).toContain("Signed by Morgan Manager");
    expect(read.text).toContain("Do not proceed");
    expect(read.text).toContain("licensed engineering practice");
  });

  it("is the same report through the API, and 404 for a study of no one's", async () => {
    const res = await manager.get(`/api/v1/studies/${studyId}/report.pdf`);
    expect(res.status).toBe(200);
    const read = await pdfText(new Uint8Array(await res.arrayBuffer()));
    expect(read.text).toContain(crossingName);
    const missing = await manager.get(`/api/v1/studies/999999999/report.pdf`);
    expect(missing.status).toBe(404);
    expect(missing.headers.get("content-type")).toBe("application/problem+json");
    expect((await client().get(`/api/v1/studies/${studyId}/report.pdf`)).status).toBe(401);
  });

  it("has a printable page with the same sections and the caution", async () => {
    const html = await (await engineer.get(`/studies/${studyId}/report`)).text();
    expect(html).toContain(crossingName);
    for (const heading of ["Night by night", "Monthly figures", "Load-duration curve", "Review and decision", "Rule references", "Data quality", "Lighting options and costs"]) {
      expect(html).toContain(heading);
    }
    expect(html).toContain("Morgan Manager");
    expect(html).toContain("Planning aid only.");
    // The study page offers both.
    const page = await (await engineer.get(`/studies/${studyId}`)).text();
    expect(page).toContain(`href="/studies/${studyId}/report.pdf"`);
    expect(page).toContain(`href="/studies/${studyId}/report"`);
  });

  it("shows the night-by-night calendar on the study page, each night labelled in words", async () => {
    const page = await (await engineer.get(`/studies/${studyId}`)).text();
    expect(page).toContain("Night by night");
    // Nights run from local solar noon (18:09 UTC at 92.2° W) and carry their evening's date. The
    // night of 31 October ends on 1 November's 100 A: lit. The night of 1 November runs into
    // 2 November's 10 A, below the 40 A minimum: partly dark. The night of 2 November is all below it: dark.
    // Each night's words are its link's title: its hover text and its accessible name.
    expect(page).toContain('title="Night of 2025-10-31: lit all night; 0 min dark of');
    expect(page).toContain('title="Night of 2025-11-01: partly dark;');
    expect(page).toContain('title="Night of 2025-11-02: dark;');
    expect(page).toMatch(new RegExp(`href="/studies/${studyId}\\?from=2025-1[01]-\\d\\dT\\d\\d:\\d\\d:\\d\\d.000Z&amp;to=`));
  });
});
