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
import type { Tank } from './Tank';

/**
 * A tank's fuel from one batch (NULL batch: unattributed, e.g. an opening balance), oldest first
 * by id. Written only by lib/tank/lineage (through lib/tank/ledger recordMovement); a deferred
 * constraint trigger checks at commit that a tank's layers sum to its on-hand quantity.
 */
export class TankLayer extends Model<InferAttributes<TankLayer>, InferCreationAttributes<TankLayer>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare tankId: ForeignKey<Tank['id']>;
  declare batchId: ForeignKey<Batch['id']> | null;
  declare quantityLiters: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    TankLayer.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        batchId: { type: DataTypes.INTEGER, allowNull: true },
        quantityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'TankLayer', tableName: 'tank_layers', underscored: true },
    );
  }
}
