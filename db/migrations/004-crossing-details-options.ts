import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Span and marking details of a crossing (lengths in the crossing's span unit; heights from the
// support bases) and the lighting options compared on cost per crossing.
const DETAIL_COLUMNS = {
  support_height_a: { type: DataTypes.DOUBLE, allowNull: true },
  support_height_b: { type: DataTypes.DOUBLE, allowNull: true },
  attachment_height_a: { type: DataTypes.DOUBLE, allowNull: true },
  attachment_height_b: { type: DataTypes.DOUBLE, allowNull: true },
  sag_kind: { type: DataTypes.ENUM("midspan-sag", "lowest-clearance"), allowNull: true },
  sag_value: { type: DataTypes.DOUBLE, allowNull: true },
  surface_level: { type: DataTypes.DOUBLE, allowNull: true },
  highest_wire: { type: DataTypes.ENUM("shield", "phase"), allowNull: true },
  wire_separation: { type: DataTypes.DOUBLE, allowNull: true },
  runway_end_distance: { type: DataTypes.DOUBLE, allowNull: true },
  runway_end_critical_area: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
  rule_set: { type: DataTypes.ENUM("faa", "icao"), allowNull: false, defaultValue: "faa" },
  marker_diameter_value: { type: DataTypes.DOUBLE, allowNull: true },
  marker_diameter_unit: { type: DataTypes.ENUM("in", "cm"), allowNull: true },
  icao_colour: { type: DataTypes.ENUM("red", "orange"), allowNull: false, defaultValue: "red" },
  lit_phase: { type: DataTypes.ENUM("A", "B", "C"), allowNull: true },
  cost_currency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: "USD" },
};

export async function up({ context: q }: { context: MigrationContext }) {
  for (const [name, spec] of Object.entries(DETAIL_COLUMNS)) await q.addColumn("crossings", name, spec);
  await q.createTable("lighting_options", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    crossing_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "crossings", key: "id" }, onDelete: "CASCADE" },
    kind: { type: DataTypes.ENUM("line-powered", "solar", "structure-supply", "unlit"), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    // NULL: follow the marker count of the crossing's layout.
    units: { type: DataTypes.INTEGER, allowNull: true },
    unit_price: { type: DataTypes.DOUBLE, allowNull: false },
    installation_method: { type: DataTypes.ENUM("helicopter", "bucket-truck", "crane", "barge", "ground-crew"), allowNull: false },
    mobilisation: { type: DataTypes.DOUBLE, allowNull: false },
    rate_per_hour: { type: DataTypes.DOUBLE, allowNull: false },
    minutes_per_unit: { type: DataTypes.DOUBLE, allowNull: false },
    outage_needed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    outage_cost: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    annual_maintenance: { type: DataTypes.DOUBLE, allowNull: false },
    service_life_years: { type: DataTypes.INTEGER, allowNull: false },
    horizon_years: { type: DataTypes.INTEGER, allowNull: false },
    discount_rate: { type: DataTypes.DOUBLE, allowNull: false },
    // Line-powered options take theirs from the latest study, so these stay NULL for them.
    feasibility_status: { type: DataTypes.ENUM("go", "marginal", "no-go", "insufficient-data", "unknown"), allowNull: true },
    feasibility_justification: { type: DataTypes.TEXT, allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex("lighting_options", ["crossing_id", "name"], { unique: true });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.dropTable("lighting_options");
  for (const name of Object.keys(DETAIL_COLUMNS).reverse()) await q.removeColumn("crossings", name);
}
