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
import type { Membership } from './Membership';

export type MemberCreditKind =
  'overpayment' | 'applied' | 'refund' | 'refund-reversed' | 'void-restore' | 'void-reverse' | 'negative-invoice';

/** One entry of a member's credit ledger (append-only); the balance is the sum. */
export class MemberCredit extends Model<InferAttributes<MemberCredit>, InferCreationAttributes<MemberCredit>> {
  declare id: CreationOptional<string>;
  declare coopId: ForeignKey<Coop['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare amountCents: string | number;
  declare kind: MemberCreditKind;
  declare paymentId: CreationOptional<number | null>;
  declare invoiceId: CreationOptional<number | null>;
  declare refundId: CreationOptional<number | null>;
  declare createdByUserId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    MemberCredit.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        amountCents: { type: DataTypes.BIGINT, allowNull: false },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        paymentId: { type: DataTypes.INTEGER, allowNull: true },
        invoiceId: { type: DataTypes.INTEGER, allowNull: true },
        refundId: { type: DataTypes.INTEGER, allowNull: true },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'MemberCredit', tableName: 'member_credits', underscored: true, updatedAt: false },
    );
  }
}
