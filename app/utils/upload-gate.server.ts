// Bounds the memory that large request bodies (CSV uploads, appends, replacements, big JSON
// bodies) take in one app process. Ingesting and saving a one-year 3-phase upload holds its
// samples, their encoded BLOBs and the database packets at once (tens of MB each), so ten
// concurrent uploads on one process once took its RSS past the 1 GB budget.
//
// At most `concurrency` large requests (default 1) run at a time per process; the next `queue` wait their
// turn (their bytes stay in the socket until then); beyond that the server answers 503 with
// Retry-After at once, without reading the body. Small requests (pages, reads) never wait here.
// A request holding a turn must keep its body coming at `minBytesPerSecond` (checked over each
// `rateWindowMs`) until the body is all in; a slower sender would hold every upload behind it, so
// it is answered 408 and its connection closed, and the turn passes on.
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
  /** While it holds a turn, a request's body must arrive at least this fast (bytes/s); 0 = no check. */
  minBytesPerSecond?: number;
  /** Over windows of this length (ms). */
  rateWindowMs?: number;
}

/** UPLOAD_MIN_BYTES_PER_SECOND's default: 64 KB/s, a slow mobile link; a year of 1-minute data (22 MB) in under 6 minutes. */
export const MIN_UPLOAD_BYTES_PER_SECOND = 64 * 1024;
const RATE_WINDOW_MS = 10_000;

/** Reads UPLOAD_CONCURRENCY (default 1) and UPLOAD_QUEUE (default 50) from the environment. */
export function uploadGateOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): UploadGateOptions {
  const whole = (name: string, fallback: number, min: number, max = 10_000) => {
    const raw = env[name];
    if (raw === undefined || raw === "") return fallback;
    const n = Number(raw);
    if (!Number.isInteger(n) || n < min || n > Math.max(max, fallback)) throw new Error(`${name} must be a whole number from ${min} to ${Math.max(max, fallback)} (got "${raw}").`);
    return n;
  };
  return {
    concurrency: whole("UPLOAD_CONCURRENCY", 1, 1),
    queue: whole("UPLOAD_QUEUE", 50, 0),
    minBytesPerSecond: whole("UPLOAD_MIN_BYTES_PER_SECOND", MIN_UPLOAD_BYTES_PER_SECOND, 0),
  };
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
          const stopWatching = watchBodyRate(req, options.minBytesPerSecond ?? 0, options.rateWindowMs ?? RATE_WINDOW_MS);
          res.once("close", () => {
            stopWatching();
            release();
          });
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

/**
 * Closes the connection of a request whose body, not yet all in, arrived slower than
 * `minBytesPerSecond` over the last `windowMs`. The 408 goes straight to the socket (as Node's own
 * request timeout does): the app is still reading the body and has not answered; to it the request
 * looks like a client that went away, which it already handles. Returns the function that stops the watch.
 */
function watchBodyRate(req: IncomingMessage, minBytesPerSecond: number, windowMs: number): () => void {
  if (minBytesPerSecond <= 0) return () => {};
  const socket = req.socket;
  let seen = socket.bytesRead;
  const timer = setInterval(() => {
    if (req.complete || socket.destroyed) return clearInterval(timer);
    const read = socket.bytesRead - seen;
    seen = socket.bytesRead;
    if (read >= (minBytesPerSecond * windowMs) / 1000) return;
    clearInterval(timer);
    const body = JSON.stringify({
      type: "about:blank",
      status: 408,
      title: "Upload too slow",
      detail: `The body arrived at ${Math.round((read * 1000) / windowMs)} bytes/s, under the ${minBytesPerSecond} bytes/s an upload must keep while it holds one of this server's upload turns. Nothing was saved; retry on a faster connection.`,
    });
    socket.end(`HTTP/1.1 408 Request Timeout\r\nConnection: close\r\nContent-Type: application/problem+json\r\nContent-Length: ${Buffer.byteLength(body)}\r\n\r\n${body}`);
    setTimeout(() => socket.destroy(), 1_000).unref();
  }, windowMs);
  timer.unref();
  return () => clearInterval(timer);
}
