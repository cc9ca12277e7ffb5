// Entry of the engine's worker processes (app/utils/worker-pool.server.ts). A process of its own,
// not a thread, because of garbage collection: V8 collects every heap in a process with one
// shared set of helper threads at the process's priority, so engine threads at a lower priority
// still had their heaps collected at the web's, and under studies those helpers took as much CPU
// as the thread serving reads (docs/performance.md, sixth round). Here every thread of the
// process, the collector's included, runs at the lower priority (ENGINE_NICE): when studies and
// page or API reads want the same cores the reads win, and the engine takes what is left.
import { readdirSync } from "node:fs";
import { setPriority } from "node:os";
import workerpool from "workerpool";
import runEngineTask, { type EngineTask } from "../../lib/engine/worker";

lowerProcessPriority(Number(process.env.ENGINE_NICE ?? 0));

// Ctrl-C in a terminal signals the whole process group: the app process shuts down in its own
// time and stops this one (or its exit closes the channel, and workerpool exits this process).
process.on("SIGINT", () => {});

workerpool.worker({
  // Progress travels on the same channel as the result, so every report arrives before it.
  engine: (task: EngineTask) => runEngineTask(task, (share) => workerpool.workerEmit(share)),
});

function lowerProcessPriority(nice: number) {
  if (!nice) return;
  try {
    // On Linux a nice value belongs to a thread; the threads already running (V8's helpers among
    // them) are set one by one, and threads started later inherit it from the thread that starts them.
    for (const tid of readdirSync("/proc/self/task")) setPriority(Number(tid), nice);
  } catch {
    try {
      setPriority(nice); // elsewhere a process has one priority
    } catch {
      // Not allowed: the engine keeps the app's priority.
    }
  }
}
