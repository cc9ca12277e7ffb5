// MariaDB stopped under a running app: answers are 503 "try again" (never 500), nothing is
// half-saved, and the same process serves again once the database is back.
import http from "node:http";
import { randomUUID } from "node:crypto";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "../../db/index";
import { AuditEntry, LoadProfile, LoadProfileSeries, Study } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { appUserConnection, databaseRunning, startDatabase, stopDatabase, waitForBlockedStatement } from "../support/db-instance";
import { createScene, dayCsv, studyBody, uploadCsv, type Scene } from "./fixtures";

let engineer: Client;
let scene: Scene;

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  scene = await createScene(engineer);
});
// Whatever a test did, the database runs again before the next one (and before other files).
afterEach(async () => {
  if (!(await databaseRunning())) await startDatabase();
});
afterAll(async () => {
  if (!(await databaseRunning())) await startDatabase();
  await closeDb();
});

async function expectRetryProblem(res: Response) {
  expect(res.status).toBe(503);
  expect(res.headers.get("content-type")).toContain("application/problem+json");
  expect(Number(res.headers.get("retry-after"))).toBeGreaterThan(0);
  const body = await res.json();
  expect(body.status).toBe(503);
  expect(body.detail).toMatch(/try again/i);
  return body;
}

/** Sends the headers and the first 64 KB of a 20 MB upload, then waits for an answer without sending more. */
function answerBeforeBody(path: string): Promise<{ status: number; body: string; ms: number }> {
  return new Promise((resolve, reject) => {
    const started = Date.now();
    const req = http.request(`${baseUrl()}${path}`, {
      method: "POST",
      headers: { cookie: engineer.cookie, "x-forwarded-for": engineer.address, "content-type": "text/csv", "content-length": String(20 * 1024 * 1024) },
    });
    const timer = setTimeout(() => (req.destroy(), reject(new Error("no answer within 10 s: the server waited for the body"))), 10_000);
    req.on("response", (res) => {
      let body = "";
      res.on("data", (d) => (body += d));
      res.on("end", () => (clearTimeout(timer), req.destroy(), resolve({ status: res.statusCode!, body, ms: Date.now() - started })));
    });
    req.on("error", (error) => (clearTimeout(timer), reject(error)));
    req.write(dayCsv(3).slice(0, 64 * 1024));
  });
}

describe("database stopped", () => {
  it("refuses an upload at once, before its body is read, and the API and pages answer 503", async () => {
    await stopDatabase();
    const answer = await answerBeforeBody(`/api/v1/circuits/${scene.circuitId}/profiles?timestampColumn=Time&currentColumn=Amps`);
    expect(answer.status).toBe(503);
    expect(JSON.parse(answer.body).detail).toMatch(/try again/i);

    await expectRetryProblem(await engineer.get("/api/v1/circuits"));
    await expectRetryProblem(await engineer.json(`/api/v1/circuits/${scene.circuitId}/crossings`, "POST", { name: "While down", lat: 1, lon: 1, spanLength: { value: 100, unit: "m" }, kind: "road" }));

    const page = await engineer.get(`/circuits/${scene.circuitId}`);
    expect(page.status).toBe(503);
    const html = await page.text();
    expect(html).toContain("Duskline is briefly unavailable");
    expect(html).toContain("try again");
    // A client-side navigation asks for the route's data: the same 503.
    const data = await engineer.get(`/circuits/${scene.circuitId}.data`);
    expect(data.status).toBe(503);

    await startDatabase();
    const back = await engineer.get(`/api/v1/circuits/${scene.circuitId}`);
    expect(back.status).toBe(200);
    expect((await engineer.get(`/circuits/${scene.circuitId}`)).status).toBe(200);
  });

  it("stopping in the middle of an upload's transaction leaves no profile, and the same process takes the retry", async () => {
    const name = `mid-upload ${randomUUID().slice(0, 8)}`;
    const auditsBefore = await AuditEntry.count({ where: { action: "profile.uploaded" } });
    const seriesBefore = await LoadProfileSeries.count();
    // Hold the audit log, written last in the upload's transaction: the upload stops there,
    // with its profile and samples rows inserted but not committed.
    const lock = await appUserConnection();
    await lock.query("LOCK TABLES audit_log WRITE");
    const pending = uploadCsv(engineer, scene.circuitId, dayCsv(3), name);
    await waitForBlockedStatement("INSERT INTO `audit_log`");
    await stopDatabase();
    await expectRetryProblem(await pending);
    await lock.end().catch(() => {});

    await startDatabase();
    expect(await LoadProfile.count({ where: { name } })).toBe(0);
    expect(await AuditEntry.count({ where: { action: "profile.uploaded" } })).toBe(auditsBefore);
    expect(await LoadProfileSeries.count()).toBe(seriesBefore);
    const retry = await uploadCsv(engineer, scene.circuitId, dayCsv(3), name);
    expect(retry.status).toBe(201);
    expect(await LoadProfile.count({ where: { name } })).toBe(1);
  });

  it("stopping while a study is saved answers 503 and keeps no study; the retry runs", async () => {
    const before = await Study.count({ where: { crossingId: scene.crossingId } });
    const lock = await appUserConnection();
    await lock.query("LOCK TABLES audit_log WRITE");
    const pending = engineer.json("/api/v1/studies", "POST", studyBody(scene));
    await waitForBlockedStatement("INSERT INTO `audit_log`");
    await stopDatabase();
    await expectRetryProblem(await pending);
    await lock.end().catch(() => {});

    await startDatabase();
    expect(await Study.count({ where: { crossingId: scene.crossingId } })).toBe(before);
    const retry = await engineer.json("/api/v1/studies", "POST", studyBody(scene));
    expect(retry.status).toBe(201);
    expect(await Study.count({ where: { crossingId: scene.crossingId } })).toBe(before + 1);
  });
});
