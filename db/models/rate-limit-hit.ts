import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** One counted request for a rate limit (see app/services/rate-limits.server.ts). */
export class RateLimitHit extends Model<InferAttributes<RateLimitHit>, InferCreationAttributes<RateLimitHit>> {
  declare id: CreationOptional<number>;
  declare action: string;
  declare subject: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RateLimitHit.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        action: { type: DataTypes.STRING(40), allowNull: false },
        subject: { type: DataTypes.STRING(300), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "rate_limit_hits", updatedAt: false },
    );
  }
}
