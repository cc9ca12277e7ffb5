import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class Circuit extends Model<InferAttributes<Circuit>, InferCreationAttributes<Circuit>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare name: string;
  declare voltageKv: number;
  declare phases: number;
  declare normalRatingA: number | null;
  declare notes: string | null;
  /** IANA time zone of the circuit's times; null = the organisation's. */
  declare timeZone: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Circuit.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        voltageKv: { type: DataTypes.DOUBLE, allowNull: false },
        phases: { type: DataTypes.INTEGER, allowNull: false },
        normalRatingA: { type: DataTypes.DOUBLE, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: true },
        timeZone: { type: DataTypes.STRING(64), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "circuits" },
    );
  }
}
