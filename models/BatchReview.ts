import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Batch } from './Batch';
import type { BatchFile } from './BatchFile';
import type { Coop } from './Coop';
import type { User } from './User';

export type BatchReviewCause = 'lab-result' | 'flag';
export type BatchReviewOutcome = 'cleared' | 'retreated' | 'disposed';

/**
 * A released batch under review (a recall): opened by a failing late lab result or a flag, it
 * holds the batch's remaining fuel; closed with an outcome. One open review per batch (partial
 * unique index); CHECKs require a disposal's method and receipt and a re-treatment's batch.
 */
export class BatchReview extends Model<InferAttributes<BatchReview>, InferCreationAttributes<BatchReview>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare batchId: ForeignKey<Batch['id']>;
  declare status: CreationOptional<'open' | 'closed'>;
  declare cause: BatchReviewCause;
  declare finding: string;
  declare heldLiters: CreationOptional<string>;
  declare openedByUserId: ForeignKey<User['id']> | null;
  declare openedAt: CreationOptional<Date>;
  declare outcome: CreationOptional<BatchReviewOutcome | null>;
  declare outcomeNotes: CreationOptional<string | null>;
  declare disposalMethod: CreationOptional<string | null>;
  declare receiptFileId: CreationOptional<ForeignKey<BatchFile['id']> | null>;
  declare retreatBatchId: CreationOptional<number | null>;
  declare closedByUserId: CreationOptional<ForeignKey<User['id']> | null>;
  declare closedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    BatchReview.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        batchId: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.STRING(6), allowNull: false, defaultValue: 'open' },
        cause: { type: DataTypes.STRING(10), allowNull: false },
        finding: { type: DataTypes.TEXT, allowNull: false },
        heldLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false, defaultValue: '0' },
        openedByUserId: { type: DataTypes.INTEGER, allowNull: true },
        openedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        outcome: { type: DataTypes.STRING(10), allowNull: true },
        outcomeNotes: { type: DataTypes.TEXT, allowNull: true },
        disposalMethod: { type: DataTypes.TEXT, allowNull: true },
        receiptFileId: { type: DataTypes.INTEGER, allowNull: true },
        retreatBatchId: { type: DataTypes.INTEGER, allowNull: true },
        closedByUserId: { type: DataTypes.INTEGER, allowNull: true },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'BatchReview', tableName: 'batch_reviews', underscored: true },
    );
  }
}
