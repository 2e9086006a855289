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
import type { User } from './User';

export type PricePolicyKind = 'fixed' | 'cost-plus-amount' | 'cost-plus-percent';

/**
 * A co-op's member pricing policy from `effectiveFrom` on. Insert-only: a change is a new row,
 * so the history stays; the policy in force is the newest row with effectiveFrom ≤ now. Rates
 * are cents per US gallon NUMERIC(12,3) (strings; fractions of a cent allowed).
 */
export class PricePolicy extends Model<InferAttributes<PricePolicy>, InferCreationAttributes<PricePolicy>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare kind: PricePolicyKind;
  declare priceCentsPerGallon: string | null;
  declare marginCentsPerGallon: string | null;
  declare marginPct: string | null;
  declare surchargeCentsPerGallon: CreationOptional<string>;
  declare roadTaxCentsPerGallon: CreationOptional<string>;
  declare effectiveFrom: CreationOptional<Date>;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;
  declare createdBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    PricePolicy.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        priceCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: true },
        marginCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: true },
        marginPct: { type: DataTypes.DECIMAL(6, 2), allowNull: true },
        surchargeCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: false, defaultValue: '0' },
        roadTaxCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: false, defaultValue: '0' },
        effectiveFrom: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'PricePolicy', tableName: 'price_policies', underscored: true, updatedAt: false },
    );
  }
}
