import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Temperatures for cold-weather storage (docs/computation.md "Cold-weather storage"):
// - crossings.temperature_normals: the crossing's monthly normal temperatures, {monthlyC: [12 °C],
//   source}, used by its studies and the optimiser unless a run gives its own;
// - load_profiles.temperature: monthly means of the upload's temperature column, {column, unit,
//   months: {"YYYY-MM": {meanC, readings}}}; a study copies the means it used into its inputs, so
//   a later append or replacement never changes a saved study.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.addColumn("crossings", "temperature_normals", { type: DataTypes.JSON, allowNull: true });
  await q.addColumn("load_profiles", "temperature", { type: DataTypes.JSON, allowNull: true });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.removeColumn("load_profiles", "temperature");
  await q.removeColumn("crossings", "temperature_normals");
}
