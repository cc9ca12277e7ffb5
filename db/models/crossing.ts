import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { CROSSING_KINDS, type CrossingKind } from "../../shared/circuit-schemas";

export class Crossing extends Model<InferAttributes<Crossing>, InferCreationAttributes<Crossing>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare circuitId: number;
  declare name: string;
  declare lat: number;
  declare lon: number;
  declare spanLengthValue: number;
  declare spanLengthUnit: "m" | "ft";
  declare kind: CrossingKind;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Crossing.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        circuitId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        lat: { type: DataTypes.DOUBLE, allowNull: false },
        lon: { type: DataTypes.DOUBLE, allowNull: false },
        spanLengthValue: { type: DataTypes.DOUBLE, allowNull: false },
        spanLengthUnit: { type: DataTypes.ENUM("m", "ft"), allowNull: false },
        kind: { type: DataTypes.ENUM(...CROSSING_KINDS), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "crossings" },
    );
  }
}
