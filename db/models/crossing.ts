import type { AviationRecord } from "../../shared/aviation-record-schemas";
import type { TemperatureNormals } from "../../shared/temperature-schemas";
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { CROSSING_KINDS, type CrossingKind } from "../../shared/circuit-schemas";
import type { HighestWire, LitPhase, SagKind } from "../../shared/crossing-details-schemas";
import type { IcaoMarkerColour, RuleSet } from "../../shared/marker-schemas";
import type { DiameterUnit } from "../../shared/units";

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
  // Span and marking details (shared/crossing-details-schemas): lengths in the span unit, heights from the support bases.
  declare supportHeightA: CreationOptional<number | null>;
  declare supportHeightB: CreationOptional<number | null>;
  declare attachmentHeightA: CreationOptional<number | null>;
  declare attachmentHeightB: CreationOptional<number | null>;
  declare sagKind: CreationOptional<SagKind | null>;
  declare sagValue: CreationOptional<number | null>;
  declare surfaceLevel: CreationOptional<number | null>;
  declare highestWire: CreationOptional<HighestWire | null>;
  declare wireSeparation: CreationOptional<number | null>;
  declare topWireCount: CreationOptional<number | null>;
  declare topWireSeparation: CreationOptional<number | null>;
  declare runwayEndDistance: CreationOptional<number | null>;
  declare runwayEndCriticalArea: CreationOptional<boolean>;
  declare ruleSet: CreationOptional<RuleSet>;
  declare markerDiameterValue: CreationOptional<number | null>;
  declare markerDiameterUnit: CreationOptional<DiameterUnit | null>;
  declare icaoColour: CreationOptional<IcaoMarkerColour>;
  declare litPhase: CreationOptional<LitPhase | null>;
  declare costCurrency: CreationOptional<string>;
  declare aviationRecord: CreationOptional<AviationRecord | null>;
  /** Monthly normal temperatures for cold-weather storage (shared/temperature-schemas.ts). */
  declare temperatureNormals: CreationOptional<TemperatureNormals | null>;
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
        supportHeightA: { type: DataTypes.DOUBLE, allowNull: true },
        supportHeightB: { type: DataTypes.DOUBLE, allowNull: true },
        attachmentHeightA: { type: DataTypes.DOUBLE, allowNull: true },
        attachmentHeightB: { type: DataTypes.DOUBLE, allowNull: true },
        sagKind: { type: DataTypes.ENUM("midspan-sag", "lowest-clearance"), allowNull: true },
        sagValue: { type: DataTypes.DOUBLE, allowNull: true },
        surfaceLevel: { type: DataTypes.DOUBLE, allowNull: true },
        highestWire: { type: DataTypes.ENUM("shield", "phase"), allowNull: true },
        wireSeparation: { type: DataTypes.DOUBLE, allowNull: true },
        topWireCount: { type: DataTypes.INTEGER, allowNull: true },
        topWireSeparation: { type: DataTypes.DOUBLE, allowNull: true },
        runwayEndDistance: { type: DataTypes.DOUBLE, allowNull: true },
        runwayEndCriticalArea: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ruleSet: { type: DataTypes.ENUM("faa", "icao"), allowNull: false, defaultValue: "faa" },
        markerDiameterValue: { type: DataTypes.DOUBLE, allowNull: true },
        markerDiameterUnit: { type: DataTypes.ENUM("in", "cm"), allowNull: true },
        icaoColour: { type: DataTypes.ENUM("red", "orange"), allowNull: false, defaultValue: "red" },
        litPhase: { type: DataTypes.ENUM("A", "B", "C"), allowNull: true },
        costCurrency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: "USD" },
        aviationRecord: { type: DataTypes.JSON, allowNull: true },
        temperatureNormals: { type: DataTypes.JSON, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "crossings" },
    );
  }
}
