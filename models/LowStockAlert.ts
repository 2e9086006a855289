import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Coop } from './Coop';

export type LowStockChemical = 'methanol' | 'KOH' | 'NaOH';

/**
 * Whether a co-op's stock of one chemical is below what the next planned batch needs, so the
 * low-stock e-mail goes once per crossing (ok → low), not on every change.
 */
export class LowStockAlert extends Model<InferAttributes<LowStockAlert>, InferCreationAttributes<LowStockAlert>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare chemical: LowStockChemical;
  declare state: CreationOptional<'low' | 'ok'>;
  declare changedAt: CreationOptional<Date>;
  declare lastSentAt: Date | null;

  static initModel(sequelize: Sequelize) {
    LowStockAlert.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        chemical: { type: DataTypes.STRING(10), allowNull: false },
        state: { type: DataTypes.STRING(3), allowNull: false, defaultValue: 'ok' },
        changedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        lastSentAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, modelName: 'LowStockAlert', tableName: 'low_stock_alerts', underscored: true, timestamps: false },
    );
  }
}
