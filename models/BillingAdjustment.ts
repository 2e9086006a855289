import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Coop } from './Coop';
import type { InvoiceLine } from './InvoiceLine';
import type { Membership } from './Membership';

/** A charge (positive) or credit (negative) for a member, billed on their first invoice of `period` or later. */
export class BillingAdjustment extends Model<
  InferAttributes<BillingAdjustment>,
  InferCreationAttributes<BillingAdjustment>
> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare amountCents: string | number;
  declare description: string;
  declare period: string;
  declare createdByUserId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare membership?: NonAttribute<Membership>;
  /** Its line on an issued invoice, when it has been billed (at most one line is not released). */
  declare billedLine?: NonAttribute<InvoiceLine | null>;

  static initModel(sequelize: Sequelize) {
    BillingAdjustment.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        amountCents: { type: DataTypes.BIGINT, allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false },
        period: { type: DataTypes.DATEONLY, allowNull: false },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      {
        sequelize,
        modelName: 'BillingAdjustment',
        tableName: 'billing_adjustments',
        underscored: true,
        updatedAt: false,
      },
    );
  }
}
