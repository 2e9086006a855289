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
import type { Tank } from './Tank';
import type { TankMovement } from './TankMovement';
import type { User } from './User';

/**
 * A measured tank volume (dipstick or gauge) beside the book figure at that moment. A
 * difference produced the 'dip-adjustment' ledger row `movementId`; a match has none (CHECK).
 */
export class DipReading extends Model<InferAttributes<DipReading>, InferCreationAttributes<DipReading>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare tankId: ForeignKey<Tank['id']>;
  declare measuredLiters: string;
  declare bookLiters: string;
  declare movementId: ForeignKey<TankMovement['id']> | null;
  declare reason: string | null;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare measuredAt: CreationOptional<Date>;
  declare createdAt: CreationOptional<Date>;
  declare tank?: NonAttribute<Tank>;

  static initModel(sequelize: Sequelize) {
    DipReading.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        movementId: { type: DataTypes.BIGINT, allowNull: true },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        measuredLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        bookLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        reason: { type: DataTypes.TEXT, allowNull: true },
        measuredAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'DipReading', tableName: 'dip_readings', underscored: true, updatedAt: false },
    );
  }
}
