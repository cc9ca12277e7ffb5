import { ApiKey, User } from "../../db/models";
import type { Sequelize } from "sequelize";
import { parseStoredScopes, ROLE_SCOPES, API_SCOPES } from "../../shared/api-scopes";
import type { ApiKeyInput } from "../../shared/account-schemas";
import { db } from "../utils/db.server";
import { apiKeyHash, DEMO_KEY_PREFIX, newApiKey } from "../utils/api-keys.server";
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
    // A key made before scopes acts with its role's scopes.
    scopes: parseStoredScopes(k.scopes) ?? [...ROLE_SCOPES[k.role]],
    scoped: k.scopes !== null,
    expiresAt: k.expiresAt?.toISOString() ?? null,
    expired: !!k.expiresAt && k.expiresAt.getTime() <= Date.now(),
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
export async function createApiKey(actor: Actor, input: ApiKeyInput): Promise<{ id: number; key: string; prefix: string }> {
  const sequelize = db();
  const { key, prefix } = newApiKey();
  return sequelize.transaction(async (transaction) => {
    const row = await ApiKey.create(
      {
        organisationId: actor.organisationId,
        name: input.name,
        prefix,
        keyHash: apiKeyHash(key),
        role: input.role,
        scopes: JSON.stringify(input.scopes),
        expiresAt: input.expiresOn,
        createdBy: actor.id,
        lastUsedAt: null,
        revokedAt: null,
      },
      { transaction },
    );
    const expires = input.expiresOn?.toISOString() ?? null;
    await audit(actor, "api-key.created", "api-key", row.id, { name: input.name, role: input.role, prefix, scopes: input.scopes, expiresAt: expires }, transaction);
    return { id: row.id, key, prefix };
  });
}

/**
 * The local demo key (every scope, secret from DEMO_API_KEY), created by the demo seed on a
 * developer's machine only; the API refuses it wherever DUSKLINE_LOCAL is off.
 */
export async function seedDemoApiKey(sequelize: Sequelize, organisationId: number, adminId: number, secret: string): Promise<void> {
  // Once per organisation: a database seeded before keys had scopes gets it on the next start,
  // and a demo key an admin has revoked stays revoked.
  if (await ApiKey.count({ where: { organisationId, prefix: DEMO_KEY_PREFIX } })) return;
  await sequelize.transaction(async (transaction) => {
    await ApiKey.create(
      { organisationId, name: "Local demo key (development only)", prefix: DEMO_KEY_PREFIX, keyHash: apiKeyHash(secret), role: "engineer", scopes: JSON.stringify(API_SCOPES), createdBy: adminId, lastUsedAt: null, revokedAt: null },
      { transaction },
    );
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
