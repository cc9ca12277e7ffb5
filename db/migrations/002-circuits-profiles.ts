import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const org = { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" };

export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("circuits", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: org,
    name: { type: DataTypes.STRING(200), allowNull: false },
    voltage_kv: { type: DataTypes.DOUBLE, allowNull: false },
    phases: { type: DataTypes.INTEGER, allowNull: false },
    normal_rating_a: { type: DataTypes.DOUBLE, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
  await q.addIndex("circuits", ["organisation_id", "name"], { unique: true });
  await q.createTable("crossings", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: org,
    circuit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "circuits", key: "id" }, onDelete: "CASCADE" },
    name: { type: DataTypes.STRING(200), allowNull: false },
    lat: { type: DataTypes.DOUBLE, allowNull: false },
    lon: { type: DataTypes.DOUBLE, allowNull: false },
    span_length_value: { type: DataTypes.DOUBLE, allowNull: false },
    span_length_unit: { type: DataTypes.ENUM("m", "ft"), allowNull: false },
    kind: { type: DataTypes.ENUM("river", "canyon", "lake", "road", "rail", "airport-vicinity", "other"), allowNull: false },
    ...timestamps,
  });
  await q.addIndex("crossings", ["circuit_id", "name"], { unique: true });
  await q.createTable("load_profiles", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: org,
    circuit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "circuits", key: "id" }, onDelete: "CASCADE" },
    name: { type: DataTypes.STRING(200), allowNull: false },
    phases: { type: DataTypes.STRING(8), allowNull: false },
    start_at: { type: DataTypes.DATE(3), allowNull: false },
    end_at: { type: DataTypes.DATE(3), allowNull: false },
    samples: { type: DataTypes.INTEGER, allowNull: false },
    source_file: { type: DataTypes.STRING(255), allowNull: true },
    mapping: { type: DataTypes.JSON, allowNull: false },
    quality: { type: DataTypes.JSON, allowNull: false },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    ...timestamps,
  });
  // The samples themselves, compact: Float64 epoch seconds and Float32 amps per phase.
  await q.createTable("load_profile_series", {
    profile_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: "load_profiles", key: "id" }, onDelete: "CASCADE" },
    times: { type: DataTypes.BLOB("long"), allowNull: false },
    phase_a: { type: DataTypes.BLOB("long"), allowNull: true },
    phase_b: { type: DataTypes.BLOB("long"), allowNull: true },
    phase_c: { type: DataTypes.BLOB("long"), allowNull: true },
  });
}

export async function down({ context: q }: { context: MigrationContext }) {
  for (const t of ["load_profile_series", "load_profiles", "crossings", "circuits"]) await q.dropTable(t);
}
