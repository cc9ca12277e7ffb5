import type { RecordedTemperatures } from "../../shared/temperature-schemas";
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** Metadata and quality report of one uploaded current history; samples live in LoadProfileSeries. */
export class LoadProfile extends Model<InferAttributes<LoadProfile>, InferCreationAttributes<LoadProfile>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare circuitId: number;
  declare name: string;
  /** Mapped phases, e.g. "A" or "ABC". */
  declare phases: string;
  declare startAt: Date;
  declare endAt: Date;
  declare samples: number;
  declare sourceFile: string | null;
  declare mapping: Record<string, unknown>;
  declare quality: Record<string, unknown>;
  declare createdBy: number | null;
  /** Bumped each time the data is appended to or replaced. */
  declare dataVersion: CreationOptional<number>;
  /** SHA-256 of the stored sample BLOBs (null for profiles stored before it was kept). */
  declare fingerprint: string | null;
  /** Monthly means of the upload's temperature column (lib/ingest/temperatures.ts), or null. */
  declare temperature: CreationOptional<RecordedTemperatures | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    LoadProfile.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        circuitId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        phases: { type: DataTypes.STRING(8), allowNull: false },
        startAt: { type: DataTypes.DATE(3), allowNull: false },
        endAt: { type: DataTypes.DATE(3), allowNull: false },
        samples: { type: DataTypes.INTEGER, allowNull: false },
        sourceFile: { type: DataTypes.STRING(255), allowNull: true },
        mapping: { type: DataTypes.JSON, allowNull: false },
        quality: { type: DataTypes.JSON, allowNull: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        dataVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        fingerprint: { type: DataTypes.STRING(64), allowNull: true },
        temperature: { type: DataTypes.JSON, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "load_profiles" },
    );
  }
}

export class LoadProfileSeries extends Model<InferAttributes<LoadProfileSeries>, InferCreationAttributes<LoadProfileSeries>> {
  declare profileId: number;
  declare times: Buffer;
  declare phaseA: Buffer | null;
  declare phaseB: Buffer | null;
  declare phaseC: Buffer | null;

  static initModel(sequelize: Sequelize) {
    LoadProfileSeries.init(
      {
        profileId: { type: DataTypes.INTEGER, primaryKey: true },
        times: { type: DataTypes.BLOB("long"), allowNull: false },
        phaseA: { type: DataTypes.BLOB("long"), allowNull: true },
        phaseB: { type: DataTypes.BLOB("long"), allowNull: true },
        phaseC: { type: DataTypes.BLOB("long"), allowNull: true },
      },
      { sequelize, tableName: "load_profile_series", timestamps: false },
    );
  }
}

/** The samples of an earlier data version of a profile, kept because a study ran on them. */
export class LoadProfileVersion extends Model<InferAttributes<LoadProfileVersion>, InferCreationAttributes<LoadProfileVersion>> {
  declare profileId: number;
  declare version: number;
  declare times: Buffer;
  declare phaseA: Buffer | null;
  declare phaseB: Buffer | null;
  declare phaseC: Buffer | null;
  declare fingerprint: string | null;
  declare samples: number;
  declare startAt: Date;
  declare endAt: Date;
  declare supersededBy: "appended" | "replaced";
  declare supersededAt: Date;

  static initModel(sequelize: Sequelize) {
    LoadProfileVersion.init(
      {
        profileId: { type: DataTypes.INTEGER, primaryKey: true },
        version: { type: DataTypes.INTEGER, primaryKey: true },
        times: { type: DataTypes.BLOB("long"), allowNull: false },
        phaseA: { type: DataTypes.BLOB("long"), allowNull: true },
        phaseB: { type: DataTypes.BLOB("long"), allowNull: true },
        phaseC: { type: DataTypes.BLOB("long"), allowNull: true },
        fingerprint: { type: DataTypes.STRING(64), allowNull: true },
        samples: { type: DataTypes.INTEGER, allowNull: false },
        startAt: { type: DataTypes.DATE(3), allowNull: false },
        endAt: { type: DataTypes.DATE(3), allowNull: false },
        supersededBy: { type: DataTypes.ENUM("appended", "replaced"), allowNull: false },
        supersededAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: "load_profile_versions", timestamps: false },
    );
  }
}
