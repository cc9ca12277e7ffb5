import { Op, QueryTypes, type Transaction, type WhereOptions } from "sequelize";
import { AuditEntry, User } from "../../db/models";
import { db } from "../utils/db.server";
import { describeAuditEntry } from "../../lib/audit/describe";
import type { AuditFilters } from "../../shared/audit-schemas";

export interface Actor {
  id: number | null;
  organisationId: number;
}

/** Records who did what on which record; call inside the same transaction as the change. */
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

/** What the filters can choose from: the organisation's people, record kinds and actions seen. */
/**
 * The id of the organisation's latest audit entry, as a version of everything it has: every
 * change to its circuits, crossings (details, temperatures, aviation record), load and device
 * profiles, studies, options, reviews, rule book, policy and time zone is audited in the same
 * transaction, so data computed from those can be kept until this changes (portfolio rows,
 * study pages). A change that is not audited would be missed: audit every such change.
 *
 * One gap remains: two writers of one organisation whose audit rows commit out of order (the
 * lower id last) leave the latest id unchanged by the later commit, so data read between the two
 * commits would be kept without the first writer's change. Such data is kept at most
 * VERSIONED_CACHE_TTL_MS, which bounds how long that can show.
 */
export async function latestAuditId(organisationId: number): Promise<string> {
  // Index-only on (organisation_id, created_at), which carries the primary key.
  const [row] = await db().query<{ id: number }>("SELECT id FROM audit_log WHERE organisation_id = :organisationId ORDER BY created_at DESC, id DESC LIMIT 1", {
    replacements: { organisationId },
    type: QueryTypes.SELECT,
  });
  return String(row?.id ?? 0);
}

/** How long data kept by latestAuditId may be reused at most (see latestAuditId). */
export const VERSIONED_CACHE_TTL_MS = 30_000;

export async function auditFilterChoices(organisationId: number) {
  db();
  const [people, entities, actions] = await Promise.all([
    User.findAll({ where: { organisationId }, attributes: ["id", "name"], order: [["name", "ASC"]] }),
    AuditEntry.findAll({ where: { organisationId }, attributes: ["entity"], group: ["entity"], order: [["entity", "ASC"]] }),
    AuditEntry.findAll({ where: { organisationId }, attributes: ["action"], group: ["action"], order: [["action", "ASC"]] }),
  ]);
  return { people: people.map((p) => ({ id: p.id, name: p.name })), entities: entities.map((e) => e.entity), actions: actions.map((a) => a.action) };
}
