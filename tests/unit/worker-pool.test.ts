// The engine on the pool of worker processes must give exactly what the engine gives on the
// calling thread, report progress, bring its errors back as the engine's own classes, leave the
// calling thread's event loop free while it computes, and run every thread of its processes at
// the lower priority.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readdirSync, readFileSync } from "node:fs";
import { setTimeout as sleep } from "node:timers/promises";
import { generateLoadCsv } from "../../lib/demo/load-generator";
import { ingestCsvText, IngestError } from "../../lib/ingest/ingest";
import { encodeAmps, encodeTimes } from "../../lib/series-codec";
import { DeviceError } from "../../lib/engine/device";
import { PhaseError, runEngineTaskInThread, type EncodedProfile } from "../../lib/engine/worker";
import { childProcesses } from "../support/app-process";
import { closeWorkerPool, EngineStoppedError, runFeasibilityOnPool, runStudyOnPool } from "../../app/utils/worker-pool.server";

const csvOptions = { timestampColumn: "Timestamp", phaseA: "IA [A]", phaseB: "IB [A]", phaseC: "IC [A]", qualityColumn: "Quality" };
// Invented 3-phase history: 120 days at 10 minutes with an outage and a gap.
const csv = generateLoadCsv({
  seed: 7,
  start: "2025-01-01T00:00:00Z",
  days: 120,
  intervalMinutes: 10,
  phases: 3,
  baseA: 90,
  dailySwingA: 40,
  seasonalSwingA: 20,
  outages: [{ startDay: 30, hours: 20 }],
  gaps: [{ startDay: 60, hours: 6 }],
});
const device = { minCurrentA: 60, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 30, chargeEfficiency: 0.9 };
const input = { device, schedule: { kind: "night" as const, sunAltitudeDeg: -0.833 }, location: { lat: 47.5, lon: 8.5 }, params: { phase: "A" as const }, policy: { minKnownHours: 24 * 30 } };

const threadsOf = (pid: number) => readdirSync(`/proc/${pid}/task`);

/** The pool's processes (Linux): this process's children whose command line runs the engine's entry. */
function engineProcesses(): number[] {
  return childProcesses(process.pid).filter((pid) => readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("engine-process"));
}

/** The stored form of the profile. */
function encodedProfile(): EncodedProfile {
  const { series } = ingestCsvText(csv, csvOptions);
  return { times: encodeTimes(series.t), phases: { A: encodeAmps(series.phases.A!), B: encodeAmps(series.phases.B!), C: encodeAmps(series.phases.C!) } };
}

beforeAll(() => {
  process.env.ENGINE_PROCESSES = "1";
});
afterAll(() => closeWorkerPool());

describe("engine on the pool of worker processes", () => {
  it("a saved study with both solvers equals the in-thread engine, with rising progress up to 1", async () => {
    const progress: number[] = [];
    const pooled = await runStudyOnPool({ profile: encodedProfile(), phase: "B", input: { ...input, params: { phase: "B" } }, solvers: true }, (p) => progress.push(p));
    const local = runEngineTaskInThread({ kind: "study", profile: encodedProfile(), phase: "B", input: { ...input, params: { phase: "B" } }, solvers: true });
    expect(pooled).toEqual(local);
    expect(pooled.solvers!.minStorage.iterations + pooled.solvers!.maxMinCurrent.iterations).toBeGreaterThan(3);
    // The reports travel on the result's channel, so all of them arrive, in order, before it:
    // prepare, study, each solver step; then the pool's own 1 once the result is in.
    expect(progress.filter((p) => p < 1).length).toBeGreaterThan(3);
    expect(progress.at(-1)).toBe(1);
    expect([...progress].sort((a, b) => a - b)).toEqual(progress);
  });

  it("a feasibility study from CSV text equals the in-thread engine, quality report included", async () => {
    const task = { data: { csv, csvOptions }, phase: "min" as const, input: { ...input, params: { phase: "min" as const } } };
    const pooled = await runFeasibilityOnPool(task);
    expect(pooled).toEqual(runEngineTaskInThread({ kind: "feasibility", ...task }));
    expect(pooled.result.period.knownHours).toBeGreaterThan(100 * 24);
    expect(pooled.quality).toHaveProperty("warnings");
  });

  it("brings engine errors back as the engine's classes, with their fields", async () => {
    const badDevice = runStudyOnPool({ profile: encodedProfile(), phase: "A", input: { ...input, device: { ...device, harvestW: "I +" } }, solvers: false });
    await expect(badDevice).rejects.toBeInstanceOf(DeviceError);
    await expect(badDevice).rejects.toMatchObject({ path: ["harvestW"] });

    const { series } = ingestCsvText(csv, csvOptions);
    const onePhase = { times: encodeTimes(series.t), phases: { A: encodeAmps(series.phases.A!) } };
    await expect(runStudyOnPool({ profile: onePhase, phase: "C", input, solvers: false })).rejects.toBeInstanceOf(PhaseError);

    const badCsv = runFeasibilityOnPool({ data: { csv: "Timestamp,Current\n", csvOptions: { timestampColumn: "When", currentColumn: "Current" } }, phase: "A", input });
    await expect(badCsv).rejects.toBeInstanceOf(IngestError);
    await expect(badCsv).rejects.toMatchObject({ status: 422 });
  });

  it("leaves the event loop free: timers keep firing while a study with solvers computes", async () => {
    let done = false;
    const study = runStudyOnPool({ profile: encodedProfile(), phase: "A", input, solvers: true }).finally(() => (done = true));
    let ticks = 0;
    while (!done) {
      await sleep(1);
      ticks++;
    }
    await study;
    // On the calling thread the study would hold the loop until it finished: no tick at all.
    expect(ticks).toBeGreaterThan(5);
  });

  it("runs every thread of the engine processes, the garbage collector's included, at a lower CPU priority than the thread that serves reads (ENGINE_NICE, default 10)", async () => {
    await runFeasibilityOnPool({ data: { csv, csvOptions }, phase: "A", input });
    // Linux: a thread's nice value is field 19 of /proc/<pid>/task/<tid>/stat (after the name in parentheses).
    const niceOf = (pid: number, tid: string) => Number(readFileSync(`/proc/${pid}/task/${tid}/stat`, "utf8").split(") ")[1].split(" ")[16]);
    expect(niceOf(process.pid, String(process.pid))).toBe(0); // this thread, which would serve reads
    const engines = engineProcesses();
    expect(engines).toHaveLength(1); // ENGINE_PROCESSES=1
    const nices = threadsOf(engines[0]).map((tid) => niceOf(engines[0], tid));
    expect(nices.length).toBeGreaterThan(4); // the main thread, V8's helpers, libuv's
    expect(new Set(nices)).toEqual(new Set([10]));
  });

  it("an engine process killed while it computes fails only its task, as EngineStoppedError; one killed while idle fails none", async () => {
    await runFeasibilityOnPool({ data: { csv, csvOptions }, phase: "A", input });
    const [engine] = engineProcesses();
    let started = false;
    const study = runStudyOnPool({ profile: encodedProfile(), phase: "A", input, solvers: true }, () => (started = true));
    while (!started) await sleep(5);
    process.kill(engine, "SIGKILL");
    await expect(study).rejects.toBeInstanceOf(EngineStoppedError);
    // This process lives on, and so does the pool: another engine process takes the next task.
    const next = await runFeasibilityOnPool({ data: { csv, csvOptions }, phase: "A", input });
    expect(next.result.period.knownHours).toBeGreaterThan(100 * 24);
    expect(engineProcesses()).not.toContain(engine);
    // One that dies while idle: the task goes to its replacement.
    for (const idle of engineProcesses()) process.kill(idle, "SIGKILL");
    await sleep(200);
    const afterIdleDeath = await runFeasibilityOnPool({ data: { csv, csvOptions }, phase: "A", input });
    expect(afterIdleDeath).toEqual(next);
  });
});
