import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { FeasibilityStatus, InstallationMethod, OptionKind } from "../../shared/cost-schemas";

/** One candidate way of marking and lighting a crossing, with the figures its life-cycle cost needs. */
export class LightingOption extends Model<InferAttributes<LightingOption>, InferCreationAttributes<LightingOption>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare crossingId: number;
  declare kind: OptionKind;
  declare name: string;
  /** null: follow the marker count of the crossing's layout. */
  declare units: number | null;
  declare unitPrice: number;
  declare installationMethod: InstallationMethod;
  declare mobilisation: number;
  declare ratePerHour: number;
  declare minutesPerUnit: number;
  declare outageNeeded: boolean;
  declare outageCost: number;
  declare annualMaintenance: number;
  declare serviceLifeYears: number;
  declare horizonYears: number;
  declare discountRate: number;
  /** null for line-powered options: their feasibility comes from the crossing's latest study. */
  declare feasibilityStatus: FeasibilityStatus | null;
  declare feasibilityJustification: string | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    LightingOption.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        crossingId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.ENUM("line-powered", "solar", "structure-supply", "unlit"), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        units: { type: DataTypes.INTEGER, allowNull: true },
        unitPrice: { type: DataTypes.DOUBLE, allowNull: false },
        installationMethod: { type: DataTypes.ENUM("helicopter", "bucket-truck", "crane", "barge", "ground-crew"), allowNull: false },
        mobilisation: { type: DataTypes.DOUBLE, allowNull: false },
        ratePerHour: { type: DataTypes.DOUBLE, allowNull: false },
        minutesPerUnit: { type: DataTypes.DOUBLE, allowNull: false },
        outageNeeded: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        outageCost: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        annualMaintenance: { type: DataTypes.DOUBLE, allowNull: false },
        serviceLifeYears: { type: DataTypes.INTEGER, allowNull: false },
        horizonYears: { type: DataTypes.INTEGER, allowNull: false },
        discountRate: { type: DataTypes.DOUBLE, allowNull: false },
        feasibilityStatus: { type: DataTypes.ENUM("go", "marginal", "no-go", "insufficient-data", "unknown"), allowNull: true },
        feasibilityJustification: { type: DataTypes.TEXT, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "lighting_options" },
    );
  }
}
