import { DataTypes } from "sequelize";
import type { MigrationContext } from "../migrate";

const STATUSES = ["published", "common practice", "unconfirmed"];

// The organisation's rule book: one row per rule (seeded from the shipped data/rules/*.json the
// first time the organisation's rule book is read), and the history of every confirmation and
// override with the values before and after.
export async function up({ context: q }: { context: MigrationContext }) {
  await q.createTable("rule_book_rules", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    rule_key: { type: DataTypes.STRING(100), allowNull: false },
    rule_set: { type: DataTypes.ENUM("faa", "icao"), allowNull: false },
    title: { type: DataTypes.STRING(200), allowNull: false },
    rule_text: { type: DataTypes.TEXT, allowNull: false },
    rule_values: { type: DataTypes.JSON, allowNull: false },
    document: { type: DataTypes.STRING(200), allowNull: false },
    edition: { type: DataTypes.STRING(100), allowNull: true },
    paragraph: { type: DataTypes.STRING(200), allowNull: true },
    status: { type: DataTypes.ENUM(...STATUSES), allowNull: false },
    quote: { type: DataTypes.STRING(300), allowNull: true },
    confirmed_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    confirmed_by_name: { type: DataTypes.STRING(200), allowNull: true },
    confirmed_on: { type: DataTypes.DATEONLY, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex("rule_book_rules", ["organisation_id", "rule_key"], { unique: true });
  await q.createTable("rule_book_changes", {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "organisations", key: "id" }, onDelete: "CASCADE" },
    rule_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "rule_book_rules", key: "id" }, onDelete: "CASCADE" },
    action: { type: DataTypes.ENUM("confirm", "override"), allowNull: false },
    values_before: { type: DataTypes.JSON, allowNull: false },
    values_after: { type: DataTypes.JSON, allowNull: false },
    status_before: { type: DataTypes.ENUM(...STATUSES), allowNull: false },
    source_before: { type: DataTypes.STRING(400), allowNull: false },
    source_after: { type: DataTypes.STRING(400), allowNull: false },
    confirmed_on: { type: DataTypes.DATEONLY, allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: true },
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
    actor_name: { type: DataTypes.STRING(200), allowNull: false },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex("rule_book_changes", ["rule_id", "id"]);
  // A crossing's aviation record (structure numbers, determination, notice-check inputs), kept
  // apart from the span details so that it does not enter what an approval fingerprints.
  await q.addColumn("crossings", "aviation_record", { type: DataTypes.JSON, allowNull: true });
}

export async function down({ context: q }: { context: MigrationContext }) {
  await q.removeColumn("crossings", "aviation_record");
  await q.dropTable("rule_book_changes");
  await q.dropTable("rule_book_rules");
}
