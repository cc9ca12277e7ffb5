// One background drainer per queue table (the e-mail outbox, webhook deliveries): a run drains
// what is due; a request while a run is going makes it run once more (never two at once); a timer
// retries what failed; stop waits for the run in progress (graceful shutdown).

export interface Drainer {
  /** Starts a run now, or one more after the run in progress; resolves when the runs are over. */
  kick(): Promise<void>;
  /** Starts the retry timer of this process: idempotent, and it never keeps the process alive. */
  start(): void;
  /** Stops the timer and waits for the run in progress. */
  stop(): Promise<void>;
}

/** `everyMs` is read when the timer starts, so it may come from the environment. */
export function createDrainer(name: string, work: () => Promise<unknown>, everyMs: number | (() => number)): Drainer {
  let running: Promise<void> | null = null;
  let again = false;
  let timer: ReturnType<typeof setInterval> | undefined;

  const drainer: Drainer = {
    kick() {
      drainer.start();
      if (running) {
        again = true;
        return running;
      }
      running = (async () => {
        do {
          again = false;
          await work();
        } while (again);
      })()
        .catch((error) => console.error(`[${name}]`, (error as Error)?.message ?? error))
        .finally(() => {
          running = null;
        });
      return running;
    },
    start() {
      if (timer) return;
      timer = setInterval(() => void drainer.kick(), typeof everyMs === "function" ? everyMs() : everyMs);
      timer.unref();
    },
    async stop() {
      if (timer) clearInterval(timer);
      timer = undefined;
      await running;
    },
  };
  return drainer;
}
