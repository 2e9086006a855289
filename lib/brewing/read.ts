import 'server-only';
import type { batchCostsSchema, batchFullSchema, batchSummarySchema, temperatureSchema } from '@/lib/api/dto/batch';
import type { z } from 'zod';
import type { InferAttributes, Transaction } from 'sequelize';
import { can, type Actor } from '@/lib/auth';
import { temperatureCheck } from '@/lib/chemistry';
import { energyCostCents } from '@/lib/costing';
import { notFound } from '@/lib/http';
import { roundHalfUp } from '@/lib/money';
import { evaluateQuality, evaluateQuickTests } from '@/lib/quality';
import { litersToMl, numericOrNull } from '@/lib/units/quantity';
import { BatchFile, BatchOilLot, BatchTemperature, ChemicalConsumption, ChemicalLot, OilLot, Tank } from '@/models';
import { computePlan } from './plan';
import {
  isBrewed,
  labResultsOf,
  loadBatch,
  planInputOf,
  quickTestInput,
  quickTestsOf,
  type BatchRecord,
} from './stored';

// Reading batches: one batch (full record or the members' summary), and its costs.

/** A temperature reading as returned: °C stored, with its level and message in the co-op's units (the API's Temperature). */
export type TemperatureDto = z.infer<typeof temperatureSchema>;

export type BatchCosts = z.infer<typeof batchCostsSchema>;

/** Everything the batch page shows (brewers and admins): the API's Batch. Volumes litres, temperatures °C, money cents. */
export type BatchDto = z.infer<typeof batchFullSchema>;

/** What members and treasurers see of a released batch: the API's BatchSummary. */
export type BatchSummaryDto = z.infer<typeof batchSummarySchema>;

export function costsOf(
  row: Pick<
    BatchRecord,
    | 'totalCostCents'
    | 'releasedLiters'
    | 'costMethanolCents'
    | 'costCatalystCents'
    | 'costEnergyCents'
    | 'costFeedstockCents'
    | 'costOtherCents'
    | 'costPerGallonCents'
  >,
): BatchCosts | null {
  if (row.totalCostCents === null) return null;
  const total = Number(row.totalCostCents);
  const liters = numericOrNull(row.releasedLiters);
  return {
    methanolCents: Number(row.costMethanolCents ?? 0),
    catalystCents: Number(row.costCatalystCents ?? 0),
    energyCents: Number(row.costEnergyCents ?? 0),
    feedstockCents: Number(row.costFeedstockCents ?? 0),
    otherCents: Number(row.costOtherCents ?? 0),
    totalCents: total,
    costPerGallonCents: numericOrNull(row.costPerGallonCents),
    costPerLiterCents: liters ? roundHalfUp(total / liters) : null,
  };
}

/** Energy cost of a batch from its stored inputs (0 without a tariff or without an amount). */
export function energyCentsOf(
  row: Pick<BatchRecord, 'energyKwh' | 'heaterKw' | 'heaterHours' | 'tariffCentsPerKwh'>,
): number | null {
  const tariff = numericOrNull(row.tariffCentsPerKwh);
  if (tariff === null) return null;
  if (row.energyKwh !== null) return energyCostCents({ kwh: Number(row.energyKwh), tariffCentsPerKwh: tariff });
  if (row.heaterKw !== null && row.heaterHours !== null) {
    return energyCostCents({
      heaterKw: Number(row.heaterKw),
      hours: Number(row.heaterHours),
      tariffCentsPerKwh: tariff,
    });
  }
  return null;
}

/** Feedstock cost of each oil lot share: the lot's cost × litres used ÷ its volume, to the cent. */
export function feedstockShareCents(
  lotCostCents: number,
  usedLiters: string | number,
  lotVolumeLiters: string | number,
): number {
  const volumeMl = litersToMl(lotVolumeLiters);
  return volumeMl > 0 ? roundHalfUp((lotCostCents * litersToMl(usedLiters)) / volumeMl) : 0;
}

/** A batch's share of an oil lot, with the lot's details (its co-op matched too). */
export type BatchOilLotShare = Pick<InferAttributes<BatchOilLot>, 'oilLotId' | 'liters'> & {
  oilLot: Pick<InferAttributes<OilLot>, 'collectedFrom' | 'collectedOn' | 'costCents' | 'volumeLiters'>;
};

/** The oil lots a batch uses, oldest collection first, each with its lot (one query, the lot joined in). */
export async function batchOilLotShares(
  coopId: number,
  batchId: number,
  transaction?: Transaction,
): Promise<BatchOilLotShare[]> {
  return (await BatchOilLot.findAll({
    attributes: ['oilLotId', 'liters'],
    where: { batchId, coopId },
    include: [
      {
        model: OilLot,
        as: 'oilLot',
        attributes: ['collectedFrom', 'collectedOn', 'costCents', 'volumeLiters'],
        where: { coopId },
        required: true,
      },
    ],
    order: [
      [{ model: OilLot, as: 'oilLot' }, 'collectedOn', 'ASC'],
      [{ model: OilLot, as: 'oilLot' }, 'id', 'ASC'],
    ],
    raw: true,
    nest: true,
    transaction,
  })) as unknown as BatchOilLotShare[];
}

/** The name of a tank of the co-op (null when there is none). */
export async function tankName(coopId: number, tankId: number | null): Promise<string | null> {
  if (tankId === null) return null;
  const tank = await Tank.findOne({ attributes: ['name'], where: { id: tankId, coopId }, raw: true });
  return tank?.name ?? null;
}

type ConsumptionRow = Pick<InferAttributes<ChemicalConsumption>, 'chemicalLotId' | 'quantity' | 'costCents'> & {
  lot: Pick<InferAttributes<ChemicalLot>, 'kind' | 'supplier' | 'receivedOn' | 'quantityUnit'>;
};

/**
 * One batch of the actor's co-op. Brewers and admins get the full record; members and treasurers
 * get the quality summary of a released batch (any other batch is a 404 for them).
 */
export async function getBatch(actor: Actor, id: number): Promise<BatchDto>;
export async function getBatch(
  actor: Actor,
  id: number,
  opts: { allowSummary: true },
): Promise<BatchDto | BatchSummaryDto>;
export async function getBatch(
  actor: Actor,
  id: number,
  opts?: { allowSummary: true },
): Promise<BatchDto | BatchSummaryDto> {
  const full = can(actor.role, 'batches:read-all');
  const coopId = actor.coop.id;
  const row = await loadBatch(coopId, id);
  // An imported past batch has no recipe or steps: everyone sees it in summary, read-only.
  const imported = row.status === 'imported';
  if ((!full || imported) && (!opts?.allowSummary || (row.status !== 'released' && !imported)))
    throw notFound('Batch not found.');
  const quickTests = quickTestsOf(row);
  const labResults = labResultsOf(row);
  const quickTestEvaluation = evaluateQuickTests(quickTestInput(quickTests, row.catalyst));
  const quality = evaluateQuality(row.qualityStandard, labResults);
  if (!full || !isBrewed(row)) {
    const costs = costsOf(row);
    return {
      view: 'summary',
      id: row.id,
      number: row.number,
      status: row.status,
      batchDate: row.batchDate,
      oilLiters: Number(row.oilLiters),
      catalyst: row.catalyst,
      quickTestEvaluation,
      quality,
      imported: imported ? { notes: row.notes } : null,
      costPerGallonCents: costs?.costPerGallonCents ?? null,
      costPerLiterCents: costs?.costPerLiterCents ?? null,
      qualityVerdict: row.qualityVerdict,
      screeningVerdict: row.screeningVerdict,
      release: row.releasedAt
        ? {
            releasedLiters: Number(row.releasedLiters),
            releasedAt: row.releasedAt.toISOString(),
            tankName: await tankName(coopId, row.tankId),
          }
        : null,
    };
  }
  const where = { batchId: id, coopId };
  const [tank, oilLots, temps, consumptions, files] = await Promise.all([
    tankName(coopId, row.tankId),
    batchOilLotShares(coopId, id),
    BatchTemperature.findAll({
      attributes: ['id', 'measuredAt', 'tempC', 'level'],
      where,
      order: [
        ['measuredAt', 'ASC'],
        ['id', 'ASC'],
      ],
      raw: true,
    }),
    ChemicalConsumption.findAll({
      attributes: ['chemicalLotId', 'quantity', 'costCents'],
      where,
      include: [
        {
          model: ChemicalLot,
          as: 'lot',
          attributes: ['kind', 'supplier', 'receivedOn', 'quantityUnit'],
          where: { coopId },
          required: true,
        },
      ],
      order: [
        [{ model: ChemicalLot, as: 'lot' }, 'kind', 'ASC'],
        [{ model: ChemicalLot, as: 'lot' }, 'receivedOn', 'ASC'],
        [{ model: ChemicalLot, as: 'lot' }, 'id', 'ASC'],
      ],
      raw: true,
      nest: true,
    }) as unknown as Promise<ConsumptionRow[]>,
    BatchFile.findAll({
      attributes: ['id', 'purpose', 'fileKind', 'originalName', 'sizeBytes', 'createdAt'],
      where,
      order: [['id', 'ASC']],
      raw: true,
    }),
  ]);
  const oilLotDtos = oilLots.map((o) => ({
    oilLotId: o.oilLotId,
    collectedFrom: o.oilLot.collectedFrom,
    collectedOn: o.oilLot.collectedOn,
    liters: Number(o.liters),
    feedstockCents: feedstockShareCents(Number(o.oilLot.costCents), o.liters, o.oilLot.volumeLiters),
  }));
  return {
    view: 'full',
    id: row.id,
    number: row.number,
    status: row.status,
    batchDate: row.batchDate,
    statusChangedAt: new Date(row.statusChangedAt).toISOString(),
    createdAt: new Date(row.createdAt).toISOString(),
    oilLiters: Number(row.oilLiters),
    oilLots: oilLotDtos,
    plan: computePlan(planInputOf(row), {}, { system: actor.coop.units }),
    computedCatalystGrams: Number(row.computedCatalystGrams),
    computedMethanolLiters: Number(row.computedMethanolLiters),
    actualCatalystGrams: numericOrNull(row.actualCatalystGrams),
    actualMethanolLiters: numericOrNull(row.actualMethanolLiters),
    mixingMinutes: row.mixingMinutes,
    settlingHours: numericOrNull(row.settlingHours),
    glycerinLiters: numericOrNull(row.glycerinLiters),
    washCycles: row.washCycles,
    washWaterLiters: numericOrNull(row.washWaterLiters),
    dryingMethod: row.dryingMethod,
    dryingNotes: row.dryingNotes,
    temperatures: temps.map((r) => {
      const tempC = Number(r.tempC);
      return {
        id: String(r.id),
        measuredAt: new Date(r.measuredAt).toISOString(),
        tempC,
        level: r.level,
        message: temperatureCheck(tempC, actor.coop.units, { elevationM: actor.coop.settings.elevationM ?? 0 }).message,
      };
    }),
    quickTests,
    quickTestEvaluation,
    labResults,
    quality,
    qualityVerdict: row.qualityVerdict,
    screeningVerdict: row.screeningVerdict,
    energy: {
      kwh: numericOrNull(row.energyKwh),
      heaterKw: numericOrNull(row.heaterKw),
      heaterHours: numericOrNull(row.heaterHours),
      tariffCentsPerKwh: numericOrNull(row.tariffCentsPerKwh),
      costCents: energyCentsOf(row),
    },
    feedstockCentsOverride: numericOrNull(row.feedstockCentsOverride),
    feedstockFromLotsCents: oilLotDtos.reduce((a, o) => a + o.feedstockCents, 0),
    otherCents: Number(row.otherCents),
    otherNotes: row.otherNotes,
    release:
      row.releasedAt && row.tankId
        ? {
            tankId: row.tankId,
            tankName: tank,
            releasedLiters: Number(row.releasedLiters),
            releasedAt: row.releasedAt.toISOString(),
          }
        : null,
    rejectedAt: row.rejectedAt ? row.rejectedAt.toISOString() : null,
    rejectReason: row.rejectReason,
    costs: costsOf(row),
    consumptions: consumptions.map((c) => ({
      chemicalLotId: c.chemicalLotId,
      kind: c.lot.kind,
      supplier: c.lot.supplier,
      receivedOn: c.lot.receivedOn,
      unit: c.lot.quantityUnit,
      quantity: Number(c.quantity),
      costCents: Number(c.costCents),
    })),
    files: files.map((f) => ({
      id: f.id,
      purpose: f.purpose,
      kind: f.fileKind,
      name: f.originalName,
      sizeBytes: f.sizeBytes,
      createdAt: new Date(f.createdAt).toISOString(),
    })),
    notes: row.notes,
  };
}
