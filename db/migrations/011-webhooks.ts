import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Webhooks (issue 12): endpoints an admin registers for events, and the deliveries to them as an
// outbox, so a receiver being down loses nothing and every attempt is on record.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("webhooks", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    url: { type: DataTypes.STRING(2000), allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false, defaultValue: "" },
    // Event names, e.g. ["study.completed", "job.failed"].
    events: { type: DataTypes.JSON, allowNull: false },
    // The signing key: the receiver needs the same bytes, so it is kept (not hashed) and shown once.
    secret: { type: DataTypes.STRING(100), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex("webhooks", ["organisation_id", "active"], { name: "webhooks_organisation" });
  await q.createTable("webhook_deliveries", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    webhook_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "webhooks", key: "id" }, onDelete: "CASCADE" },
    event: { type: DataTypes.STRING(64), allowNull: false },
    // The exact body sent (and signed) at every attempt.
    payload: { type: DataTypes.TEXT("medium"), allowNull: false },
    state: { type: DataTypes.ENUM("pending", "delivered", "failed"), allowNull: false, defaultValue: "pending" },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    // When the next attempt is due; while an attempt is in flight, the end of its lease.
    next_attempt_at: { type: DataTypes.DATE(3), allowNull: true },
    last_status: { type: DataTypes.INTEGER, allowNull: true },
    last_response: { type: DataTypes.TEXT, allowNull: true },
    last_error: { type: DataTypes.STRING(500), allowNull: true },
    last_attempt_at: { type: DataTypes.DATE(3), allowNull: true },
    delivered_at: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex("webhook_deliveries", ["state", "next_attempt_at"], { name: "webhook_deliveries_due" });
  await q.addIndex("webhook_deliveries", ["webhook_id", "id"], { name: "webhook_deliveries_log" });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("webhook_deliveries");
  await q.dropTable("webhooks");
}
