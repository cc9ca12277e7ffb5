import { ConnectionError, QueryTypes, type Sequelize, type Transaction } from "sequelize";
import { connectDb } from "../../db/index";
import { getEnv } from "./env.server";
import { problem } from "./http.server";

const guarded = new WeakSet<Sequelize>();

/**
 * The process-wide Sequelize instance, connected with the validated environment. Every query
 * and transaction through it turns "the database is not reachable" into a 503 problem
 * (see `databaseUnavailable`), so pages, the API and resource routes answer 503, never 500.
 */
export function db(): Sequelize {
  const sequelize = connectDb(getEnv());
  if (!guarded.has(sequelize)) {
    guarded.add(sequelize);
    for (const method of ["query", "transaction"] as const) {
      const original = sequelize[method].bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
      (sequelize as unknown as Record<string, unknown>)[method] = async (...args: unknown[]) => {
        try {
          return await original(...args);
        } catch (error) {
          throw isDatabaseUnavailable(error) ? databaseUnavailable() : error;
        }
      };
    }
  }
  return sequelize;
}

// Driver errors that mean the server went away or cannot be reached (mariadb's errno values):
// server shutdown in progress, connection killed, server gone away, lost connection, and the
// driver's own socket/closed-connection/timeouts.
const UNAVAILABLE_ERRNOS = new Set([1053, 1927, 2002, 2003, 2006, 2013, 45001, 45009, 45012, 45013, 45019, 45026, 45028, 45061]);
const UNAVAILABLE_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT", "EHOSTUNREACH", "ENOTFOUND"]);

/** Whether an error means MariaDB is down or unreachable (worth a retry), not a bad query. */
export function isDatabaseUnavailable(error: unknown): boolean {
  if (error instanceof ConnectionError) return true; // refused, timed out, pool acquire timeout, host errors
  for (let e = error as { parent?: unknown; errno?: number; code?: string; fatal?: boolean } | undefined, depth = 0; e && depth < 3; e = e.parent as typeof e, depth++) {
    if (typeof e !== "object") break;
    if (e.fatal === true || (e.errno !== undefined && UNAVAILABLE_ERRNOS.has(e.errno)) || (e.code && UNAVAILABLE_CODES.has(e.code))) return true;
  }
  return false;
}

/** The answer while the database is away: a 503 problem+json asking to retry (pages show it in the error boundary). */
export function databaseUnavailable(): Response {
  return problem(
    503,
    "Service unavailable",
    "Duskline cannot reach its database just now. Nothing was saved by this request; try again in a minute.",
    { retryable: true },
    { "Retry-After": "10" },
  );
}

/**
 * Refuses quickly when the database does not answer a `SELECT 1` within `timeoutMs`: used before
 * reading a large body, so an upload is not streamed only to fail at the end.
 */
export async function assertDatabaseReachable(timeoutMs = 2_000): Promise<void> {
  const sequelize = db();
  let timer: ReturnType<typeof setTimeout> | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(databaseUnavailable()), timeoutMs);
  });
  try {
    await Promise.race([sequelize.query("SELECT 1", { type: QueryTypes.SELECT }), timeout]);
  } finally {
    clearTimeout(timer);
  }
}

/** Runs `work` in the caller's transaction when there is one, else in a new one. */
export function inTransaction<T>(outer: Transaction | undefined, work: (transaction: Transaction) => Promise<T>): Promise<T> {
  return outer ? work(outer) : db().transaction(work);
}
