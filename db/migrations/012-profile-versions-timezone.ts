import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Time zones: the organisation's (default for its circuits) and a circuit's own, IANA names.
// Profile data versions: a profile's data can be appended to or replaced; the samples a study ran
// on are kept in load_profile_versions (when a study used them), so the study stays readable.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.addColumn("organisations", "time_zone", { type: DataTypes.STRING(64), allowNull: false, defaultValue: "UTC" });
  await q.addColumn("circuits", "time_zone", { type: DataTypes.STRING(64), allowNull: true });
  await q.addColumn("load_profiles", "data_version", { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 });
  // SHA-256 of the stored sample BLOBs; null for profiles stored before this migration.
  await q.addColumn("load_profiles", "fingerprint", { type: DataTypes.STRING(64), allowNull: true });
  await q.createTable("load_profile_versions", {
    profile_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: "load_profiles", key: "id" }, onDelete: "CASCADE" },
    version: { type: DataTypes.INTEGER, primaryKey: true },
    times: { type: DataTypes.BLOB("long"), allowNull: false },
    phase_a: { type: DataTypes.BLOB("long"), allowNull: true },
    phase_b: { type: DataTypes.BLOB("long"), allowNull: true },
    phase_c: { type: DataTypes.BLOB("long"), allowNull: true },
    fingerprint: { type: DataTypes.STRING(64), allowNull: true },
    samples: { type: DataTypes.INTEGER, allowNull: false },
    start_at: { type: DataTypes.DATE(3), allowNull: false },
    end_at: { type: DataTypes.DATE(3), allowNull: false },
    // How the version after this one came about: "appended" or "replaced", and when.
    superseded_by: { type: DataTypes.ENUM("appended", "replaced"), allowNull: false },
    superseded_at: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("load_profile_versions");
  await q.removeColumn("load_profiles", "fingerprint");
  await q.removeColumn("load_profiles", "data_version");
  await q.removeColumn("circuits", "time_zone");
  await q.removeColumn("organisations", "time_zone");
}
