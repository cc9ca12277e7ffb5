import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Responses of POSTs sent with an Idempotency-Key, so a retried request gets the first answer
// instead of creating a second record. Kept 24 hours (app/services/idempotency.server.ts).
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("idempotency_keys", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    key: { type: DataTypes.STRING(255), allowNull: false },
    // SHA-256 of method, path with query and body: the same key with another request is refused.
    fingerprint: { type: DataTypes.STRING(64), allowNull: false },
    response_status: { type: DataTypes.INTEGER, allowNull: false },
    response_body: { type: DataTypes.TEXT("medium"), allowNull: false },
    response_location: { type: DataTypes.STRING(500), allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex("idempotency_keys", ["organisation_id", "key"], { unique: true, name: "idempotency_keys_organisation_key" });
  await q.addIndex("idempotency_keys", ["created_at"], { name: "idempotency_keys_created_at" });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("idempotency_keys");
}
