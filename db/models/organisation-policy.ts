import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Policy } from "../../shared/study-schemas";

/** The organisation's verdict thresholds; absent row = the defaults of docs/computation.md. */
export class OrganisationPolicy extends Model<InferAttributes<OrganisationPolicy>, InferCreationAttributes<OrganisationPolicy>> {
  declare organisationId: number;
  declare policy: Policy;
  declare updatedBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    OrganisationPolicy.init(
      {
        organisationId: { type: DataTypes.INTEGER, primaryKey: true },
        policy: { type: DataTypes.JSON, allowNull: false },
        updatedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "organisation_policies" },
    );
  }
}
