import {
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Coop } from './Coop';
import type { BatchStatus } from './Batch';

/**
 * How many batches a co-op has in each status. Kept by triggers on `batches` in the same
 * transaction as every batch change (migration 20261202000000), so the batch list's total is a
 * primary-key read. Never written by the application.
 */
export class BatchStatusCount extends Model<
  InferAttributes<BatchStatusCount>,
  InferCreationAttributes<BatchStatusCount>
> {
  declare coopId: ForeignKey<Coop['id']>;
  declare status: BatchStatus;
  declare n: number;

  static initModel(sequelize: Sequelize) {
    BatchStatusCount.init(
      {
        coopId: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
        status: { type: DataTypes.STRING(20), allowNull: false, primaryKey: true },
        n: { type: DataTypes.INTEGER, allowNull: false },
      },
      {
        sequelize,
        modelName: 'BatchStatusCount',
        tableName: 'batch_status_counts',
        underscored: true,
        timestamps: false,
      },
    );
  }
}
