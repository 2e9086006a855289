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
import type { Draw } from './Draw';
import type { Tank } from './Tank';
import type { User } from './User';

export type TankMovementKind =
  | 'release'
  | 'draw'
  | 'draw-reversal'
  | 'dip-adjustment'
  | 'transfer-in'
  | 'transfer-out'
  | 'opening'
  | 'disposal'
  | 'retreat';

/**
 * One row of the append-only tank ledger (UPDATE is refused by a trigger). Written only by
 * lib/tank/ledger recordMovement; this model is for reading. Quantity is signed litres
 * (positive in), value signed cents; the running totals after the row are kept beside it.
 */
export class TankMovement extends Model<InferAttributes<TankMovement>, InferCreationAttributes<TankMovement>> {
  declare id: CreationOptional<string>; // BIGSERIAL arrives as a string
  declare coopId: ForeignKey<Coop['id']>;
  declare tankId: ForeignKey<Tank['id']>;
  declare kind: TankMovementKind;
  declare quantityLiters: string;
  declare valueCents: string;
  declare onHandAfterLiters: string;
  declare valueAfterCents: string;
  declare batchId: number | null;
  declare drawId: ForeignKey<Draw['id']> | null;
  declare transferTankId: number | null;
  declare reason: string | null;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare occurredAt: CreationOptional<Date>;
  declare createdAt: CreationOptional<Date>;
  declare tank?: NonAttribute<Tank>;
  declare createdBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    TankMovement.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        drawId: { type: DataTypes.INTEGER, allowNull: true },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        quantityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        valueCents: { type: DataTypes.BIGINT, allowNull: false },
        onHandAfterLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        valueAfterCents: { type: DataTypes.BIGINT, allowNull: false },
        batchId: { type: DataTypes.INTEGER, allowNull: true },
        transferTankId: { type: DataTypes.INTEGER, allowNull: true },
        reason: { type: DataTypes.TEXT, allowNull: true },
        occurredAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'TankMovement', tableName: 'tank_movements', underscored: true, updatedAt: false },
    );
  }
}
