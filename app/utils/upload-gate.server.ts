// Bounds the memory that large request bodies (CSV uploads, appends, replacements, big JSON
// bodies) take in one app process. Ingesting and saving a one-year 3-phase upload holds its
// samples, their encoded BLOBs and the database packets at once (tens of MB each), so ten
// concurrent uploads on one process once took its RSS past the 1 GB budget.
//
// At most `concurrency` large requests (default 1) run at a time per process; the next `queue` wait their
// turn (their bytes stay in the socket until then); beyond that the server answers 503 with
// Retry-After at once, without reading the body. Small requests (pages, reads) never wait here.
// Used by server.ts in front of the app, so every route that takes a body is covered.
import type { IncomingMessage, ServerResponse } from "node:http";
import pLimit from "p-limit";

/** Bodies above this many bytes, or of unknown length (chunked), count as large. */
export const LARGE_BODY_BYTES = 4 * 1024 * 1024;

export interface UploadGateOptions {
  /** Large requests that may run at once in this process. */
  concurrency: number;
  /** Large requests that may wait for a turn; more are answered 503. */
  queue: number;
}

/** Reads UPLOAD_CONCURRENCY (default 1) and UPLOAD_QUEUE (default 50) from the environment. */
export function uploadGateOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): UploadGateOptions {
  const whole = (name: string, fallback: number, min: number) => {
    const raw = env[name];
    if (raw === undefined || raw === "") return fallback;
    const n = Number(raw);
    if (!Number.isInteger(n) || n < min || n > 10_000) throw new Error(`${name} must be a whole number from ${min} to 10000 (got "${raw}").`);
    return n;
  };
  return { concurrency: whole("UPLOAD_CONCURRENCY", 1, 1), queue: whole("UPLOAD_QUEUE", 50, 0) };
}

/** True for a request whose body is large or of unknown length. */
export function hasLargeBody(req: IncomingMessage): boolean {
  const length = req.headers["content-length"];
  if (length !== undefined) return Number(length) > LARGE_BODY_BYTES;
  return req.headers["transfer-encoding"] !== undefined;
}

/** Express-style middleware: lets large requests through `concurrency` at a time. */
export function createUploadGate(options: UploadGateOptions) {
  const limit = pLimit(options.concurrency);
  const gate = (req: IncomingMessage, res: ServerResponse, next: () => void) => {
    if (!hasLargeBody(req)) return next();
    if (limit.activeCount >= options.concurrency && limit.pendingCount >= options.queue) {
      res.statusCode = 503;
      res.setHeader("Retry-After", "10");
      res.setHeader("Connection", "close");
      res.setHeader("Content-Type", "application/problem+json");
      res.end(
        JSON.stringify({
          type: "about:blank",
          status: 503,
          title: "Too many uploads at once",
          detail: `This server is taking ${options.concurrency} large uploads and has ${options.queue} waiting; retry in a few seconds.`,
        }),
      );
      return;
    }
    // The turn ends when the answer is sent or the client goes away, whichever comes first.
    void limit(
      () =>
        new Promise<void>((release) => {
          res.once("close", release);
          if (res.destroyed || req.destroyed) return release();
          next();
        }),
    );
  };
  return Object.assign(gate, {
    /** Large requests running and waiting now (for tests and diagnostics). */
    counts: () => ({ active: limit.activeCount, waiting: limit.pendingCount }),
  });
}
