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

export type InvoiceLineKind = 'draw' | 'draw-reversal' | 'dues' | 'surcharge' | 'road-tax' | 'adjustment' | 'credit';

/** One line of an invoice: a draw (its locked amounts), dues, surcharge, road tax, an adjustment or credit applied. */
export class InvoiceLine extends Model<InferAttributes<InvoiceLine>, InferCreationAttributes<InvoiceLine>> {
  declare id: CreationOptional<string>;
  declare coopId: ForeignKey<Coop['id']>;
  declare invoiceId: ForeignKey<number>; // invoices.id (Invoice imports this model for its lines; no import back)
  declare sortKey: number;
  declare kind: InvoiceLineKind;
  declare description: string;
  declare occurredAt: CreationOptional<Date | null>;
  /** Litres, NUMERIC(14,3) as a string; negative on reversals. */
  declare quantityLiters: CreationOptional<string | null>;
  declare unitPriceCentsPerGallon: CreationOptional<string | null>;
  declare amountCents: string | number;
  declare drawId: CreationOptional<number | null>;
  declare adjustmentId: CreationOptional<number | null>;
  declare released: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    InvoiceLine.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        invoiceId: { type: DataTypes.INTEGER, allowNull: false },
        sortKey: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(16), allowNull: false },
        description: { type: DataTypes.STRING(240), allowNull: false },
        occurredAt: { type: DataTypes.DATE, allowNull: true },
        quantityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: true },
        unitPriceCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: true },
        amountCents: { type: DataTypes.BIGINT, allowNull: false },
        drawId: { type: DataTypes.INTEGER, allowNull: true },
        adjustmentId: { type: DataTypes.INTEGER, allowNull: true },
        released: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'InvoiceLine', tableName: 'invoice_lines', underscored: true, updatedAt: false },
    );
  }
}
