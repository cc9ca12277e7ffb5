// The engine runs in a pool of worker processes (workerpool), so a study's CPU time never holds up
// the event loop that serves everyone else's pages and API reads, and, being processes at a lower
// CPU priority (ENGINE_NICE), neither does the collection of the engine's garbage
// (app/utils/engine-process.ts says why threads were not enough). The pool is created on first
// use and lives until `closeWorkerPool()` (the server calls it on shutdown).
//
// Tasks and results cross as structured clones (`serialization: "advanced"`: typed arrays
// included), progress as events on the same channel. Under the built server (this module
// compiled into build/server/) the processes run build/engine-worker.js, compiled with it by
// `npm run build`; under Vitest, the dev server and tsx scripts (this module still TypeScript) they
// run the TypeScript through tsx. Paths are resolved from the project root: APP_ROOT, or the
// working directory (every script starts the server from the project root).
import { availableParallelism } from "node:os";
import path from "node:path";
import { Piscina } from "piscina";
import workerpool, { type Pool } from "workerpool";
import runEngineTask, { rebuildEngineError, type EncodedProfile, type EngineReply, type EngineTask, type FeasibilityQuality, type OptimiseOutput, type StudyOutput } from "../../lib/engine/worker";
import { getEnv } from "./env.server";
import type { StudyReportModel } from "../../lib/report/study-report";

let pool: Pool | null = null;

/** Engine processes: ENGINE_PROCESSES, else one per core. 0 runs the engine on the calling thread. */
export function engineProcessCount(): number {
  return getEnv().ENGINE_PROCESSES ?? availableParallelism();
}

function enginePool(): Pool | null {
  const processes = engineProcessCount();
  if (processes === 0) return null;
  const compiled = !import.meta.url.endsWith(".ts");
  pool ??= workerpool.pool(path.resolve(getEnv().APP_ROOT ?? process.cwd(), compiled ? "build/engine-worker.js" : "app/utils/engine-process.ts"), {
    workerType: "process",
    // Started with the pool and kept: a process takes a moment to start (tsx, mathjs).
    minWorkers: processes,
    maxWorkers: processes,
    forkOpts: {
      serialization: "advanced",
      // Explicit, so the process gets the loader it needs whatever flags this one had.
      execArgv: compiled ? [] : ["--import", "tsx"],
      // The processes lower their own CPU priority by this much (engine-process.ts).
      env: { ...process.env, ENGINE_NICE: String(getEnv().ENGINE_NICE) },
    },
  });
  return pool;
}

/** Stops the engine processes and the report thread (in-flight tasks are abandoned). Safe to call when no pool was made. */
export async function closeWorkerPool(): Promise<void> {
  const [engines, reports] = [pool, reportPool];
  pool = null;
  reportPool = null;
  await Promise.all([engines?.terminate(true), reports?.destroy()]);
}

/**
 * Report PDFs are laid out on their own single worker thread, started on first use and stopped
 * after a minute idle (react-pdf and the fonts cost ~100 MB, and reports are rare), so a report
 * never waits behind studies nor holds up the event loop. ENGINE_PROCESSES=0 renders in-thread.
 */
let reportPool: Piscina | null = null;

export async function renderReportPdfOffThread(model: StudyReportModel): Promise<Buffer> {
  if (engineProcessCount() === 0) {
    const { renderReportPdf } = await import("../services/report-pdf.server");
    return renderReportPdf(model);
  }
  reportPool ??= new Piscina({
    filename: path.resolve(getEnv().APP_ROOT ?? process.cwd(), "app/services/report-pdf.worker.mjs"),
    minThreads: 0,
    maxThreads: 1,
    idleTimeout: 60_000,
  });
  const bytes: Uint8Array = await reportPool.run(model);
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** The engine process running a task stopped before answering (killed, or out of memory); another takes its place. */
export class EngineStoppedError extends Error {
  name = "EngineStoppedError";
}

async function run<T>(task: EngineTask, onProgress?: (share: number) => void): Promise<T> {
  const workers = enginePool();
  const reply = (workers ? await inProcess(workers, task, onProgress) : runEngineTask(task, onProgress)) as EngineReply<T>;
  if (!reply.ok) throw rebuildEngineError(reply.error);
  // A finished study or optimisation is at 1, whatever its last report said.
  if (onProgress && task.kind !== "feasibility") onProgress(1);
  return reply.value;
}

async function inProcess(workers: Pool, task: EngineTask, onProgress?: (share: number) => void): Promise<unknown> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await workers.exec("engine", [task], onProgress ? { on: (share: number) => onProgress(share) } : undefined);
    } catch (error) {
      // workerpool's error for a process that exited or failed; anything else is the task's own.
      if (!(error instanceof workerpool.TerminateError)) throw error;
      // A process that died while idle refuses the task unsent, and the pool then replaces it: the
      // task goes to another. One that died while holding the task is not tried again (the task
      // itself may be what killed it, e.g. out of memory), and its request is told to retry.
      if (error.message === "Worker is terminated" && attempt <= engineProcessCount()) continue;
      throw new EngineStoppedError(error.message.split("\n")[0]);
    }
  }
}

/** A study (and, if asked, both solvers) on a stored profile, given as its BLOB bytes. */
export function runStudyOnPool(
  task: { profile: EncodedProfile; phase: Extract<EngineTask, { kind: "study" }>["phase"]; input: Extract<EngineTask, { kind: "study" }>["input"]; solvers: boolean },
  onProgress?: (share: number) => void,
): Promise<StudyOutput> {
  return run({ kind: "study", ...task }, onProgress);
}

/** The optimiser (lib/optimise) on samples, CSV text or a stored profile. */
export function runOptimiseOnPool(task: Omit<Extract<EngineTask, { kind: "optimise" }>, "kind">, onProgress?: (share: number) => void): Promise<OptimiseOutput> {
  return run({ kind: "optimise", ...task }, onProgress);
}

/** The stateless feasibility study: ingest of samples or CSV text and one study, nothing stored. */
export function runFeasibilityOnPool(task: Omit<Extract<EngineTask, { kind: "feasibility" }>, "kind">): Promise<StudyOutput & { quality: FeasibilityQuality }> {
  return run({ kind: "feasibility", ...task });
}
