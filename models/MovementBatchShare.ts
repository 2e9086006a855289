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
import type { Coop } from './Coop';
import type { Draw } from './Draw';
import type { Tank } from './Tank';
import type { TankMovement } from './TankMovement';

/**
 * How much of each batch one ledger row moved, signed like the row (append-only). A draw's
 * shares sum exactly to its ledger row (deferred constraint trigger); `drawId` repeats the row's
 * draw so "who drew batch N" is one indexed read.
 */
export class MovementBatchShare extends Model<
  InferAttributes<MovementBatchShare>,
  InferCreationAttributes<MovementBatchShare>
> {
  declare id: CreationOptional<string>; // BIGSERIAL arrives as a string
  declare coopId: ForeignKey<Coop['id']>;
  declare movementId: ForeignKey<TankMovement['id']>;
  declare tankId: ForeignKey<Tank['id']>;
  declare drawId: ForeignKey<Draw['id']> | null;
  declare batchId: ForeignKey<Batch['id']> | null;
  declare quantityLiters: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    MovementBatchShare.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        movementId: { type: DataTypes.BIGINT, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        drawId: { type: DataTypes.INTEGER, allowNull: true },
        batchId: { type: DataTypes.INTEGER, allowNull: true },
        quantityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      {
        sequelize,
        modelName: 'MovementBatchShare',
        tableName: 'movement_batch_shares',
        underscored: true,
        updatedAt: false,
      },
    );
  }
}
