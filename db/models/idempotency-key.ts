import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** The recorded answer to a POST sent with an Idempotency-Key (kept 24 hours). */
export class IdempotencyKey extends Model<InferAttributes<IdempotencyKey>, InferCreationAttributes<IdempotencyKey>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare key: string;
  declare fingerprint: string;
  declare responseStatus: number;
  declare responseBody: string;
  declare responseLocation: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    IdempotencyKey.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        key: { type: DataTypes.STRING(255), allowNull: false },
        fingerprint: { type: DataTypes.STRING(64), allowNull: false },
        responseStatus: { type: DataTypes.INTEGER, allowNull: false },
        responseBody: { type: DataTypes.TEXT("medium"), allowNull: false },
        responseLocation: { type: DataTypes.STRING(500), allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "idempotency_keys", updatedAt: false },
    );
  }
}
