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
import type { ChemicalLot } from './ChemicalLot';
import type { Coop } from './Coop';

/** A FIFO slice of a chemical lot consumed by a batch, priced in cents. */
export class ChemicalConsumption extends Model<
  InferAttributes<ChemicalConsumption>,
  InferCreationAttributes<ChemicalConsumption>
> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare batchId: ForeignKey<Batch['id']>;
  declare chemicalLotId: ForeignKey<ChemicalLot['id']>;
  declare quantity: string;
  declare costCents: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ChemicalConsumption.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        quantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        costCents: { type: DataTypes.BIGINT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      {
        sequelize,
        modelName: 'ChemicalConsumption',
        tableName: 'chemical_consumptions',
        underscored: true,
        updatedAt: false,
      },
    );
  }
}
