import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { StudyResult, VerdictStatus } from "../../shared/study-schemas";

/** One feasibility run with its full inputs and results; re-runs add rows, earlier ones stay readable. */
export class Study extends Model<InferAttributes<Study>, InferCreationAttributes<Study>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare circuitId: number;
  declare crossingId: number;
  declare profileId: number | null;
  declare deviceProfileId: number | null;
  declare inputs: Record<string, unknown>;
  declare verdict: VerdictStatus;
  declare availability: number | null;
  declare knownHours: number;
  declare requiredKnownHours: number;
  declare darkHours: number;
  declare longestDarkHours: number;
  declare results: StudyResult & Record<string, unknown>;
  declare engineVersion: number;
  declare runMs: number;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Study.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        circuitId: { type: DataTypes.INTEGER, allowNull: false },
        crossingId: { type: DataTypes.INTEGER, allowNull: false },
        profileId: { type: DataTypes.INTEGER, allowNull: true },
        deviceProfileId: { type: DataTypes.INTEGER, allowNull: true },
        inputs: { type: DataTypes.JSON, allowNull: false },
        verdict: { type: DataTypes.ENUM("go", "marginal", "no-go", "insufficient-data"), allowNull: false },
        availability: { type: DataTypes.DOUBLE, allowNull: true },
        knownHours: { type: DataTypes.DOUBLE, allowNull: false },
        requiredKnownHours: { type: DataTypes.DOUBLE, allowNull: false },
        darkHours: { type: DataTypes.DOUBLE, allowNull: false },
        longestDarkHours: { type: DataTypes.DOUBLE, allowNull: false },
        results: { type: DataTypes.JSON, allowNull: false },
        engineVersion: { type: DataTypes.INTEGER, allowNull: false },
        runMs: { type: DataTypes.INTEGER, allowNull: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "studies" },
    );
  }
}
