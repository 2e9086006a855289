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
import type { Tank } from './Tank';

export type ReservationStatus = 'open' | 'drawn' | 'cancelled' | 'expired';

/**
 * A member's claim on fuel in a tank for a time window. While open its quantity is counted in
 * the tank's reserved_liters; drawing, cancelling or expiring it releases that quantity (in the
 * same transaction as the status change; see lib/tank/reservations).
 */
export class Reservation extends Model<InferAttributes<Reservation>, InferCreationAttributes<Reservation>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare tankId: ForeignKey<Tank['id']>;
  declare membershipId: ForeignKey<Membership['id']>;
  declare quantityLiters: string;
  declare windowStart: Date;
  declare windowEnd: Date;
  declare status: CreationOptional<ReservationStatus>;
  declare closedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare tank?: NonAttribute<Tank>;
  declare membership?: NonAttribute<Membership>;

  static initModel(sequelize: Sequelize) {
    Reservation.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        membershipId: { type: DataTypes.INTEGER, allowNull: false },
        quantityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        windowStart: { type: DataTypes.DATE, allowNull: false },
        windowEnd: { type: DataTypes.DATE, allowNull: false },
        status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'open' },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Reservation', tableName: 'reservations', underscored: true },
    );
  }
}
