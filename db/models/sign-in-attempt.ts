import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<number>;
  declare email: string;
  /** Null when the client address is unknown (then no per-address limit applies). */
  declare ip: string | null;
  declare success: boolean;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SignInAttempt.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: DataTypes.STRING(254), allowNull: false },
        ip: { type: DataTypes.STRING(64), allowNull: true },
        success: { type: DataTypes.BOOLEAN, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "sign_in_attempts", updatedAt: false },
    );
  }
}
