import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { REVIEW_DECISIONS, REVIEW_STATES, type ReviewDecision, type ReviewState } from "../../shared/review-schemas";

/** One move of a crossing's review (or the moment its approval went stale); never edited. */
export class ReviewEvent extends Model<InferAttributes<ReviewEvent>, InferCreationAttributes<ReviewEvent>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare crossingId: number;
  declare action: "submit" | "approve" | "return" | "reopen" | "stale";
  declare fromState: ReviewState;
  declare toState: ReviewState;
  declare decision: ReviewDecision | null;
  declare optionId: number | null;
  declare comment: string;
  declare userId: number | null;
  declare actorName: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ReviewEvent.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER, allowNull: false },
        crossingId: { type: DataTypes.INTEGER, allowNull: false },
        action: { type: DataTypes.ENUM("submit", "approve", "return", "reopen", "stale"), allowNull: false },
        fromState: { type: DataTypes.ENUM(...REVIEW_STATES), allowNull: false },
        toState: { type: DataTypes.ENUM(...REVIEW_STATES), allowNull: false },
        decision: { type: DataTypes.ENUM(...REVIEW_DECISIONS), allowNull: true },
        optionId: { type: DataTypes.INTEGER, allowNull: true },
        comment: { type: DataTypes.TEXT, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        actorName: { type: DataTypes.STRING(200), allowNull: false },
        createdAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: "review_events", updatedAt: false },
    );
  }
}
