import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const org = { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" };
const userRef = { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" };

export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("device_profiles", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: org,
    name: { type: DataTypes.STRING(200), allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: true },
    // The device fields of docs/computation.md, validated by shared/study-schemas deviceSchema.
    spec: { type: DataTypes.JSON, allowNull: false },
    retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await q.addIndex("device_profiles", ["organisation_id", "name"], { unique: true });
  await q.createTable("organisation_policies", {
    organisation_id: { ...org, primaryKey: true },
    policy: { type: DataTypes.JSON, allowNull: false },
    updated_by: userRef,
    ...timestamps,
  });
  await q.createTable("studies", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: org,
    circuit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "circuits", key: "id" }, onDelete: "CASCADE" },
    crossing_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "crossings", key: "id" }, onDelete: "CASCADE" },
    // Kept when the profile or device profile is later deleted: the inputs are stored in full.
    profile_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "load_profiles", key: "id" }, onDelete: "SET NULL" },
    device_profile_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "device_profiles", key: "id" }, onDelete: "SET NULL" },
    inputs: { type: DataTypes.JSON, allowNull: false },
    // Summary columns for the portfolio; the full result is in `results`.
    verdict: { type: DataTypes.ENUM("go", "marginal", "no-go", "insufficient-data"), allowNull: false },
    availability: { type: DataTypes.DOUBLE, allowNull: true },
    known_hours: { type: DataTypes.DOUBLE, allowNull: false },
    required_known_hours: { type: DataTypes.DOUBLE, allowNull: false },
    dark_hours: { type: DataTypes.DOUBLE, allowNull: false },
    longest_dark_hours: { type: DataTypes.DOUBLE, allowNull: false },
    results: { type: DataTypes.JSON, allowNull: false },
    engine_version: { type: DataTypes.INTEGER, allowNull: false },
    run_ms: { type: DataTypes.INTEGER, allowNull: false },
    created_by: userRef,
    ...timestamps,
  });
  await q.addIndex("studies", ["crossing_id", "created_at"]);
  await q.addIndex("studies", ["organisation_id", "verdict"]);
}

export async function down({ context: q }: { context: MigrationContext }) {
  for (const t of ["studies", "organisation_policies", "device_profiles"]) await q.dropTable(t);
}
