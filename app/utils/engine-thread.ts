// Entry of the engine's worker threads (app/utils/worker-pool.server.ts). It lowers the thread's
// own CPU priority (on Linux a thread has its own nice value), so that when studies and page or
// API reads want the same cores the reads win and the engine takes what is left: a study is batch
// work, a page is someone waiting. Then it is the engine's pure entry, lib/engine/worker.ts.
import { readlinkSync } from "node:fs";
import { setPriority } from "node:os";
import { workerData } from "node:worker_threads";

export { default } from "../../lib/engine/worker";

lowerThreadPriority(Number((workerData as { nice?: number } | null)?.nice ?? 0));

function lowerThreadPriority(nice: number) {
  if (!nice) return;
  try {
    // /proc/thread-self → "<pid>/task/<tid>"; setpriority on a tid changes that thread only.
    const tid = Number(readlinkSync("/proc/thread-self").split("/").pop());
    setPriority(tid, nice);
  } catch {
    // Not Linux, or not allowed: the thread keeps the process's priority.
  }
}
