import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

// Several wires at the highest point of a span: how many (NULL = one) and how far apart side by
// side, in the span's unit (NULL = not stated); the layout marks them per the rule book.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.addColumn("crossings", "top_wire_count", { type: DataTypes.INTEGER, allowNull: true });
  await q.addColumn("crossings", "top_wire_separation", { type: DataTypes.DOUBLE, allowNull: true });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.removeColumn("crossings", "top_wire_separation");
  await q.removeColumn("crossings", "top_wire_count");
}
