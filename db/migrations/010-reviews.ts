import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// A crossing's review (one row per crossing, created on its first move), the history of its
// moves, and the e-mail outbox that notifications go through so SMTP being down loses nothing.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("crossing_reviews", {
    crossing_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: "crossings", key: "id" }, onDelete: "CASCADE" },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    state: { type: DataTypes.ENUM("draft", "submitted", "approved", "returned"), allowNull: false, defaultValue: "draft" },
    decision: { type: DataTypes.ENUM("recommended", "other", "do-not-proceed"), allowNull: true },
    option_id: { type: DataTypes.INTEGER, allowNull: true },
    study_id: { type: DataTypes.INTEGER, allowNull: true },
    // What was approved (lib/review/staleness ApprovalSnapshot); null unless approved.
    snapshot: { type: DataTypes.JSON, allowNull: true },
    submitted_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    submitted_at: { type: DataTypes.DATE, allowNull: true },
    // Names as they were at the move (an API key acts as its creator but is named as the key).
    submitted_by_name: { type: DataTypes.STRING(200), allowNull: true },
    approved_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    approved_at: { type: DataTypes.DATE, allowNull: true },
    approved_by_name: { type: DataTypes.STRING(200), allowNull: true },
    // When the approver was told the approval went stale (once per approval).
    stale_notified_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex("crossing_reviews", ["organisation_id", "state"]);
  await q.createTable("review_events", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    crossing_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "crossings", key: "id" }, onDelete: "CASCADE" },
    action: { type: DataTypes.ENUM("submit", "approve", "return", "reopen", "stale"), allowNull: false },
    from_state: { type: DataTypes.ENUM("draft", "submitted", "approved", "returned"), allowNull: false },
    to_state: { type: DataTypes.ENUM("draft", "submitted", "approved", "returned"), allowNull: false },
    decision: { type: DataTypes.ENUM("recommended", "other", "do-not-proceed"), allowNull: true },
    option_id: { type: DataTypes.INTEGER, allowNull: true },
    comment: { type: DataTypes.TEXT, allowNull: false },
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    actor_name: { type: DataTypes.STRING(200), allowNull: false },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex("review_events", ["crossing_id", "id"]);
  await q.createTable("outbox_messages", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    to_address: { type: DataTypes.STRING(320), allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    html: { type: DataTypes.TEXT, allowNull: true },
    status: { type: DataTypes.ENUM("pending", "sent"), allowNull: false, defaultValue: "pending" },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    next_attempt_at: { type: DataTypes.DATE, allowNull: false },
    last_error: { type: DataTypes.TEXT, allowNull: true },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex("outbox_messages", ["status", "next_attempt_at"]);
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("outbox_messages");
  await q.dropTable("review_events");
  await q.dropTable("crossing_reviews");
}
