import {
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';

export type UnitSystem = 'us' | 'metric';

/** Settings a co-op's admin controls; stored as JSONB so new knobs need no migration. */
export interface CoopSettings {
  /** Members may record their own draws at a self-serve pump. */
  selfServeDraws?: boolean;
  /** Recipe defaults for the batch planner. */
  recipe?: {
    catalyst?: 'KOH' | 'NaOH';
    baseGramsPerLiter?: number;
    purityPct?: number;
    methanolPct?: number;
  };
  /** Fuel-quality standard batches are judged against. */
  qualityStandard?: 'ASTM D6751' | 'EN 14214';
  monthlyDuesCents?: number;
  /** Elevation of the brewing site above sea level, m (methanol boils lower at altitude). */
  elevationM?: number;
}

export class Coop extends Model<InferAttributes<Coop>, InferCreationAttributes<Coop>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare slug: string;
  declare units: CreationOptional<UnitSystem>;
  declare currency: CreationOptional<string>;
  declare timezone: CreationOptional<string>;
  declare settings: CreationOptional<CoopSettings>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Coop.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        slug: { type: DataTypes.STRING(60), allowNull: false, unique: true },
        units: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'us' },
        currency: { type: DataTypes.STRING(3), allowNull: false, defaultValue: 'USD' },
        timezone: { type: DataTypes.STRING(60), allowNull: false, defaultValue: 'America/Chicago' },
        settings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Coop', tableName: 'coops', underscored: true },
    );
  }
}
