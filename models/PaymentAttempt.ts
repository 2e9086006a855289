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
import type { Invoice } from './Invoice';
import type { Membership } from './Membership';

export type PaymentAttemptStatus = 'pending' | 'succeeded' | 'failed';

/**
 * One try at charging a card for an invoice. Its idempotency key is stored before the provider
 * is called, so retries of the same attempt can never charge twice.
 */
export class PaymentAttempt extends Model<InferAttributes<PaymentAttempt>, InferCreationAttributes<PaymentAttempt>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare invoiceId: ForeignKey<Invoice['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare amountCents: string | number;
  declare currency: string;
  /** A payment-provider test token chosen in development (never card data). */
  declare cardToken: string;
  declare idempotencyKey: string;
  declare status: CreationOptional<PaymentAttemptStatus>;
  declare stripeChargeId: CreationOptional<string | null>;
  declare failureCode: CreationOptional<string | null>;
  declare failureMessage: CreationOptional<string | null>;
  declare leaseUntil: CreationOptional<Date | null>;
  declare createdByUserId: CreationOptional<number | null>;
  declare completedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PaymentAttempt.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        invoiceId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        amountCents: { type: DataTypes.BIGINT, allowNull: false },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        cardToken: { type: DataTypes.STRING(60), allowNull: false },
        idempotencyKey: { type: DataTypes.STRING(80), allowNull: false, unique: true },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'pending' },
        stripeChargeId: { type: DataTypes.STRING(80), allowNull: true },
        failureCode: { type: DataTypes.STRING(60), allowNull: true },
        failureMessage: { type: DataTypes.STRING(240), allowNull: true },
        leaseUntil: { type: DataTypes.DATE, allowNull: true },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        completedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'PaymentAttempt', tableName: 'payment_attempts', underscored: true },
    );
  }
}
