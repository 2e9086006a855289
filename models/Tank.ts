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

export type TankMixing = 'mixed' | 'fifo';

/**
 * A fuel tank with its running totals. Litres are NUMERIC(14,3) and value BIGINT, so all three
 * arrive as strings (parse them with lib/units/quantity and Number on purpose). The totals change
 * only through lib/tank/ledger recordMovement (on hand, value) and the reservation services
 * (reserved); CHECKs keep on hand ≥ reserved ≥ 0.
 */
export class Tank extends Model<InferAttributes<Tank>, InferCreationAttributes<Tank>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare name: string;
  declare capacityLiters: string;
  declare onHandLiters: CreationOptional<string>;
  declare reservedLiters: CreationOptional<string>;
  declare valueCents: CreationOptional<string>;
  declare active: CreationOptional<boolean>;
  /** 'mixed': a draw takes every batch in proportion; 'fifo': the oldest fuel leaves first. */
  declare mixing: CreationOptional<TankMixing>;
  /** Fuel held while a batch in the tank is under review (lib/tank/lineage keeps it). */
  declare heldLiters: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare coop?: NonAttribute<Coop>;

  static initModel(sequelize: Sequelize) {
    Tank.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(80), allowNull: false },
        capacityLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        onHandLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false, defaultValue: '0' },
        reservedLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false, defaultValue: '0' },
        valueCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: '0' },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        mixing: { type: DataTypes.STRING(5), allowNull: false, defaultValue: 'mixed' },
        heldLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false, defaultValue: '0' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Tank', tableName: 'tanks', underscored: true },
    );
  }
}
