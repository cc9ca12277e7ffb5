// The engine runs in a pool of worker threads (piscina), so a study's CPU time never holds up the
// event loop that serves everyone else's pages and API reads. The pool is created on first use
// and lives until `closeWorkerPool()` (the server calls it on shutdown).
//
// The worker is lib/engine/worker.ts, entered through app/utils/engine-thread.ts (which lowers
// the thread's CPU priority, ENGINE_NICE). Under the built server (this module compiled into
// build/server/) its threads load build/engine-worker.js, compiled with it by `npm run build`;
// under Vitest, the dev server and tsx scripts (this module still TypeScript) they load the
// TypeScript through tsx, which costs each thread its own loader (~25 MB and start-up time).
// Paths are resolved from the project root: APP_ROOT, or the working directory (every script
// starts the server from the project root).
import { availableParallelism } from "node:os";
import path from "node:path";
import { MessageChannel } from "node:worker_threads";
import { Piscina } from "piscina";
import runEngineTask, { rebuildEngineError, type EncodedProfile, type EngineReply, type EngineTask, type FeasibilityQuality, type OptimiseOutput, type StudyOutput } from "../../lib/engine/worker";
import { getEnv } from "./env.server";
import type { StudyReportModel } from "../../lib/report/study-report";

let pool: Piscina | null = null;

/** Threads in the pool: WORKER_THREADS, else one per core. 0 runs the engine on the calling thread. */
export function workerThreadCount(): number {
  return getEnv().WORKER_THREADS ?? availableParallelism();
}

function enginePool(): Piscina | null {
  const threads = workerThreadCount();
  if (threads === 0) return null;
  const compiled = !import.meta.url.endsWith(".ts");
  pool ??= new Piscina({
    filename: path.resolve(getEnv().APP_ROOT ?? process.cwd(), compiled ? "build/engine-worker.js" : "app/utils/engine-thread.ts"),
    // The threads lower their own CPU priority by this much (engine-thread.ts).
    workerData: { nice: getEnv().ENGINE_NICE },
    // Explicit, so the worker gets the loader it needs whatever flags the main process had.
    execArgv: compiled ? [] : ["--import", "tsx"],
    minThreads: threads,
    maxThreads: threads,
    // Workers take a moment to start (tsx, mathjs): keep them rather than respawn.
    idleTimeout: 10 * 60_000,
  });
  return pool;
}

/** Stops the workers (in-flight tasks are abandoned). Safe to call when no pool was made. */
export async function closeWorkerPool(): Promise<void> {
  const closing = [pool, reportPool];
  pool = null;
  reportPool = null;
  await Promise.all(closing.map((p) => p?.destroy()));
}

/**
 * Report PDFs are laid out on their own single worker thread, started on first use and stopped
 * after a minute idle (react-pdf and the fonts cost ~100 MB, and reports are rare), so a report
 * never waits behind studies nor holds up the event loop. WORKER_THREADS=0 renders in-thread.
 */
let reportPool: Piscina | null = null;

export async function renderReportPdfOffThread(model: StudyReportModel): Promise<Buffer> {
  if (workerThreadCount() === 0) {
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

/** Fresh ArrayBuffers for the bytes, so they can be moved to the worker without copying twice. */
function transferable(bytes: Uint8Array): Uint8Array {
  return bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer ? bytes : new Uint8Array(bytes);
}

async function run<T>(task: EngineTask, transferList: ArrayBuffer[], onProgress?: (share: number) => void): Promise<T> {
  const workers = enginePool();
  let reply: EngineReply<T>;
  if (!workers) {
    reply = runEngineTask(task) as EngineReply<T>;
  } else if (onProgress && task.kind !== "feasibility") {
    const channel = new MessageChannel();
    channel.port1.on("message", (share: number) => onProgress(share));
    try {
      reply = await workers.run({ ...task, progress: channel.port2 }, { transferList: [...transferList, channel.port2] });
    } finally {
      channel.port1.close();
    }
    // The result and the progress messages travel on different channels, so the worker's last
    // messages may still be in flight (and are dropped with the port): a finished study is at 1.
    if (reply.ok) onProgress(1);
  } else {
    reply = await workers.run(task, { transferList });
  }
  if (!reply.ok) throw rebuildEngineError(reply.error);
  return reply.value;
}

/** A profile's bytes ready to move to a worker, and the buffers to transfer. */
function movable(profile: EncodedProfile): { profile: EncodedProfile; transferList: ArrayBuffer[] } {
  const times = transferable(profile.times);
  const phases = Object.fromEntries(Object.entries(profile.phases).map(([p, bytes]) => [p, transferable(bytes)])) as EncodedProfile["phases"];
  const buffers = [times, ...Object.values(phases)].map((b) => b.buffer as ArrayBuffer);
  return { profile: { times, phases }, transferList: [...new Set(buffers)] };
}

/** A study (and, if asked, both solvers) on a stored profile, given as its BLOB bytes. */
export function runStudyOnPool(
  task: { profile: EncodedProfile; phase: Extract<EngineTask, { kind: "study" }>["phase"]; input: Extract<EngineTask, { kind: "study" }>["input"]; solvers: boolean },
  onProgress?: (share: number) => void,
): Promise<StudyOutput> {
  const { profile, transferList } = movable(task.profile);
  return run({ kind: "study", ...task, profile }, transferList, onProgress);
}

/** The optimiser (lib/optimise) on samples, CSV text or a stored profile. */
export function runOptimiseOnPool(task: Omit<Extract<EngineTask, { kind: "optimise" }>, "kind" | "progress">, onProgress?: (share: number) => void): Promise<OptimiseOutput> {
  if (!("profile" in task.data)) return run({ kind: "optimise", ...task }, [], onProgress);
  const { profile, transferList } = movable(task.data.profile);
  return run({ kind: "optimise", ...task, data: { profile } }, transferList, onProgress);
}

/** The stateless feasibility study: ingest of samples or CSV text and one study, nothing stored. */
export function runFeasibilityOnPool(task: Omit<Extract<EngineTask, { kind: "feasibility" }>, "kind">): Promise<StudyOutput & { quality: FeasibilityQuality }> {
  return run({ kind: "feasibility", ...task }, []);
}
