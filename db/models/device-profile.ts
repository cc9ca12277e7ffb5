import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Device } from "../../shared/study-schemas";

/** A lit-marker or light model of the organisation (see docs/computation.md). */
export class DeviceProfile extends Model<InferAttributes<DeviceProfile>, InferCreationAttributes<DeviceProfile>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare name: string;
  declare note: string | null;
  declare spec: Device;
  declare retired: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    DeviceProfile.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: true },
        spec: { type: DataTypes.JSON, allowNull: false },
        retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "device_profiles" },
    );
  }
}
