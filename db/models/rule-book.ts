import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { RULE_STATUSES, type RuleStatus } from "../../shared/rule-book";

/** One rule of an organisation's rule book: its values and where they come from. */
export class RuleBookRule extends Model<InferAttributes<RuleBookRule>, InferCreationAttributes<RuleBookRule>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare ruleKey: string;
  declare ruleSet: "faa" | "icao";
  declare title: string;
  declare ruleText: string;
  declare ruleValues: Record<string, unknown>;
  declare document: string;
  declare edition: string | null;
  declare paragraph: string | null;
  declare status: RuleStatus;
  declare quote: string | null;
  declare confirmedBy: number | null;
  declare confirmedByName: string | null;
  declare confirmedOn: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RuleBookRule.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        ruleKey: { type: DataTypes.STRING(100), allowNull: false },
        ruleSet: { type: DataTypes.ENUM("faa", "icao"), allowNull: false },
        title: { type: DataTypes.STRING(200), allowNull: false },
        ruleText: { type: DataTypes.TEXT, allowNull: false },
        ruleValues: { type: DataTypes.JSON, allowNull: false },
        document: { type: DataTypes.STRING(200), allowNull: false },
        edition: { type: DataTypes.STRING(100), allowNull: true },
        paragraph: { type: DataTypes.STRING(200), allowNull: true },
        status: { type: DataTypes.ENUM(...RULE_STATUSES), allowNull: false },
        quote: { type: DataTypes.STRING(300), allowNull: true },
        confirmedBy: { type: DataTypes.INTEGER, allowNull: true },
        confirmedByName: { type: DataTypes.STRING(200), allowNull: true },
        confirmedOn: { type: DataTypes.DATEONLY, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "rule_book_rules" },
    );
  }
}

/** One confirmation or override of a rule, with the values before and after; never edited. */
export class RuleBookChange extends Model<InferAttributes<RuleBookChange>, InferCreationAttributes<RuleBookChange>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare ruleId: number;
  declare action: "confirm" | "override";
  declare valuesBefore: Record<string, unknown>;
  declare valuesAfter: Record<string, unknown>;
  declare statusBefore: RuleStatus;
  declare sourceBefore: string;
  declare sourceAfter: string;
  declare confirmedOn: string;
  declare note: string | null;
  declare userId: number | null;
  declare actorName: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RuleBookChange.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        ruleId: { type: DataTypes.INTEGER, allowNull: false },
        action: { type: DataTypes.ENUM("confirm", "override"), allowNull: false },
        valuesBefore: { type: DataTypes.JSON, allowNull: false },
        valuesAfter: { type: DataTypes.JSON, allowNull: false },
        statusBefore: { type: DataTypes.ENUM(...RULE_STATUSES), allowNull: false },
        sourceBefore: { type: DataTypes.STRING(400), allowNull: false },
        sourceAfter: { type: DataTypes.STRING(400), allowNull: false },
        confirmedOn: { type: DataTypes.DATEONLY, allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: true },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        actorName: { type: DataTypes.STRING(200), allowNull: false },
        createdAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: "rule_book_changes", updatedAt: false },
    );
  }
}
