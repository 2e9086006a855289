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

/** Used cooking oil collected from one place on one day, with its titration when measured. */
export class OilLot extends Model<InferAttributes<OilLot>, InferCreationAttributes<OilLot>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare collectedFrom: string;
  declare collectedOn: string;
  declare volumeLiters: string;
  declare costCents: CreationOptional<string>;
  declare waterNotes: string | null;
  declare solidsNotes: string | null;
  declare titrationMl: string | null;
  declare titrant: 'KOH' | 'NaOH' | null;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    OilLot.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        collectedFrom: { type: DataTypes.STRING(120), allowNull: false },
        collectedOn: { type: DataTypes.DATEONLY, allowNull: false },
        volumeLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        costCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        waterNotes: { type: DataTypes.TEXT, allowNull: true },
        solidsNotes: { type: DataTypes.TEXT, allowNull: true },
        titrationMl: { type: DataTypes.DECIMAL(6, 2), allowNull: true },
        titrant: { type: DataTypes.STRING(4), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'OilLot', tableName: 'oil_lots', underscored: true },
    );
  }
}
