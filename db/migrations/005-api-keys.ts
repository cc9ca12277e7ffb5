import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("api_keys", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    name: { type: DataTypes.STRING(200), allowNull: false },
    // The first characters of the key, shown in lists so a key can be recognised.
    prefix: { type: DataTypes.STRING(16), allowNull: false },
    // SHA-256 of the whole key; the key itself is shown once and never stored.
    key_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    // The role the key acts with inside its organisation (its scope).
    role: { type: DataTypes.ENUM("engineer", "consultant", "manager"), allowNull: false },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("api_keys");
}
