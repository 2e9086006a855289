import {
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Batch } from './Batch';
import type { Coop } from './Coop';
import type { OilLot } from './OilLot';

/** Litres of one oil lot that went into one batch. */
export class BatchOilLot extends Model<InferAttributes<BatchOilLot>, InferCreationAttributes<BatchOilLot>> {
  declare coopId: ForeignKey<Coop['id']>;
  declare batchId: ForeignKey<Batch['id']>;
  declare oilLotId: ForeignKey<OilLot['id']>;
  declare liters: string;

  static initModel(sequelize: Sequelize) {
    BatchOilLot.init(
      {
        batchId: { type: DataTypes.INTEGER, primaryKey: true },
        oilLotId: { type: DataTypes.INTEGER, primaryKey: true },
        liters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
      },
      { sequelize, modelName: 'BatchOilLot', tableName: 'batch_oil_lots', underscored: true, timestamps: false },
    );
  }
}
