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

export type ImportKind = 'invitations' | 'opening-balances' | 'opening-tank' | 'opening-supplies' | 'past-batches';
export type ImportStatus = 'done' | 'undone';

/** One row of an import as it was decided at confirm time (kept for the result download). */
export interface ImportRowRecord {
  /** The line in the file (1 = the header). */
  line: number;
  fate: string;
  /** The row's values as read (e.g. name, email, role). */
  values: Record<string, string>;
  /** The record the row became, when it became one (an invitation id …). */
  entityId: number | null;
}

/**
 * A confirmed CSV import: who, when, which file (name and SHA-256: the same file is refused a
 * second time while this import stands), row counts and each row's fate.
 */
export class Import extends Model<InferAttributes<Import>, InferCreationAttributes<Import>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare kind: ImportKind;
  declare fileName: string;
  declare fileHash: string;
  declare status: CreationOptional<ImportStatus>;
  declare rowsTotal: number;
  declare rowsImported: number;
  declare rowsSkipped: number;
  declare rows: CreationOptional<ImportRowRecord[]>;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare undoneAt: CreationOptional<Date | null>;
  declare undoneByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Import.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(30), allowNull: false },
        fileName: { type: DataTypes.STRING(255), allowNull: false },
        fileHash: { type: DataTypes.CHAR(64), allowNull: false },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'done' },
        rowsTotal: { type: DataTypes.INTEGER, allowNull: false },
        rowsImported: { type: DataTypes.INTEGER, allowNull: false },
        rowsSkipped: { type: DataTypes.INTEGER, allowNull: false },
        rows: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        createdByUserId: { type: DataTypes.INTEGER, allowNull: true },
        undoneAt: { type: DataTypes.DATE, allowNull: true },
        undoneByUserId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Import', tableName: 'imports', underscored: true },
    );
  }
}
