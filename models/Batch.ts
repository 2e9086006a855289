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

/** The steps of a batch, in order; released and rejected are final. `imported` is a past batch
 *  brought in from a spreadsheet in summary (no recipe, no steps, no tank movement: read-only). */
export const BATCH_STATUSES = [
  'planned',
  'reacting',
  'settling',
  'draining',
  'washing',
  'drying',
  'testing',
  'released',
  'rejected',
  'imported',
] as const;
export type BatchStatus = (typeof BATCH_STATUSES)[number];

/**
 * One batch from plan to tank. Volumes are litres (NUMERIC, strings in JS), temperatures °C,
 * money integer cents (BIGINT, strings in JS). Costs are written once, on release.
 * The recipe columns (titration … computed amounts) are NULL only for an `imported` batch
 * (migration 20261202400000); code that reads them handles planned-to-released batches, which
 * always have them, and the batch readers route imported batches to the summary view.
 */
export class Batch extends Model<InferAttributes<Batch>, InferCreationAttributes<Batch>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare number: number;
  declare status: CreationOptional<BatchStatus>;
  declare batchDate: CreationOptional<string>;
  declare statusChangedAt: CreationOptional<Date>;
  declare oilLiters: string;
  declare titrationTrialsMl: number[] | null;
  declare titrationBlankMl: CreationOptional<string>;
  declare titrationSource: CreationOptional<'trials' | 'oil-lot'>;
  declare titrant: 'KOH' | 'NaOH' | null;
  declare titrationAvgMl: string | null;
  declare catalyst: 'KOH' | 'NaOH' | null;
  declare baseGPerL: string | null;
  declare purityPct: string | null;
  declare titrantFrom: 'same-catalyst' | 'pure-reagent' | null;
  declare catalystRule: string | null;
  declare methanolMode: 'percent' | 'molar-ratio' | null;
  declare methanolPct: string | null;
  declare molarRatio: string | null;
  declare computedCatalystGrams: string | null;
  declare computedMethanolLiters: string | null;
  declare actualCatalystGrams: CreationOptional<string | null>;
  declare actualMethanolLiters: CreationOptional<string | null>;
  declare mixingMinutes: CreationOptional<number | null>;
  declare settlingHours: CreationOptional<string | null>;
  declare glycerinLiters: CreationOptional<string | null>;
  declare washCycles: CreationOptional<number | null>;
  declare washWaterLiters: CreationOptional<string | null>;
  declare dryingMethod: CreationOptional<string | null>;
  declare dryingNotes: CreationOptional<string | null>;
  declare quickTests: CreationOptional<Record<string, unknown>>;
  declare labResults: CreationOptional<Record<string, number>>;
  declare qualityStandard: CreationOptional<'ASTM D6751' | 'EN 14214'>;
  declare qualityVerdict: CreationOptional<'pass' | 'fail' | 'incomplete'>;
  declare screeningVerdict: CreationOptional<'looks-good' | 'needs-attention' | 'incomplete'>;
  declare energyKwh: CreationOptional<string | null>;
  declare heaterKw: CreationOptional<string | null>;
  declare heaterHours: CreationOptional<string | null>;
  declare tariffCentsPerKwh: CreationOptional<string | null>;
  declare feedstockCentsOverride: CreationOptional<string | null>;
  declare otherCents: CreationOptional<string>;
  declare otherNotes: CreationOptional<string | null>;
  declare tankId: CreationOptional<number | null>;
  declare releasedLiters: CreationOptional<string | null>;
  declare releasedAt: CreationOptional<Date | null>;
  declare rejectedAt: CreationOptional<Date | null>;
  declare rejectReason: CreationOptional<string | null>;
  declare costMethanolCents: CreationOptional<string | null>;
  declare costCatalystCents: CreationOptional<string | null>;
  declare costEnergyCents: CreationOptional<string | null>;
  declare costFeedstockCents: CreationOptional<string | null>;
  declare costOtherCents: CreationOptional<string | null>;
  declare totalCostCents: CreationOptional<string | null>;
  declare costPerGallonCents: CreationOptional<string | null>;
  declare notes: CreationOptional<string | null>;
  declare createdByUserId: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    const dec = (p: number, s: number) => ({ type: DataTypes.DECIMAL(p, s), allowNull: true });
    // A fresh definition per attribute: Sequelize writes each attribute's column name into its definition object.
    const big = () => ({ type: DataTypes.BIGINT, allowNull: true });
    Batch.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'planned' },
        batchDate: { type: DataTypes.DATEONLY, allowNull: false, defaultValue: DataTypes.NOW },
        statusChangedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        oilLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        titrationTrialsMl: { type: DataTypes.JSONB, allowNull: true },
        titrationBlankMl: { type: DataTypes.DECIMAL(6, 2), allowNull: false, defaultValue: 0 },
        titrationSource: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'trials' },
        titrant: { type: DataTypes.STRING(4), allowNull: true },
        titrationAvgMl: { type: DataTypes.DECIMAL(8, 4), allowNull: true },
        catalyst: { type: DataTypes.STRING(4), allowNull: true },
        baseGPerL: { type: DataTypes.DECIMAL(8, 3), allowNull: true, field: 'base_g_per_l' },
        purityPct: { type: DataTypes.DECIMAL(5, 2), allowNull: true },
        titrantFrom: { type: DataTypes.STRING(14), allowNull: true },
        catalystRule: { type: DataTypes.STRING(40), allowNull: true },
        methanolMode: { type: DataTypes.STRING(12), allowNull: true },
        methanolPct: dec(6, 2),
        molarRatio: dec(6, 2),
        computedCatalystGrams: { type: DataTypes.DECIMAL(12, 3), allowNull: true },
        computedMethanolLiters: { type: DataTypes.DECIMAL(14, 3), allowNull: true },
        actualCatalystGrams: dec(12, 3),
        actualMethanolLiters: dec(14, 3),
        mixingMinutes: { type: DataTypes.INTEGER, allowNull: true },
        settlingHours: dec(6, 2),
        glycerinLiters: dec(14, 3),
        washCycles: { type: DataTypes.INTEGER, allowNull: true },
        washWaterLiters: dec(14, 3),
        dryingMethod: { type: DataTypes.STRING(10), allowNull: true },
        dryingNotes: { type: DataTypes.TEXT, allowNull: true },
        quickTests: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        labResults: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        qualityStandard: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'ASTM D6751' },
        qualityVerdict: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'incomplete' },
        screeningVerdict: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'incomplete' },
        energyKwh: dec(10, 3),
        heaterKw: dec(8, 3),
        heaterHours: dec(8, 2),
        tariffCentsPerKwh: dec(10, 4),
        feedstockCentsOverride: big(),
        otherCents: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        otherNotes: { type: DataTypes.TEXT, allowNull: true },
        tankId: { type: DataTypes.INTEGER, allowNull: true },
        releasedLiters: dec(14, 3),
        releasedAt: { type: DataTypes.DATE, allowNull: true },
        rejectedAt: { type: DataTypes.DATE, allowNull: true },
        rejectReason: { type: DataTypes.TEXT, allowNull: true },
        costMethanolCents: big(),
        costCatalystCents: big(),
        costEnergyCents: big(),
        costFeedstockCents: big(),
        costOtherCents: big(),
        totalCostCents: big(),
        costPerGallonCents: big(),
        notes: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Batch', tableName: 'batches', underscored: true },
    );
  }
}
