import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Scoped API keys with an optional expiry, and per-minute request counters for the API limit.
export async function up({ context: q }: { context: MigrationContext }) {
  // JSON list of scopes; NULL for a key made before scopes, which acts with its role's scopes.
  await q.addColumn("api_keys", "scopes", { type: DataTypes.TEXT, allowNull: true });
  await q.addColumn("api_keys", "expires_at", { type: DataTypes.DATE, allowNull: true });
  // Requests per minute for this key; NULL = the default limit (API_RATE_LIMIT_PER_MINUTE).
  await q.addColumn("api_keys", "rate_limit_per_minute", { type: DataTypes.INTEGER, allowNull: true });
  // Fixed one-minute windows, one row per caller and minute, incremented in place
  // (INSERT … ON DUPLICATE KEY UPDATE), so every app instance counts the same requests.
  await q.createTable("api_request_counts", {
    subject: { type: DataTypes.STRING(120), allowNull: false, primaryKey: true },
    window_start: { type: DataTypes.DATE, allowNull: false, primaryKey: true },
    count: { type: DataTypes.INTEGER, allowNull: false },
  });
  await q.addIndex("api_request_counts", ["window_start"], { name: "api_request_counts_window_start" });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("api_request_counts");
  await q.removeColumn("api_keys", "rate_limit_per_minute");
  await q.removeColumn("api_keys", "expires_at");
  await q.removeColumn("api_keys", "scopes");
}
