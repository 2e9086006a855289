import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { Coop } from './Coop';
import type { InvoiceLine } from './InvoiceLine';
import type { Membership } from './Membership';

export type InvoiceKind = 'invoice' | 'credit-note';
export type InvoiceStatus = 'draft' | 'issued' | 'partly-paid' | 'paid' | 'void';
export type InvoiceEmailStatus = 'not-sent' | 'queued' | 'sending' | 'sent' | 'failed';

/**
 * A member's invoice for one month (or a credit note voiding one). Drafts have no number; the
 * number comes from the co-op's counter when it is issued. BIGINT money arrives as strings.
 */
export class Invoice extends Model<InferAttributes<Invoice>, InferCreationAttributes<Invoice>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  /** First day of the month billed, 'YYYY-MM-01'. */
  declare period: string;
  declare kind: CreationOptional<InvoiceKind>;
  declare number: CreationOptional<number | null>;
  declare status: CreationOptional<InvoiceStatus>;
  declare creditNoteForId: CreationOptional<number | null>;
  declare totalCents: CreationOptional<string>;
  declare paidCents: CreationOptional<string>;
  declare billingRunId: CreationOptional<number | null>;
  declare issuedAt: CreationOptional<Date | null>;
  declare dueOn: CreationOptional<string | null>;
  declare voidedAt: CreationOptional<Date | null>;
  declare voidReason: CreationOptional<string | null>;
  declare emailStatus: CreationOptional<InvoiceEmailStatus>;
  declare emailAttempts: CreationOptional<number>;
  declare emailedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare membership?: NonAttribute<Membership>;
  declare coop?: NonAttribute<Coop>;
  declare lines?: NonAttribute<InvoiceLine[]>;
  /** The credit note that voids this invoice, if any. */
  declare creditNote?: NonAttribute<Invoice | null>;
  /** The invoice a credit note voids. */
  declare original?: NonAttribute<Invoice | null>;

  static initModel(sequelize: Sequelize) {
    Invoice.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        period: { type: DataTypes.DATEONLY, allowNull: false },
        kind: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'invoice' },
        number: { type: DataTypes.INTEGER, allowNull: true },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
        creditNoteForId: { type: DataTypes.INTEGER, allowNull: true },
        totalCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        paidCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        billingRunId: { type: DataTypes.INTEGER, allowNull: true },
        issuedAt: { type: DataTypes.DATE, allowNull: true },
        dueOn: { type: DataTypes.DATEONLY, allowNull: true },
        voidedAt: { type: DataTypes.DATE, allowNull: true },
        voidReason: { type: DataTypes.STRING(240), allowNull: true },
        emailStatus: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'not-sent' },
        emailAttempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        emailedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Invoice', tableName: 'invoices', underscored: true },
    );
  }
}
