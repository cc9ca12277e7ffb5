// Idempotency-Key for POSTs: a client that retries a request (after a timeout, a dropped
// connection or a server restart) gets the first answer instead of a second record.
// The key, a fingerprint of the request and the response are written in the same transaction
// as the record the request creates, so either both exist or neither does.
import { createHash, type Hash } from "node:crypto";
import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { IdempotencyKey } from "../../db/models";
import { db } from "../utils/db.server";
import { problem } from "../utils/http.server";

export const IDEMPOTENCY_HEADER = "Idempotency-Key";
/** How long a key is remembered. */
export const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;
const KEY_PATTERN = /^[\x21-\x7e]{1,255}$/;

export interface IdempotentScope {
  /** The request to read: the same request, its body hashed as it is read. */
  request: Request;
  /** Runs `work` in one transaction that also records its response under the key. */
  save(work: (transaction: Transaction) => Promise<Response>): Promise<Response>;
}

/**
 * Wraps a POST handler. Without the header it runs as usual. With it: a key already used with
 * the same method, path, query and body replays the recorded response (header
 * `Idempotent-Replayed: true`); with another request it is a 422. Only the response of
 * `save` is recorded: a request refused before it (a 4xx) may be retried with the same key.
 */
export async function withIdempotency(
  request: Request,
  organisationId: number,
  handler: (scope: IdempotentScope) => Promise<Response>,
): Promise<Response> {
  const key = request.headers.get(IDEMPOTENCY_HEADER);
  if (key === null) return handler({ request, save: (work) => db().transaction(work) });
  if (!KEY_PATTERN.test(key)) {
    const message = "Idempotency-Key must be 1 to 255 visible ASCII characters (a UUID is a good choice).";
    throw problem(400, "Invalid Idempotency-Key", message, { errors: [{ path: IDEMPOTENCY_HEADER, message }] });
  }
  purgeNowAndThen();
  const fingerprint = new BodyFingerprint(request);
  const earlier = await findLive(organisationId, key);
  if (earlier) {
    // Read (and hash) the body only to compare it with the first request's.
    for await (const _ of (fingerprint.request.body ?? []) as AsyncIterable<Uint8Array>);
    return replay(earlier, fingerprint.digest());
  }
  return handler({
    request: fingerprint.request,
    save: async (work) => {
      const digest = fingerprint.digest();
      // Two rounds at most: the second after freeing a key whose record has expired.
      for (let round = 0; ; round++) {
        try {
          return await db().transaction(async (transaction) => {
            // Claimed first: a concurrent request with the same key waits here until this one ends.
            const row = await IdempotencyKey.create({ organisationId, key, fingerprint: digest, responseStatus: 0, responseBody: "" }, { transaction }).catch((error) => {
              throw error instanceof UniqueConstraintError ? new KeyTaken() : error;
            });
            const response = await work(transaction);
            await row.update({ responseStatus: response.status, responseBody: await response.clone().text(), responseLocation: response.headers.get("Location") }, { transaction });
            return response;
          });
        } catch (error) {
          if (!(error instanceof KeyTaken)) throw error;
          const holder = await IdempotencyKey.findOne({ where: { organisationId, key } });
          if (holder && holder.createdAt >= cutoff()) return replay(holder, digest);
          if (round > 0) throw problem(409, "Idempotency-Key in use", "Another request with this Idempotency-Key is being handled; retry in a moment.");
          await holder?.destroy();
        }
      }
    },
  });
}

class KeyTaken extends Error {}

/** Deletes keys older than the time they are kept (lookups ignore them anyway). */
export async function purgeExpiredIdempotencyKeys(): Promise<number> {
  db();
  lastPurge = Date.now();
  return IdempotencyKey.destroy({ where: { createdAt: { [Op.lt]: cutoff() } } });
}

// Each instance purges at most hourly, in the background of a keyed request.
let lastPurge = 0;
function purgeNowAndThen() {
  if (Date.now() - lastPurge > 3600_000) purgeExpiredIdempotencyKeys().catch(() => {});
}

const cutoff = () => new Date(Date.now() - IDEMPOTENCY_TTL_MS);

function findLive(organisationId: number, key: string) {
  db();
  return IdempotencyKey.findOne({ where: { organisationId, key, createdAt: { [Op.gte]: cutoff() } } });
}

function replay(earlier: IdempotencyKey, fingerprint: string): Response {
  if (earlier.fingerprint !== fingerprint) {
    const message = "This Idempotency-Key was used in the last 24 hours for a different request (method, path, query or body). Use a new key for a new request.";
    return problem(422, "Idempotency-Key reused", message, { errors: [{ path: IDEMPOTENCY_HEADER, message }] });
  }
  const headers = new Headers({ "Content-Type": "application/json", "Idempotent-Replayed": "true" });
  if (earlier.responseLocation) headers.set("Location", earlier.responseLocation);
  return new Response(earlier.responseBody, { status: earlier.responseStatus, headers });
}

/** SHA-256 of method, path with query and body, the body hashed as the handler streams it. */
class BodyFingerprint {
  readonly request: Request;
  private hash: Hash;
  private complete: boolean;
  private value?: string;

  constructor(original: Request) {
    const url = new URL(original.url);
    this.hash = createHash("sha256").update(`${original.method} ${url.pathname}${url.search}\n`);
    this.complete = !original.body;
    if (!original.body) {
      this.request = original;
      return;
    }
    const body = original.body.pipeThrough(
      new TransformStream<Uint8Array, Uint8Array>({
        transform: (chunk, controller) => {
          this.hash.update(chunk);
          controller.enqueue(chunk);
        },
        flush: () => {
          this.complete = true;
        },
      }),
    );
    this.request = new Request(original.url, { method: original.method, headers: original.headers, body, signal: original.signal, duplex: "half" } as RequestInit);
  }

  digest(): string {
    if (!this.complete) throw new Error("The request body must be read whole before its fingerprint is taken.");
    this.value ??= this.hash.digest("hex");
    return this.value;
  }
}

/**
 * A POST whose work needs no transaction of its own (a computation, or a service that commits
 * itself): reads the body with `read`, then answers with `work`. With an Idempotency-Key, the
 * answer is recorded (and replayed) as for a create.
 */
export async function withIdempotentWork<T>(
  request: Request,
  organisationId: number,
  read: (request: Request) => Promise<T>,
  work: (input: T) => Promise<Response>,
): Promise<Response> {
  if (request.headers.get(IDEMPOTENCY_HEADER) === null) return work(await read(request));
  return withIdempotency(request, organisationId, async ({ request, save }) => {
    const input = await read(request);
    return save(() => work(input));
  });
}
