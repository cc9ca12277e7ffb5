import type { Transaction } from "sequelize";
import { AuditEntry, User } from "../../db/models";
import { db } from "../utils/db.server";

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

export async function recentAudit(organisationId: number, limit = 200) {
  db();
  const rows = await AuditEntry.findAll({
    where: { organisationId },
    order: [["createdAt", "DESC"], ["id", "DESC"]],
    limit,
    include: [{ model: User, attributes: ["email", "name"] }],
  });
  return rows.map((r) => {
    const u = (r as unknown as { User?: User }).User;
    return {
      id: r.id,
      at: r.createdAt.toISOString(),
      who: u ? `${u.name} <${u.email}>` : "system",
      action: r.action,
      entity: r.entity,
      entityId: r.entityId,
      detail: r.detail,
    };
  });
}
