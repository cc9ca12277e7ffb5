import { Op, QueryTypes, type Transaction, type WhereOptions } from "sequelize";
import { AuditEntry, User } from "../../db/models";
import { db } from "../utils/db.server";
import { describeAuditEntry } from "../../lib/audit/describe";
import type { AuditFilters } from "../../shared/audit-schemas";

export interface Actor {
  id: number | null;
  organisationId: number;
}

/**
 * Records who did what on which record; call inside the same transaction as the change. Once the
 * change has committed, the organisation's data revision moves on (see organisationRevision).
 */
export async function audit(
  actor: Actor,
  action: string,
  entity: string,
  entityId: string | number | null,
  detail: Record<string, unknown> | null = null,
  transaction?: Transaction,
): Promise<void> {
  db();
  await AuditEntry.create(
    { organisationId: actor.organisationId, userId: actor.id, action, entity, entityId: entityId == null ? null : String(entityId), detail },
    { transaction },
  );
  if (transaction) transaction.afterCommit(() => bumpRevision(actor.organisationId));
  else await bumpRevision(actor.organisationId);
}

/**
 * After the change is committed, never inside its transaction: a reader that sees the new
 * revision then sees the change, and no writer holds the organisation's row while it works. A
 * failure here (the database gone between the commit and this) is logged, not thrown, since the
 * change itself is saved; kept data then lags until the next change or VERSIONED_CACHE_TTL_MS.
 */
async function bumpRevision(organisationId: number): Promise<void> {
  try {
    await db().query("INSERT INTO organisation_revisions (organisation_id, revision) VALUES (:organisationId, 1) ON DUPLICATE KEY UPDATE revision = revision + 1", {
      replacements: { organisationId },
      type: QueryTypes.INSERT,
    });
  } catch (error) {
    console.error(`[duskline] could not move organisation ${organisationId}'s data revision on: ${(error as Error).message}`);
  }
}

/** Audit entries of the organisation matching the filters, newest first, each with its sentence. */
export async function searchAudit(organisationId: number, filters: AuditFilters = {}, limit = 200) {
  db();
  const where: WhereOptions<AuditEntry> = { organisationId };
  if (filters.person) Object.assign(where, { userId: filters.person });
  if (filters.entity) Object.assign(where, { entity: filters.entity });
  if (filters.action) Object.assign(where, { action: filters.action });
  if (filters.from || filters.to) {
    const range: Record<symbol, Date> = {};
    if (filters.from) range[Op.gte] = new Date(`${filters.from}T00:00:00Z`);
    // "to" is inclusive: the whole of that UTC day.
    if (filters.to) range[Op.lt] = new Date(Date.parse(`${filters.to}T00:00:00Z`) + 86_400_000);
    Object.assign(where, { createdAt: range });
  }
  const rows = await AuditEntry.findAll({
    where,
    order: [["createdAt", "DESC"], ["id", "DESC"]],
    limit,
    include: [{ model: User, attributes: ["email", "name"] }],
  });
  return rows.map((r) => {
    const u = (r as unknown as { User?: User }).User;
    const who = u ? u.name : "The system";
    return {
      id: r.id,
      at: r.createdAt.toISOString(),
      who,
      email: u?.email ?? null,
      action: r.action,
      entity: r.entity,
      entityId: r.entityId,
      sentence: describeAuditEntry({ who, action: r.action, entity: r.entity, entityId: r.entityId, detail: r.detail }),
    };
  });
}

/**
 * The organisation's data revision, as a version of everything it has: every change to its
 * circuits, crossings (details, temperatures, aviation record), load and device profiles,
 * studies, options, reviews, rule book, policy and time zone is audited, and each audit moves the
 * revision on once its change has committed. So data computed after reading a revision is at
 * least as new as that revision, and can be kept until it changes (portfolio rows, study pages).
 * A change that is not audited would be missed: audit every such change.
 *
 * Unlike the latest audit entry's id (the version before migration 022), two writers committing
 * out of order each move it. What is left: a bump lost between a commit and the update (the
 * process killed there), which VERSIONED_CACHE_TTL_MS bounds.
 */
export async function organisationRevision(organisationId: number): Promise<string> {
  const [row] = await db().query<{ revision: number | string }>("SELECT revision FROM organisation_revisions WHERE organisation_id = :organisationId", {
    replacements: { organisationId },
    type: QueryTypes.SELECT,
  });
  return String(row?.revision ?? 0);
}

/** How long data kept by organisation revision may be reused at most (see organisationRevision). */
export const VERSIONED_CACHE_TTL_MS = 30_000;

/** What the filters can choose from: the organisation's people, record kinds and actions seen. */
export async function auditFilterChoices(organisationId: number) {
  db();
  const [people, entities, actions] = await Promise.all([
    User.findAll({ where: { organisationId }, attributes: ["id", "name"], order: [["name", "ASC"]] }),
    AuditEntry.findAll({ where: { organisationId }, attributes: ["entity"], group: ["entity"], order: [["entity", "ASC"]] }),
    AuditEntry.findAll({ where: { organisationId }, attributes: ["action"], group: ["action"], order: [["action", "ASC"]] }),
  ]);
  return { people: people.map((p) => ({ id: p.id, name: p.name })), entities: entities.map((e) => e.entity), actions: actions.map((a) => a.action) };
}
