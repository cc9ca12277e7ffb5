import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export const JOB_STATES = ["queued", "running", "done", "failed"] as const;
export type JobState = (typeof JOB_STATES)[number];

/** A piece of long work, claimed by one app instance at a time (see app/services/jobs.server.ts). */
export class Job extends Model<InferAttributes<Job>, InferCreationAttributes<Job>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare kind: string;
  declare state: CreationOptional<JobState>;
  declare progress: CreationOptional<number>;
  declare input: Record<string, unknown>;
  declare resultUrl: CreationOptional<string | null>;
  declare result: CreationOptional<Record<string, unknown> | null>;
  declare error: CreationOptional<{ status: number; title: string; detail: string; errors?: { path: string; message: string }[] } | null>;
  declare attempts: CreationOptional<number>;
  declare claimedBy: CreationOptional<string | null>;
  declare heartbeatAt: CreationOptional<Date | null>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare startedAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Job.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(64), allowNull: false },
        state: { type: DataTypes.ENUM(...JOB_STATES), allowNull: false, defaultValue: "queued" },
        progress: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        input: { type: DataTypes.JSON, allowNull: false },
        resultUrl: { type: DataTypes.STRING(255), allowNull: true },
        result: { type: DataTypes.JSON, allowNull: true },
        error: { type: DataTypes.JSON, allowNull: true },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        claimedBy: { type: DataTypes.STRING(100), allowNull: true },
        heartbeatAt: { type: DataTypes.DATE(3), allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE(3),
        startedAt: { type: DataTypes.DATE(3), allowNull: true },
        finishedAt: { type: DataTypes.DATE(3), allowNull: true },
        updatedAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: "jobs" },
    );
  }
}
