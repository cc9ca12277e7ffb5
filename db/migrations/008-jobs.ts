import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Long work (studies with solvers on years of data, later API batches) as rows any app instance
// can claim (SELECT … FOR UPDATE SKIP LOCKED) and another can take over when the heartbeat stops.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("jobs", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    // What to run, e.g. "study.run"; the handler registered for it reads `input`.
    kind: { type: DataTypes.STRING(64), allowNull: false },
    state: { type: DataTypes.ENUM("queued", "running", "done", "failed"), allowNull: false, defaultValue: "queued" },
    progress: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    input: { type: DataTypes.JSON, allowNull: false },
    // Where the outcome lives (e.g. /api/v1/studies/12) and a short summary of it.
    result_url: { type: DataTypes.STRING(255), allowNull: true },
    result: { type: DataTypes.JSON, allowNull: true },
    // problem+json-like: { status, title, detail, errors? }
    error: { type: DataTypes.JSON, allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    claimed_by: { type: DataTypes.STRING(100), allowNull: true },
    heartbeat_at: { type: DataTypes.DATE(3), allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    started_at: { type: DataTypes.DATE(3), allowNull: true },
    finished_at: { type: DataTypes.DATE(3), allowNull: true },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex("jobs", ["state", "heartbeat_at"], { name: "jobs_claim" });
  await q.addIndex("jobs", ["organisation_id", "created_at"], { name: "jobs_organisation" });
  // Also here (one migration per change set): the portfolio's "latest study of each crossing of
  // an organisation" reads this index alone.
  await q.addIndex("studies", ["organisation_id", "crossing_id", "id"], { name: "studies_latest" });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.removeIndex("studies", "studies_latest");
  await q.dropTable("jobs");
}
