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

export type BillingRunStatus = 'running' | 'completed' | 'failed' | 'abandoned';

/** One invoicing run for a month: members to bill, how many are done, its heartbeat. */
export class BillingRun extends Model<InferAttributes<BillingRun>, InferCreationAttributes<BillingRun>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare period: string;
  declare status: CreationOptional<BillingRunStatus>;
  /** When set, the run is limited to these memberships. */
  declare memberIds: CreationOptional<number[] | null>;
  declare totalMembers: CreationOptional<number>;
  declare doneMembers: CreationOptional<number>;
  declare drafts: CreationOptional<number>;
  declare error: CreationOptional<string | null>;
  declare startedByUserId: CreationOptional<number | null>;
  declare heartbeatAt: CreationOptional<Date>;
  declare finishedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    BillingRun.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        coopId: { type: DataTypes.INTEGER, allowNull: false },
        period: { type: DataTypes.DATEONLY, allowNull: false },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'running' },
        memberIds: { type: DataTypes.ARRAY(DataTypes.INTEGER), allowNull: true },
        totalMembers: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        doneMembers: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        drafts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        error: { type: DataTypes.TEXT, allowNull: true },
        startedByUserId: { type: DataTypes.INTEGER, allowNull: true },
        heartbeatAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'BillingRun', tableName: 'billing_runs', underscored: true },
    );
  }
}
