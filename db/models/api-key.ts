import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

import { API_KEY_ROLES } from "../../shared/account-schemas";

export type ApiKeyRole = (typeof API_KEY_ROLES)[number];

/** An integrator's key: stored as a hash, acting with a role and limited to its scopes, revocable, optionally expiring. */
export class ApiKey extends Model<InferAttributes<ApiKey>, InferCreationAttributes<ApiKey>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare name: string;
  declare prefix: string;
  declare keyHash: string;
  declare role: ApiKeyRole;
  declare createdBy: number | null;
  declare lastUsedAt: Date | null;
  declare revokedAt: Date | null;
  /** JSON list of scopes; null for a key that acts with its role's scopes. */
  declare scopes: CreationOptional<string | null>;
  declare expiresAt: CreationOptional<Date | null>;
  declare rateLimitPerMinute: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ApiKey.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        prefix: { type: DataTypes.STRING(16), allowNull: false },
        keyHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        role: { type: DataTypes.ENUM(...API_KEY_ROLES), allowNull: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        lastUsedAt: { type: DataTypes.DATE, allowNull: true },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        scopes: { type: DataTypes.TEXT, allowNull: true },
        expiresAt: { type: DataTypes.DATE, allowNull: true },
        rateLimitPerMinute: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "api_keys", updatedAt: false },
    );
  }
}
