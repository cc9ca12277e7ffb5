// The production HTTP server (npm start, npm test, benchmarks): Express in front of the React
// Router build. It exists, instead of react-router-serve, for what only the server can do:
//   - listen on 127.0.0.1 unless HOST says otherwise;
//   - security headers on every response, assets and API included, with a fresh CSP nonce per
//     response that the document's inline framework scripts carry;
//   - hand the socket's address to the app (react-router-serve does not), for per-address limits;
//   - run large uploads a few at a time per process (memory), queueing the rest;
//   - on SIGTERM/SIGINT finish in-flight requests, refuse new ones, and exit within 10 s;
//   - use the cores: WEB_PROCESSES app processes (node:cluster, default one per core but one) share
//     the port. Each is an interchangeable instance (all shared state is in MariaDB), and the
//     engine's worker processes are divided among them so that they never outnumber the cores.
// `npm run build` compiles it to build/http-server.js (esbuild), run with plain `node`: the tsx
// loader cost ~190 MB per process. Its engine processes run build/engine-worker.js, compiled with it.
import cluster from "node:cluster";
import { randomBytes } from "node:crypto";
import { availableParallelism } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import type { IncomingMessage } from "node:http";
import type { RequestHandler, Response as ExpressResponse } from "express";
import type { RouterContextProvider, ServerBuild } from "react-router";

/** The header through which the server tells the app the client's address; never trusted from outside. */
export const CLIENT_ADDRESS_HEADER = "x-duskline-client-address";
const SHUTDOWN_GRACE_MS = 9_000;

type AppEntry = {
  createLoadContext(values: { cspNonce?: string }): RouterContextProvider;
  shutdown(): Promise<void>;
};

const processes = webProcesses();
// A cluster primary, even over one app process, unless WEB_PROCESSES=1 asks for none: it gives
// each app process its bounded heap (WEB_HEAP_MB) and starts another when one dies.
if (cluster.isPrimary && (processes > 1 || process.env.WEB_PROCESSES !== "1")) runPrimary(processes);
else await serve();

/**
 * WEB_PROCESSES, else one per core but one (at least one); WEB_PROCESSES=1 serves from this
 * process, without a cluster. The core left over is for MariaDB (npm start runs it on the same
 * machine), the engine threads and the system: on two cores, two app processes fighting the
 * database for them served no more reads than one, and their slowest 1 % took longer
 * (docs/performance.md, fifth round).
 */
function webProcesses(): number {
  const raw = process.env.WEB_PROCESSES;
  const n = raw === undefined || raw === "" ? Math.max(1, availableParallelism() - 1) : Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new Error(`WEB_PROCESSES must be a whole number from 1 to 64 (got "${raw}").`);
  return n;
}

/**
 * The cluster's primary: starts the app processes, starts another when one dies (and says so),
 * and on SIGTERM/SIGINT passes the signal on and exits once they have finished their requests.
 */
/** WEB_HEAP_MB, else 256: the V8 heap limit of each app process under the cluster (its engine processes, started by workerpool, inherit the flag); 0 leaves V8's default. */
function webHeapMb(): number {
  const raw = process.env.WEB_HEAP_MB;
  const n = raw === undefined || raw === "" ? 256 : Number(raw);
  if (!Number.isInteger(n) || (n !== 0 && (n < 128 || n > 16_384))) throw new Error(`WEB_HEAP_MB must be 0 or a whole number of MB from 128 to 16384 (got "${raw}").`);
  return n;
}

function runPrimary(count: number) {
  // Engine processes per app process, so that app processes × engine processes stays at the number of cores.
  const engines = process.env.ENGINE_PROCESSES || String(Math.max(1, Math.floor(availableParallelism() / count)));
  // Each app process gets a bounded heap (WEB_HEAP_MB): left to itself V8 lets every heap grow far
  // past what it needs before collecting, and the processes' RSS adds up (docs/performance.md).
  const heapMb = webHeapMb();
  if (heapMb > 0) cluster.setupPrimary({ execArgv: [...process.execArgv.filter((a) => !a.startsWith("--max-old-space-size")), `--max-old-space-size=${heapMb}`] });
  const fork = () => cluster.fork({ ENGINE_PROCESSES: engines, WEB_PROCESSES: "1" });
  let stopping = false;
  cluster.on("exit", (worker, code, signal) => {
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    console.error(`[duskline] app process ${worker.process.pid} stopped (${signal ?? `exit status ${code}`}); starting another in 1 s`);
    setTimeout(fork, 1000);
  });
  for (let i = 0; i < count; i++) fork();
  console.log(`[duskline] ${count} app process${count === 1 ? "" : "es"}, ${engines} engine process${engines === "1" ? "" : "es"} each, heap ${heapMb > 0 ? `${heapMb} MB` : "V8's default"} each`);
  const stop = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    console.log(`[duskline] ${signal}: stopping the app processes`);
    for (const worker of Object.values(cluster.workers ?? {})) worker?.process.kill(signal);
    // Each process exits within its own grace period; this is the backstop.
    setTimeout(() => process.exit(1), SHUTDOWN_GRACE_MS + 2_000).unref();
  };
  process.once("SIGTERM", () => stop("SIGTERM"));
  process.once("SIGINT", () => stop("SIGINT"));
}

async function serve() {
  // Loaded here, not at the top, so that a cluster's primary stays small (RSS counts for all).
  const [{ default: compression }, { default: express }, { default: helmet }, { default: onHeaders }, { createRequestHandler }, { createUploadGate, uploadGateOptionsFromEnv }, { oneDrainListener }] =
    await Promise.all([
      import("compression"),
      import("express"),
      import("helmet"),
      import("on-headers"),
      import("@react-router/express"),
      import("./app/utils/upload-gate.server"),
      import("./app/utils/drain-listener.server"),
    ]);
  const buildPath = path.resolve(process.env.BUILD_PATH ?? "build/server/index.js");
  const build = (await import(pathToFileURL(buildPath).href)) as ServerBuild;
  const entry = build.entry.module as unknown as AppEntry;
  const port = Number(process.env.PORT ?? 3000);
  const host = process.env.HOST || "127.0.0.1";
  const trustProxy = process.env.TRUST_PROXY === "true";

  function clientAddressOf(req: IncomingMessage): string {
    if (trustProxy) {
      // The last hop is the one our proxy added; earlier entries are whatever the client sent.
      const forwarded = String(req.headers["x-forwarded-for"] ?? "").split(",").at(-1)?.trim();
      if (forwarded) return forwarded;
    }
    return req.socket.remoteAddress ?? "unknown";
  }

  const nonceOf = (res: ExpressResponse) => res.locals.cspNonce as string;

  let shuttingDown = false;
  const app = express();
  app.disable("x-powered-by");

  app.use((req, res, next) => {
    if (shuttingDown) {
      res.set("Connection", "close").set("Retry-After", "5").status(503).type("application/problem+json");
      res.send(JSON.stringify({ type: "about:blank", status: 503, title: "Shutting down", detail: "The server is restarting; retry in a few seconds." }));
      return;
    }
    res.locals.cspNonce = randomBytes(16).toString("base64");
    req.headers[CLIENT_ADDRESS_HEADER] = clientAddressOf(req);
    // Pages and API answers hold an organisation's data: no browser or proxy may keep a copy (ASVS
    // 8.2.1). Decided as the headers go out, so the assets' caching and a route's own header stay.
    onHeaders(res, () => {
      if (!res.hasHeader("Cache-Control")) res.setHeader("Cache-Control", "no-store");
    });
    next();
  });

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'", (_req, res) => `'nonce-${nonceOf(res as ExpressResponse)}'`],
          // Inline style attributes come from React (server-rendered style props) and Recharts.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", "data:", "blob:"],
          fontSrc: ["'self'"],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
        },
      },
      referrerPolicy: { policy: "same-origin" },
      // Cross-origin isolation is not needed and would block downloads opened from other tabs.
      crossOriginEmbedderPolicy: false,
      // HSTS only makes sense behind HTTPS; a proxy that terminates TLS should set it.
      strictTransportSecurity: false,
    }),
  );
  // Large bodies (uploads) a few at a time per process, so their working sets cannot add up past
  // the memory budget (UPLOAD_CONCURRENCY, UPLOAD_QUEUE; see app/utils/upload-gate.server.ts).
  app.use(createUploadGate(uploadGateOptionsFromEnv()));
  // compression wraps every response's write and end (~6 % of an API read's CPU, docs/performance.md);
  // a client that accepts no encoding (scripts, curl without --compressed) gains nothing from it.
  // Under compression, waits for "drain" share one listener (app/utils/drain-listener.server.ts).
  const compress = compression();
  app.use((req, res, next) => (req.headers["accept-encoding"] ? compress(req, res, () => oneDrainListener(req, res, next)) : next()));
  app.use(path.posix.join(build.publicPath, "assets"), express.static(path.join(build.assetsBuildDirectory, "assets"), { immutable: true, maxAge: "1y" }));
  // Files outside /assets have an extension (favicon.svg, robots.txt); pages and API paths mostly
  // do not, and skip the two disk look-ups that would only miss (~5 % of an API read's CPU).
  const filesOnly = (serve: RequestHandler): RequestHandler => (req, res, next) => (path.posix.extname(req.path) ? serve(req, res, next) : next());
  app.use(build.publicPath, filesOnly(express.static(build.assetsBuildDirectory)));
  app.use(filesOnly(express.static("public", { maxAge: "1h" })));
  app.all(
    "*",
    createRequestHandler({
      build,
      mode: process.env.NODE_ENV,
      getLoadContext: (_req, res) => entry.createLoadContext({ cspNonce: nonceOf(res) }),
    }),
  );

  const server = app.listen(port, host, () => {
    console.log(`[duskline] serving on http://${host.includes(":") ? `[${host}]` : host}:${port}`);
  });

  async function stop(signal: string) {
    if (shuttingDown) return;
    shuttingDown = true;
    console.log(`[duskline] ${signal}: finishing in-flight requests`);
    const force = setTimeout(() => {
      console.error("[duskline] requests still open after the grace period; closing them");
      server.closeAllConnections();
      process.exit(1);
    }, SHUTDOWN_GRACE_MS);
    force.unref();
    server.close(async () => {
      try {
        await entry.shutdown();
      } finally {
        console.log("[duskline] stopped");
        process.exit(0);
      }
    });
    // Idle keep-alive connections would hold server.close() open; busy ones close after their response.
    server.closeIdleConnections();
  }
  process.once("SIGTERM", () => void stop("SIGTERM"));
  process.once("SIGINT", () => void stop("SIGINT"));
}
