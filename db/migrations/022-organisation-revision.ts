import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// organisation_revisions: one row per organisation counting its audited changes, each bumped
// after its change has committed (app/services/audit.server.ts). Data computed from the
// organisation's records (portfolio rows, study pages) is kept per revision. It replaces "the
// latest audit entry's id" as that version, which could stay put when two writers committed out
// of order. A table of its own, with no foreign key either way: an open transaction that has
// written an audit row holds a shared lock on its organisations row (audit_log's foreign key),
// and a counter there would make every other writer's bump wait for that transaction.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("organisation_revisions", {
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
    revision: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
  });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("organisation_revisions");
}
