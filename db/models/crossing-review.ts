import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { ApprovalSnapshot } from "../../lib/review/staleness";
import { REVIEW_DECISIONS, REVIEW_STATES, type ReviewDecision, type ReviewState } from "../../shared/review-schemas";

/** A crossing's review; no row means draft with no history. */
export class CrossingReview extends Model<InferAttributes<CrossingReview>, InferCreationAttributes<CrossingReview>> {
  declare crossingId: number;
  declare organisationId: number;
  declare state: CreationOptional<ReviewState>;
  declare decision: CreationOptional<ReviewDecision | null>;
  declare optionId: CreationOptional<number | null>;
  declare studyId: CreationOptional<number | null>;
  declare snapshot: CreationOptional<ApprovalSnapshot | null>;
  declare submittedBy: CreationOptional<number | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare submittedByName: CreationOptional<string | null>;
  declare approvedBy: CreationOptional<number | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare approvedByName: CreationOptional<string | null>;
  declare staleNotifiedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    CrossingReview.init(
      {
        crossingId: { type: DataTypes.INTEGER, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        state: { type: DataTypes.ENUM(...REVIEW_STATES), allowNull: false, defaultValue: "draft" },
        decision: { type: DataTypes.ENUM(...REVIEW_DECISIONS), allowNull: true },
        optionId: { type: DataTypes.INTEGER, allowNull: true },
        studyId: { type: DataTypes.INTEGER, allowNull: true },
        snapshot: { type: DataTypes.JSON, allowNull: true },
        submittedBy: { type: DataTypes.INTEGER, allowNull: true },
        submittedAt: { type: DataTypes.DATE, allowNull: true },
        submittedByName: { type: DataTypes.STRING(200), allowNull: true },
        approvedBy: { type: DataTypes.INTEGER, allowNull: true },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        approvedByName: { type: DataTypes.STRING(200), allowNull: true },
        staleNotifiedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "crossing_reviews" },
    );
  }
}
