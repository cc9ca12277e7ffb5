import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** An endpoint of an organisation that is told about events (app/services/webhooks.server.ts). */
export class Webhook extends Model<InferAttributes<Webhook>, InferCreationAttributes<Webhook>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare url: string;
  declare description: CreationOptional<string>;
  declare events: string[];
  declare secret: string;
  declare active: CreationOptional<boolean>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Webhook.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        url: { type: DataTypes.STRING(2000), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false, defaultValue: "" },
        events: { type: DataTypes.JSON, allowNull: false },
        secret: { type: DataTypes.STRING(100), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE(3),
        updatedAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: "webhooks" },
    );
  }
}

export const WEBHOOK_DELIVERY_STATES = ["pending", "delivered", "failed"] as const;

/** One event for one endpoint: the body as sent, and the outcome of the latest attempt. */
export class WebhookDelivery extends Model<InferAttributes<WebhookDelivery>, InferCreationAttributes<WebhookDelivery>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare webhookId: number;
  declare event: string;
  declare payload: string;
  declare state: CreationOptional<(typeof WEBHOOK_DELIVERY_STATES)[number]>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date | null;
  declare lastStatus: CreationOptional<number | null>;
  declare lastResponse: CreationOptional<string | null>;
  declare lastError: CreationOptional<string | null>;
  declare lastAttemptAt: CreationOptional<Date | null>;
  declare deliveredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    WebhookDelivery.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        webhookId: { type: DataTypes.INTEGER, allowNull: false },
        event: { type: DataTypes.STRING(64), allowNull: false },
        payload: { type: DataTypes.TEXT("medium"), allowNull: false },
        state: { type: DataTypes.ENUM(...WEBHOOK_DELIVERY_STATES), allowNull: false, defaultValue: "pending" },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE(3), allowNull: true },
        lastStatus: { type: DataTypes.INTEGER, allowNull: true },
        lastResponse: { type: DataTypes.TEXT, allowNull: true },
        lastError: { type: DataTypes.STRING(500), allowNull: true },
        lastAttemptAt: { type: DataTypes.DATE(3), allowNull: true },
        deliveredAt: { type: DataTypes.DATE(3), allowNull: true },
        createdAt: DataTypes.DATE(3),
        updatedAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: "webhook_deliveries" },
    );
  }
}
