// Server entry: React Router's default Node entry, plus the CSP nonce for the framework's
// inline scripts (set by server.ts) and the shutdown hook server.ts calls on SIGTERM.
import { Transform } from "node:stream";
import type { EntryContext, RouterContextProvider } from "react-router";
import { createReadableStreamFromReadable } from "@react-router/node";
import { ServerRouter } from "react-router";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { closeDb } from "../db/index";
import { ensureJobRunner, stopJobRunner } from "./services/jobs.server";
import { closeWorkerPool } from "./utils/worker-pool.server";
import { stopOutbox } from "./services/outbox.server";
import { startWebhookTimer, stopWebhooks } from "./services/webhooks.server";
import { cspNonceContext, createRequestContext, NonceProvider } from "./utils/request-context";
import { PageCache } from "./utils/page-cache.server";
import { getEnv } from "./utils/env.server";

export const streamTimeout = 5_000;

export { createRequestContext as createLoadContext };

/** Pages already rendered from the same URL and route data (see page-cache.server.ts). */
const pageCache = new PageCache(getEnv().PAGE_CACHE_MB * 1024 * 1024);

// Every instance runs queued jobs and takes over those of an instance that died, and sends due
// webhook deliveries (retries included).
ensureJobRunner();
startWebhookTimer();

/** Releases what the app holds (jobs, engine threads, database pool) so the process can exit; server.ts calls it. */
export async function shutdown(): Promise<void> {
  // Jobs running here go back to the queue for another instance (or this one after a restart).
  await stopJobRunner().catch((error) => console.error("Could not release running jobs:", (error as Error).message));
  await closeWorkerPool();
  // Messages not yet sent stay in the outbox for the next start.
  await stopOutbox();
  // Deliveries not yet sent stay in their table for the next start (or another instance).
  await stopWebhooks();
  await closeDb();
}

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }
  const nonce = loadContext.get(cspNonceContext);
  responseHeaders.set("Content-Type", "text/html; charset=utf-8");
  const cacheKey = pageCache.keyOf(request, responseStatusCode, routerContext);
  const kept = cacheKey ? pageCache.get(cacheKey, nonce) : null;
  // A stream of the kept chunks: a Response copies a byte-array body, not a stream's chunks.
  if (kept) {
    const body = new ReadableStream<Uint8Array>({
      start(controller) {
        for (const chunk of kept) controller.enqueue(chunk);
        controller.close();
      },
    });
    return new Response(body, { headers: responseHeaders, status: responseStatusCode });
  }

  return new Promise((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Bots wait for all content; people get the shell as soon as it is ready.
    const readyOption: keyof RenderToPipeableStreamOptions =
      (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(
      <NonceProvider value={nonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceProvider>,
      {
        nonce,
        [readyOption]() {
          shellRendered = true;
          // The HTML passes through as it renders; a cacheable page is also kept whole at the end.
          const chunks: Buffer[] | null = cacheKey ? [] : null;
          const body = new Transform({
            transform(chunk: Buffer, _encoding, callback) {
              chunks?.push(chunk);
              callback(null, chunk);
            },
            final(callback) {
              clearTimeout(timeoutId);
              timeoutId = undefined;
              if (cacheKey && chunks && responseStatusCode === 200) pageCache.set(cacheKey, Buffer.concat(chunks), nonce);
              callback();
            },
          });
          pipe(body);
          resolve(new Response(createReadableStreamFromReadable(body), { headers: responseHeaders, status: responseStatusCode }));
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          if (shellRendered) console.error(error);
        },
      },
    );
  });
}
