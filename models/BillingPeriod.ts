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

/** A billing month's state; once closed, its draws, invoices and payments are locked. */
export class BillingPeriod extends Model<InferAttributes<BillingPeriod>, InferCreationAttributes<BillingPeriod>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare period: string;
  declare status: CreationOptional<'open' | 'closed'>;
  declare closedAt: CreationOptional<Date | null>;
  declare closedByUserId: CreationOptional<number | null>;
  /** The reconciliation totals as they stood at close. */
  declare summary: CreationOptional<unknown>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    BillingPeriod.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        period: { type: DataTypes.DATEONLY, allowNull: false },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        closedByUserId: { type: DataTypes.INTEGER, allowNull: true },
        summary: { type: DataTypes.JSONB, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'BillingPeriod', tableName: 'billing_periods', underscored: true },
    );
  }
}
