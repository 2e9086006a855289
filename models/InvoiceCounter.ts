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

/**
 * The last invoice or credit-note number a co-op gave out. Locked FOR UPDATE while a month is
 * issued, so numbers are consecutive and never reused.
 */
export class InvoiceCounter extends Model<InferAttributes<InvoiceCounter>, InferCreationAttributes<InvoiceCounter>> {
  declare coopId: ForeignKey<Coop['id']>;
  declare lastNumber: CreationOptional<number>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    InvoiceCounter.init(
      {
        coopId: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
        lastNumber: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'InvoiceCounter', tableName: 'invoice_counters', underscored: true, createdAt: false },
    );
  }
}
