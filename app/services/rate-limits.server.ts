// Request rate limits counted in MariaDB, so every app instance sees the same counts.
import { Op, QueryTypes } from "sequelize";
import { RateLimitHit } from "../../db/models";
import { db } from "../utils/db.server";

export interface RateLimitSubject {
  /** Who is counted, e.g. `email:a@example.com`; null skips this subject (e.g. an unknown address). */
  subject: string | null;
  limit: number;
}

export interface RateLimitDecision {
  allowed: boolean;
  /** Seconds until the oldest counted request leaves the window (when refused). */
  retryAfterSeconds: number;
}

/**
 * Counts one request for `action` against every subject, unless one of them is already at its
 * limit within the window: then nothing is counted and the request is refused.
 */
export async function hitRateLimit(action: string, subjects: RateLimitSubject[], windowMinutes: number): Promise<RateLimitDecision> {
  db();
  const now = Date.now();
  const since = new Date(now - windowMinutes * 60_000);
  const counted = subjects.filter((s): s is { subject: string; limit: number } => s.subject !== null);
  for (const { subject, limit } of counted) {
    const hits = await RateLimitHit.findAll({
      where: { action, subject, createdAt: { [Op.gt]: since } },
      order: [["createdAt", "DESC"]],
      limit,
      attributes: ["createdAt"],
    });
    if (hits.length >= limit) {
      const oldest = hits[hits.length - 1].createdAt.getTime();
      return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil((oldest + windowMinutes * 60_000 - now) / 1000)) };
    }
  }
  await RateLimitHit.bulkCreate(counted.map(({ subject }) => ({ action, subject })));
  // Now and then, forget what no window looks at any more.
  if (Math.random() < 0.02) await RateLimitHit.destroy({ where: { createdAt: { [Op.lt]: new Date(now - 24 * 3600_000) } } });
  return { allowed: true, retryAfterSeconds: 0 };
}

export interface ApiRateDecision {
  allowed: boolean;
  limit: number;
  remaining: number;
  /** Seconds until the current one-minute window ends. */
  resetSeconds: number;
}

const API_WINDOW_MS = 60_000;

/**
 * Counts one API request for `subject` in the current one-minute window (fixed windows, one row
 * per subject and minute, incremented in place so every instance shares the count). Refused
 * requests are counted too: a client hammering past its limit does not get a fresh window sooner.
 */
export async function countApiRequest(subject: string, limit: number): Promise<ApiRateDecision> {
  const sequelize = db();
  const now = Date.now();
  const windowStart = new Date(now - (now % API_WINDOW_MS));
  // One statement counts and reads back: LAST_INSERT_ID(expr) hands the row's new count back as
  // the statement's insert id (a documented MariaDB/MySQL idiom for counters), so every API
  // request costs one round trip here, not an insert and a select.
  const [newCount] = await sequelize.query("INSERT INTO api_request_counts (subject, window_start, count) VALUES (?, ?, LAST_INSERT_ID(1)) ON DUPLICATE KEY UPDATE count = LAST_INSERT_ID(count + 1)", {
    replacements: [subject, windowStart],
    type: QueryTypes.INSERT,
  });
  const count = Number(newCount) || 1;
  // Now and then, forget windows that have ended.
  if (Math.random() < 0.01) await sequelize.query("DELETE FROM api_request_counts WHERE window_start < ?", { replacements: [new Date(now - 10 * API_WINDOW_MS)], type: QueryTypes.BULKDELETE });
  return {
    allowed: count <= limit,
    limit,
    remaining: Math.max(0, limit - count),
    resetSeconds: Math.max(1, Math.ceil((windowStart.getTime() + API_WINDOW_MS - now) / 1000)),
  };
}
