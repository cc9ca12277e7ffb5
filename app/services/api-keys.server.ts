import { ApiKey, User } from "../../db/models";
import type { ApiKeyRole } from "../../db/models/api-key";
import { db } from "../utils/db.server";
import { apiKeyHash, newApiKey } from "../utils/api-keys.server";
import { audit, type Actor } from "./audit.server";
import { NotFoundError } from "./errors.server";

export async function listApiKeys(organisationId: number) {
  db();
  const keys = await ApiKey.findAll({
    where: { organisationId },
    include: [{ model: User, as: "creator", attributes: ["name", "active"] }],
    order: [["revokedAt", "ASC"], ["createdAt", "DESC"]],
  });
  return keys.map((k) => ({
    id: k.id,
    name: k.name,
    prefix: k.prefix,
    role: k.role,
    createdAt: k.createdAt.toISOString(),
    lastUsedAt: k.lastUsedAt?.toISOString() ?? null,
    revokedAt: k.revokedAt?.toISOString() ?? null,
    ...creatorOf(k),
  }));
}

/** Who created the key, and whether the key is stopped because that person no longer may act. */
function creatorOf(key: ApiKey): { creatorName: string | null; creatorStopped: boolean } {
  const creator = (key as unknown as { creator?: User | null }).creator ?? null;
  return { creatorName: creator?.name ?? null, creatorStopped: !creator || !creator.active };
}

/** Creates a key and returns it in full: the only time it is ever shown. */
export async function createApiKey(actor: Actor, input: { name: string; role: ApiKeyRole }): Promise<{ id: number; key: string }> {
  const sequelize = db();
  const { key, prefix } = newApiKey();
  return sequelize.transaction(async (transaction) => {
    const row = await ApiKey.create(
      { organisationId: actor.organisationId, name: input.name, prefix, keyHash: apiKeyHash(key), role: input.role, createdBy: actor.id, lastUsedAt: null, revokedAt: null },
      { transaction },
    );
    await audit(actor, "api-key.created", "api-key", row.id, { name: input.name, role: input.role, prefix }, transaction);
    return { id: row.id, key };
  });
}

export async function revokeApiKey(actor: Actor, id: number): Promise<void> {
  const sequelize = db();
  const key = await ApiKey.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!key) throw new NotFoundError(`API key ${id}`);
  if (key.revokedAt) return;
  await sequelize.transaction(async (transaction) => {
    await key.update({ revokedAt: new Date() }, { transaction });
    await audit(actor, "api-key.revoked", "api-key", id, { name: key.name, prefix: key.prefix }, transaction);
  });
}

/**
 * The acting admin becomes the key's creator, so a key stopped by its creator's deactivation
 * works again under someone who still answers for it.
 */
export async function takeOverApiKey(actor: Actor, id: number): Promise<void> {
  const sequelize = db();
  const key = await ApiKey.findOne({ where: { id, organisationId: actor.organisationId, revokedAt: null } });
  if (!key) throw new NotFoundError(`API key ${id}`);
  const from = key.createdBy;
  await sequelize.transaction(async (transaction) => {
    await key.update({ createdBy: actor.id }, { transaction });
    await audit(actor, "api-key.taken-over", "api-key", id, { name: key.name, prefix: key.prefix, fromUserId: from }, transaction);
  });
}
