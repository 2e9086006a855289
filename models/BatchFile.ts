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

/** A photo or lab report attached to a batch, stored under a server-made key (lib/storage). */
export class BatchFile extends Model<InferAttributes<BatchFile>, InferCreationAttributes<BatchFile>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare batchId: ForeignKey<Batch['id']>;
  declare purpose: 'photo' | 'lab-report' | 'receipt';
  declare fileKind: 'pdf' | 'jpeg' | 'png';
  declare storageKey: string;
  declare originalName: string;
  declare sizeBytes: number;
  declare uploadedByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    BatchFile.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        purpose: { type: DataTypes.STRING(12), allowNull: false },
        fileKind: { type: DataTypes.STRING(4), allowNull: false },
        storageKey: { type: DataTypes.STRING(80), allowNull: false },
        originalName: { type: DataTypes.STRING(200), allowNull: false },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'BatchFile', tableName: 'batch_files', underscored: true, updatedAt: false },
    );
  }
}
