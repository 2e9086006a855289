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
import type { DeclaredUse } from './vocabulary';
import type { Coop } from './Coop';
import type { Membership } from './Membership';
import type { PricePolicy } from './PricePolicy';
import type { Reservation } from './Reservation';
import type { Tank } from './Tank';
import type { User } from './User';

/**
 * Fuel drawn by a member, with the price in force locked on the row. Never edited (a trigger
 * refuses changes to the locked columns): a correction is a new row with reversesDrawId set,
 * negative quantity and amounts and a reason. Litres are NUMERIC strings, cents BIGINT strings;
 * totalCents = fuelCents + surchargeCents + taxCents (CHECK).
 */
export class Draw extends Model<InferAttributes<Draw>, InferCreationAttributes<Draw>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare tankId: ForeignKey<Tank['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare reservationId: ForeignKey<Reservation['id']> | null;
  declare quantityLiters: string;
  declare meterBefore: string | null;
  declare meterAfter: string | null;
  declare declaredUse: DeclaredUse;
  declare vehicle: string | null;
  declare pricePolicyId: ForeignKey<PricePolicy['id']> | null;
  declare unitPriceCentsPerGallon: string;
  declare surchargeCentsPerGallon: CreationOptional<string>;
  declare roadTaxCentsPerGallon: CreationOptional<string>;
  declare fuelCents: string;
  declare surchargeCents: CreationOptional<string>;
  declare taxCents: CreationOptional<string>;
  declare totalCents: string;
  declare costValueCents: CreationOptional<string>;
  declare reversesDrawId: ForeignKey<Draw['id']> | null;
  declare reason: string | null;
  declare recordedByUserId: ForeignKey<User['id']> | null;
  declare occurredAt: CreationOptional<Date>;
  declare createdAt: CreationOptional<Date>;
  declare tank?: NonAttribute<Tank>;
  declare membership?: NonAttribute<Membership>;

  static initModel(sequelize: Sequelize) {
    Draw.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        reservationId: { type: DataTypes.INTEGER, allowNull: true },
        pricePolicyId: { type: DataTypes.INTEGER, allowNull: true },
        reversesDrawId: { type: DataTypes.INTEGER, allowNull: true },
        recordedByUserId: { type: DataTypes.INTEGER, allowNull: true },
        quantityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        meterBefore: { type: DataTypes.DECIMAL(14, 3), allowNull: true },
        meterAfter: { type: DataTypes.DECIMAL(14, 3), allowNull: true },
        declaredUse: { type: DataTypes.STRING(20), allowNull: false },
        vehicle: { type: DataTypes.STRING(120), allowNull: true },
        unitPriceCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: false },
        surchargeCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: false, defaultValue: '0' },
        roadTaxCentsPerGallon: { type: DataTypes.DECIMAL(12, 3), allowNull: false, defaultValue: '0' },
        fuelCents: { type: DataTypes.BIGINT, allowNull: false },
        surchargeCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: '0' },
        taxCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: '0' },
        totalCents: { type: DataTypes.BIGINT, allowNull: false },
        costValueCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: '0' },
        reason: { type: DataTypes.TEXT, allowNull: true },
        occurredAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Draw', tableName: 'draws', underscored: true, updatedAt: false },
    );
  }
}
