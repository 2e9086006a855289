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
import type { User } from './User';

export type ChemicalKind = 'methanol' | 'KOH' | 'NaOH' | 'other';

/** A purchase of a chemical. Methanol in litres, catalysts in grams; NUMERIC/BIGINT arrive as strings. */
export class ChemicalLot extends Model<InferAttributes<ChemicalLot>, InferCreationAttributes<ChemicalLot>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare kind: ChemicalKind;
  declare description: string | null;
  declare supplier: string;
  declare receivedOn: string;
  declare quantityUnit: 'L' | 'g';
  declare quantity: string;
  declare remainingQuantity: string;
  declare totalCostCents: string;
  declare purityPct: string | null;
  declare sdsFileKey: CreationOptional<string | null>;
  declare sdsFileName: CreationOptional<string | null>;
  declare notes: string | null;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ChemicalLot.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        kind: { type: DataTypes.STRING(10), allowNull: false },
        description: { type: DataTypes.STRING(120), allowNull: true },
        supplier: { type: DataTypes.STRING(120), allowNull: false },
        receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
        quantityUnit: { type: DataTypes.STRING(2), allowNull: false },
        quantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        remainingQuantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        totalCostCents: { type: DataTypes.BIGINT, allowNull: false },
        purityPct: { type: DataTypes.DECIMAL(5, 2), allowNull: true },
        sdsFileKey: { type: DataTypes.STRING(80), allowNull: true },
        sdsFileName: { type: DataTypes.STRING(200), allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'ChemicalLot', tableName: 'chemical_lots', underscored: true },
    );
  }
}
