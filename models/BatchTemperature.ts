import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Batch } from './Batch';
import type { Coop } from './Coop';
import type { User } from './User';

/** A reaction temperature reading, °C, with the level temperatureCheck gave it. */
export class BatchTemperature extends Model<
  InferAttributes<BatchTemperature>,
  InferCreationAttributes<BatchTemperature>
> {
  declare id: CreationOptional<string>;
  declare coopId: ForeignKey<Coop['id']>;
  declare batchId: ForeignKey<Batch['id']>;
  declare measuredAt: Date;
  declare tempC: string;
  declare level: 'cold' | 'ok' | 'warning' | 'danger';
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    BatchTemperature.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        measuredAt: { type: DataTypes.DATE, allowNull: false },
        tempC: { type: DataTypes.DECIMAL(6, 2), allowNull: false },
        level: { type: DataTypes.STRING(8), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      {
        sequelize,
        modelName: 'BatchTemperature',
        tableName: 'batch_temperatures',
        underscored: true,
        updatedAt: false,
      },
    );
  }
}
