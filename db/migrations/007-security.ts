import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Rate limits kept in MariaDB (so every app instance sees the same counts), and sign-in attempts
// whose client address is unknown (recorded without one rather than all under one shared value).
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("rate_limit_hits", {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    // What is limited, e.g. "password-reset".
    action: { type: DataTypes.STRING(40), allowNull: false },
    // Who is counted, e.g. "email:a@example.com" or "address:10.1.2.3".
    subject: { type: DataTypes.STRING(300), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex("rate_limit_hits", ["action", "subject", "created_at"]);
  await q.addIndex("rate_limit_hits", ["created_at"]);
  await q.changeColumn("sign_in_attempts", "ip", { type: DataTypes.STRING(64), allowNull: true });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.sequelize.query("UPDATE sign_in_attempts SET ip = 'unknown' WHERE ip IS NULL");
  await q.changeColumn("sign_in_attempts", "ip", { type: DataTypes.STRING(64), allowNull: false });
  await q.dropTable("rate_limit_hits");
}
