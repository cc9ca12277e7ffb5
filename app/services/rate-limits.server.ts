// Request rate limits counted in MariaDB, so every app instance sees the same counts.
import { Op } from "sequelize";
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
