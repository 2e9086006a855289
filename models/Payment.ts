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
import type { Invoice } from './Invoice';
import type { Membership } from './Membership';

export type PaymentMethod = 'card' | 'cash' | 'cheque';

/**
 * Money received from a member. amount = applied (to its invoice) + credited (held as member
 * credit) + unallocated (not matched yet) + refunded. BIGINT money arrives as strings.
 */
export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare invoiceId: CreationOptional<number | null>;
  declare method: PaymentMethod;
  declare amountCents: string | number;
  declare appliedCents: CreationOptional<string | number>;
  declare creditedCents: CreationOptional<string | number>;
  declare unallocatedCents: CreationOptional<string | number>;
  declare refundedCents: CreationOptional<string | number>;
  declare receivedOn: string;
  declare period: string;
  declare reference: CreationOptional<string | null>;
  declare note: CreationOptional<string | null>;
  declare stripeChargeId: CreationOptional<string | null>;
  declare paymentAttemptId: CreationOptional<number | null>;
  declare recordedByUserId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare invoice?: NonAttribute<Invoice | null>;
  declare membership?: NonAttribute<Membership>;

  static initModel(sequelize: Sequelize) {
    Payment.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        invoiceId: { type: DataTypes.INTEGER, allowNull: true },
        method: { type: DataTypes.STRING(10), allowNull: false },
        amountCents: { type: DataTypes.BIGINT, allowNull: false },
        appliedCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        creditedCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        unallocatedCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        refundedCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
        period: { type: DataTypes.DATEONLY, allowNull: false },
        reference: { type: DataTypes.STRING(60), allowNull: true },
        note: { type: DataTypes.STRING(240), allowNull: true },
        stripeChargeId: { type: DataTypes.STRING(80), allowNull: true },
        paymentAttemptId: { type: DataTypes.INTEGER, allowNull: true },
        recordedByUserId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Payment', tableName: 'payments', underscored: true },
    );
  }
}
