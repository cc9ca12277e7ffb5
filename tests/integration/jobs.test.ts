// Jobs (issue 8 "Studies off the event loop", issue 12 "Jobs"): async studies through the API,
// claiming with SKIP LOCKED, a stale job taken over, progress written while work runs, failures
// recorded; and a read that completes while a study computes on the worker pool.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { setTimeout as sleep } from "node:timers/promises";
import { request } from "node:http";
import { closeDb } from "../../db/index";
import { Job, Organisation, Study, User } from "../../db/models";
import { generateLoadCsv } from "../../lib/demo/load-generator";
import { claimNextJob, registerJobHandler, runClaimedJob } from "../../app/services/jobs.server";
import { InputError } from "../../app/services/errors.server";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { hashPassword } from "../../lib/passwords";

// This process claims only the test kinds below; the served app runs "study.run".
process.env.JOB_RUNNER = "false";

let engineer: Client;
let organisationId: number;
let userId: number;
let studyRequest: { crossingId: number; profileId: number; deviceProfileId: number; policy: Record<string, number> };

const DEVICE = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 10, chargeEfficiency: 0.9 };
// Invented: 60 days at 10 minutes.
const CSV = generateLoadCsv({ seed: 3, start: "2025-03-01T00:00:00Z", days: 60, intervalMinutes: 10, phases: 1, baseA: 70, dailySwingA: 35, seasonalSwingA: 10 });

async function waitForJob(id: number, until: (job: Job) => boolean, timeoutMs = 60_000): Promise<Job> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    // Reading the job through the API also starts the app's job runner.
    await engineer.get(`/api/v1/jobs/${id}`);
    const job = await Job.findByPk(id);
    if (job && until(job)) return job;
    if (Date.now() > deadline) throw new Error(`Job ${id} still ${job?.state} after ${timeoutMs} ms`);
    await sleep(200);
  }
}

beforeAll(async () => {
  testDb();
  // An engineer of the demo organisation of our own: other test files sign the demo accounts
  // out (password resets, deactivation), which would cut a long upload short.
  const demo = (await User.findOne({ where: { email: "engineer@example.com" } }))!;
  const email = `jobs-${randomUUID().slice(0, 8)}@example.com`;
  await User.create({ organisationId: demo.organisationId, email, name: "Jobs test engineer", role: "engineer", passwordHash: await hashPassword("jobs-test-pass-1"), active: true });
  engineer = await signIn(email, "jobs-test-pass-1");
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Jobs test ${randomUUID().slice(0, 6)}`, voltageKv: 115, phases: 1 })).json();
  const crossing = await (
    await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Job crossing", lat: 45, lon: -95, spanLength: { value: 800, unit: "ft" }, kind: "river" })
  ).json();
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Timestamp&currentColumn=${encodeURIComponent("I [A]")}`, {
    method: "POST",
    body: CSV,
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  const profileId = (await up.json()).profile.id;
  const device = await engineer.post("/devices/new", { name: `Job device ${randomUUID().slice(0, 6)}`, ...Object.fromEntries(Object.entries(DEVICE).map(([k, v]) => [k, String(v)])) });
  expect(device.status).toBe(302);
  studyRequest = { crossingId: crossing.id, profileId, deviceProfileId: Number(device.headers.get("location")!.split("/").pop()), policy: { minKnownHours: 24 * 30 } };
  const me = (await User.findOne({ where: { email } }))!;
  userId = me.id;
  organisationId = me.organisationId;
});
afterAll(async () => {
  await closeDb();
});

describe("async studies through the API", () => {
  it('"async": true gives 202 and a job that ends done with a link to the saved study', async () => {
    const res = await engineer.json("/api/v1/studies", "POST", { ...studyRequest, async: true });
    expect(res.status).toBe(202);
    const location = res.headers.get("location")!;
    expect(location).toMatch(/^\/api\/v1\/jobs\/\d+$/);
    expect((await res.json()).state).toMatch(/^(queued|running|done)$/);
    const id = Number(location.split("/").pop());
    await waitForJob(id, (j) => j.state === "done" || j.state === "failed");
    const job = await (await engineer.get(location)).json();
    expect(job.state).toBe("done");
    expect(job.progress).toBe(1);
    expect(job.resultUrl).toMatch(/^\/api\/v1\/studies\/\d+$/);
    const study = await engineer.get(job.resultUrl);
    expect(study.status).toBe(200);
    const body = await study.json();
    expect(body.crossingId).toBe(studyRequest.crossingId);
    expect(body.results.solvers.minStorage.iterations).toBeGreaterThan(0);
  });

  it("a bad request is refused at once, not queued", async () => {
    const before = await Job.count({ where: { organisationId } });
    const res = await engineer.json("/api/v1/studies", "POST", { ...studyRequest, deviceProfileId: 999_999, async: true });
    expect(res.status).toBe(404);
    expect(await Job.count({ where: { organisationId } })).toBe(before);
  });

  it("another organisation's job, and an unknown one, are not found", async () => {
    const other = await Organisation.create({ name: `Other utility ${randomUUID().slice(0, 6)}` });
    const theirs = await Job.create({ organisationId: other.id, kind: "matrix.idle", input: {}, createdBy: null });
    expect((await engineer.get(`/api/v1/jobs/${theirs.id}`)).status).toBe(404);
    expect((await engineer.get(`/jobs/${theirs.id}`)).status).toBe(404);
    expect((await engineer.get("/api/v1/jobs/999999999")).status).toBe(404);
  });

  it("the job page of a finished study job leads to the study", async () => {
    const res = await engineer.json("/api/v1/studies", "POST", { ...studyRequest, async: true });
    const id = Number(res.headers.get("location")!.split("/").pop());
    const job = await waitForJob(id, (j) => j.state === "done");
    const page = await engineer.get(`/jobs/${id}`);
    expect(page.status).toBe(302);
    expect(page.headers.get("location")).toBe(`/studies/${(job.result as { studyId: number }).studyId}`);
  });
});

describe("feasibility and batch studies as jobs (issue 12)", () => {
  const feasibility = { location: { lat: 45, lon: -95 }, device: DEVICE, csv: CSV, csvOptions: { timestampColumn: "Timestamp", currentColumn: "I [A]" }, policy: { minKnownHours: 24 * 30 } };

  it('feasibility with "async": true gives 202, a job, and at its result link the same results as a direct call', async () => {
    const direct = await engineer.json("/api/v1/feasibility", "POST", feasibility);
    expect(direct.status).toBe(200);
    const expected = await direct.json();
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...feasibility, async: true });
    expect(res.status).toBe(202);
    const location = res.headers.get("location")!;
    expect(location).toMatch(/^\/api\/v1\/jobs\/\d+$/);
    const id = Number(location.split("/").pop());
    await waitForJob(id, (j) => j.state === "done" || j.state === "failed");
    const job = await (await engineer.get(location)).json();
    expect(job.state).toBe("done");
    expect(job.kind).toBe("feasibility.run");
    expect(job.resultUrl).toBe(`/api/v1/jobs/${id}/result`);
    // The job shows a summary; the full results are only at the result link.
    expect(job.result).toEqual({ verdict: expected.verdict.status, availability: expected.lighting.availability });
    const result = await engineer.get(job.resultUrl);
    expect(result.status).toBe(200);
    const body = await result.json();
    expect(body.verdict).toEqual(expected.verdict);
    expect(body.lighting).toEqual(expected.lighting);
    expect(body.quality).toEqual(expected.quality);
  });

  it("a job's result link answers 409 until the job is done, and 404 for another organisation", async () => {
    const waiting = await Job.create({ organisationId, kind: "matrix.idle", input: {}, createdBy: null });
    const res = await engineer.get(`/api/v1/jobs/${waiting.id}/result`);
    expect(res.status).toBe(409);
    expect((await res.json()).state).toBe("queued");
    const other = await Organisation.create({ name: `Other utility ${randomUUID().slice(0, 6)}` });
    const theirs = await Job.create({ organisationId: other.id, kind: "matrix.idle", input: {}, createdBy: null, state: "done", result: { output: { secret: 1 } } });
    expect((await engineer.get(`/api/v1/jobs/${theirs.id}/result`)).status).toBe(404);
  });

  it("a bad feasibility body is refused at once (400), not queued", async () => {
    const before = await Job.count({ where: { organisationId } });
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...feasibility, device: { ...DEVICE, minCurrentA: "x" }, async: true });
    expect(res.status).toBe(400);
    expect(await Job.count({ where: { organisationId } })).toBe(before);
  });

  it("a feasibility job whose data has too few samples ends failed with the problem", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...feasibility, csv: "Timestamp,I [A]\n2025-01-01T00:00:00Z,50\n", async: true });
    expect(res.status).toBe(202);
    const id = Number(res.headers.get("location")!.split("/").pop());
    await waitForJob(id, (j) => j.state === "done" || j.state === "failed");
    const job = await (await engineer.get(`/api/v1/jobs/${id}`)).json();
    expect(job.state).toBe("failed");
    expect(job.error.status).toBe(422);
  });

  it("POST /api/v1/circuits/{id}/studies studies every crossing of the circuit as one job", async () => {
    const { circuitId } = (await (await engineer.get(`/api/v1/crossings/${studyRequest.crossingId}`)).json()) as { circuitId: number };
    const second = await (
      await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: `Batch crossing ${randomUUID().slice(0, 6)}`, lat: 46, lon: -94, spanLength: { value: 500, unit: "ft" }, kind: "road" })
    ).json();
    const crossings = ((await (await engineer.get(`/api/v1/circuits/${circuitId}`)).json()).crossings as { id: number }[]).map((c) => c.id);
    expect(crossings).toContain(second.id);
    const { crossingId: _c, ...batch } = studyRequest;
    const res = await engineer.json(`/api/v1/circuits/${circuitId}/studies`, "POST", batch);
    expect(res.status).toBe(202);
    const id = Number(res.headers.get("location")!.split("/").pop());
    await waitForJob(id, (j) => j.state === "done" || j.state === "failed", 120_000);
    const job = await (await engineer.get(`/api/v1/jobs/${id}`)).json();
    expect(job.state).toBe("done");
    expect(job.resultUrl).toBe(`/api/v1/circuits/${circuitId}`);
    const studied = job.result.studies as { crossingId: number; studyId: number; verdict: string }[];
    expect(studied.map((s) => s.crossingId).sort()).toEqual([...crossings].sort());
    for (const s of studied) {
      const study = await Study.findByPk(s.studyId);
      expect(study!.crossingId).toBe(s.crossingId);
      expect(study!.verdict).toBe(s.verdict);
    }
  });

  it("a batch with another circuit's profile is refused at once (422 naming profileId), not queued", async () => {
    const other = await (await engineer.json("/api/v1/circuits", "POST", { name: `Batch other ${randomUUID().slice(0, 6)}`, voltageKv: 69, phases: 1 })).json();
    await engineer.json(`/api/v1/circuits/${other.id}/crossings`, "POST", { name: "Lone crossing", lat: 44, lon: -93, spanLength: { value: 300, unit: "ft" }, kind: "river" });
    const before = await Job.count({ where: { organisationId } });
    const { crossingId: _c, ...batch } = studyRequest;
    const res = await engineer.json(`/api/v1/circuits/${other.id}/studies`, "POST", batch);
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0].path).toBe("profileId");
    expect(await Job.count({ where: { organisationId } })).toBe(before);
  });
});

describe("claiming", () => {
  it("SKIP LOCKED: a job locked by another claimer is passed over, not waited for", async () => {
    const kind = `test.lock.${randomUUID().slice(0, 8)}`;
    const first = await Job.create({ organisationId, kind, input: {}, createdBy: userId });
    const second = await Job.create({ organisationId, kind, input: {}, createdBy: userId });
    const sequelize = Job.sequelize!;
    const holder = await sequelize.transaction();
    try {
      await Job.findByPk(first.id, { lock: holder.LOCK.UPDATE, transaction: holder });
      const claimed = await Promise.race([claimNextJob("test-instance-b", [kind], 30), sleep(5000).then(() => "blocked" as const)]);
      expect(claimed).not.toBe("blocked");
      expect((claimed as Job).id).toBe(second.id);
    } finally {
      await holder.commit();
    }
    expect((await claimNextJob("test-instance-b", [kind], 30))?.id).toBe(first.id);
    expect(await claimNextJob("test-instance-b", [kind], 30)).toBeNull();
    const rows = await Job.findAll({ where: { kind } });
    expect(rows.map((r) => [r.state, r.claimedBy, r.attempts])).toEqual([
      ["running", "test-instance-b", 1],
      ["running", "test-instance-b", 1],
    ]);
  });

  it("a running job with a fresh heartbeat is left alone; a stale one is claimed again", async () => {
    const kind = `test.stale.${randomUUID().slice(0, 8)}`;
    const fresh = await Job.create({ organisationId, kind, input: {}, createdBy: userId, state: "running", claimedBy: "alive", heartbeatAt: new Date(), attempts: 1 });
    const stale = await Job.create({ organisationId, kind, input: {}, createdBy: userId, state: "running", claimedBy: "gone", heartbeatAt: new Date(Date.now() - 120_000), attempts: 1 });
    const claimed = await claimNextJob("test-instance-c", [kind], 30);
    expect(claimed?.id).toBe(stale.id);
    expect(claimed?.attempts).toBe(2);
    expect(await claimNextJob("test-instance-c", [kind], 30)).toBeNull();
    await fresh.reload();
    expect(fresh.claimedBy).toBe("alive");
  });

  it("the served app takes over a study job whose instance was killed (stale heartbeat) and finishes it", async () => {
    const orphan = await Job.create({
      organisationId,
      kind: "study.run",
      input: studyRequest,
      createdBy: userId,
      state: "running",
      progress: 0.4,
      claimedBy: "killed-instance",
      heartbeatAt: new Date(Date.now() - 10 * 60_000),
      startedAt: new Date(Date.now() - 10 * 60_000),
      attempts: 1,
    });
    const job = await waitForJob(orphan.id, (j) => j.state === "done" || j.state === "failed");
    expect(job.state).toBe("done");
    expect(job.claimedBy).not.toBe("killed-instance");
    expect(job.attempts).toBe(2);
    const studyId = (job.result as { studyId: number }).studyId;
    expect(await Study.count({ where: { id: studyId, crossingId: studyRequest.crossingId } })).toBe(1);
  });

  it("a job that stopped its instance three times is marked failed, not run again", async () => {
    const poison = await Job.create({
      organisationId,
      kind: "study.run",
      input: studyRequest,
      createdBy: userId,
      state: "running",
      claimedBy: "killed-instance",
      heartbeatAt: new Date(Date.now() - 10 * 60_000),
      attempts: 3,
    });
    const job = await waitForJob(poison.id, (j) => j.state === "failed" || j.state === "done");
    expect(job.state).toBe("failed");
    expect(job.error?.title).toBe("Job abandoned");
    expect(job.attempts).toBe(3);
  });
});

describe("running a claimed job", () => {
  it("writes progress while the work runs and the outcome at the end", async () => {
    const kind = `test.progress.${randomUUID().slice(0, 8)}`;
    let release!: () => void;
    const released = new Promise<void>((r) => (release = r));
    registerJobHandler(kind, async (input, { progress, actor }) => {
      progress(0.5);
      await released;
      return { resultUrl: "/somewhere/1", result: { echoed: input.value, by: actor.id } };
    });
    const created = await Job.create({ organisationId, kind, input: { value: 7 }, createdBy: userId });
    const claimed = (await claimNextJob("test-instance-d", [kind], 30))!;
    const running = runClaimedJob(claimed, "test-instance-d", 10_000);
    const deadline = Date.now() + 10_000;
    while ((await Job.findByPk(created.id))!.progress !== 0.5) {
      if (Date.now() > deadline) throw new Error("progress not written");
      await sleep(50);
    }
    expect((await Job.findByPk(created.id))!.state).toBe("running");
    release();
    await running;
    const done = (await Job.findByPk(created.id))!;
    expect([done.state, done.progress, done.resultUrl]).toEqual(["done", 1, "/somewhere/1"]);
    expect(done.result).toEqual({ echoed: 7, by: userId });
  });

  it("records a failure as problem fields naming the input", async () => {
    const kind = `test.fail.${randomUUID().slice(0, 8)}`;
    registerJobHandler(kind, async () => {
      throw new InputError("Storage must be at least 1 Wh.", "device.storageWh", 422);
    });
    const created = await Job.create({ organisationId, kind, input: {}, createdBy: userId });
    await runClaimedJob((await claimNextJob("test-instance-e", [kind], 30))!, "test-instance-e", 10_000);
    const failed = (await Job.findByPk(created.id))!;
    expect(failed.state).toBe("failed");
    expect(failed.error).toMatchObject({ status: 422, detail: "Storage must be at least 1 Wh.", errors: [{ path: "device.storageWh", message: "Storage must be at least 1 Wh." }] });
    expect(failed.finishedAt).toBeInstanceOf(Date);
  });

  it("the served app records a study job on a crossing that does not exist as failed with 404", async () => {
    const bad = await Job.create({ organisationId, kind: "study.run", input: { ...studyRequest, crossingId: 999_999 }, createdBy: userId });
    const job = await waitForJob(bad.id, (j) => j.state === "failed" || j.state === "done");
    expect(job.state).toBe("failed");
    expect(job.error).toMatchObject({ status: 404 });
  });
});

describe("the event loop while a study computes", () => {
  it("a read sent after a long feasibility study completes before the study does", async () => {
    // Invented: three years at 5 minutes, ~315,000 rows: a second or more of ingest and engine
    // (a job by its size, unless "async" is false: here the request itself waits).
    const csv = generateLoadCsv({ seed: 11, start: "2023-01-01T00:00:00Z", days: 1095, intervalMinutes: 5, phases: 1, baseA: 80, dailySwingA: 30, seasonalSwingA: 15 });
    const finished: string[] = [];
    // A fresh connection: making the CSV takes seconds, and a pooled keep-alive socket may be
    // closed by the server meanwhile (the body write would then fail with EPIPE).
    const body = JSON.stringify({ location: { lat: 45, lon: -95 }, device: DEVICE, csv, csvOptions: { timestampColumn: "Timestamp", currentColumn: "I [A]" }, async: false });
    const study = new Promise<{ status: number }>((resolve, reject) => {
      const req = request(`${baseUrl()}/api/v1/feasibility`, { method: "POST", agent: false, headers: { cookie: engineer.cookie, "content-type": "application/json", "content-length": String(Buffer.byteLength(body)) } }, (res) => {
        res.resume();
        res.on("end", () => {
          finished.push("study");
          resolve({ status: res.statusCode ?? 0 });
        });
      });
      req.on("error", reject);
      req.end(body);
    });
    await sleep(300);
    const read = await engineer.get("/api/v1/portfolio");
    finished.push("read");
    expect(read.status).toBe(200);
    expect((await study).status).toBe(200);
    expect(finished).toEqual(["read", "study"]);
  });
});
