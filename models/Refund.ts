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
import type { Membership } from './Membership';
import type { Payment } from './Payment';

export type RefundStatus = 'pending' | 'succeeded' | 'failed';

/** Money given back from a payment's unmatched part or the member's credit; card refunds go through the provider. */
export class Refund extends Model<InferAttributes<Refund>, InferCreationAttributes<Refund>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare paymentId: ForeignKey<Payment['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare amountCents: string | number;
  declare fromUnallocatedCents: string | number;
  declare fromCreditCents: string | number;
  declare status: CreationOptional<RefundStatus>;
  declare idempotencyKey: CreationOptional<string | null>;
  declare stripeRefundId: CreationOptional<string | null>;
  declare reason: string;
  declare failureMessage: CreationOptional<string | null>;
  declare refundedOn: string;
  declare createdByUserId: CreationOptional<number | null>;
  declare completedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare payment?: NonAttribute<Payment>;

  static initModel(sequelize: Sequelize) {
    Refund.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        paymentId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        amountCents: { type: DataTypes.BIGINT, allowNull: false },
        fromUnallocatedCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        fromCreditCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'pending' },
        idempotencyKey: { type: DataTypes.STRING(80), allowNull: true },
        stripeRefundId: { type: DataTypes.STRING(80), allowNull: true },
        reason: { type: DataTypes.STRING(240), allowNull: false },
        failureMessage: { type: DataTypes.STRING(240), allowNull: true },
        refundedOn: { type: DataTypes.DATEONLY, allowNull: false },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        completedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Refund', tableName: 'refunds', underscored: true },
    );
  }
}
