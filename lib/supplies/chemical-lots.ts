import 'server-only';
import type { chemicalLotSchema } from '@/lib/api/dto/brewing';
import type { z } from 'zod';
import { col, fn, type InferAttributes, type Transaction, type WhereOptions } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { notFound, invalidFields } from '@/lib/http';
import { inTransaction } from '@/lib/db';
import { deleteFile, openFile, putFile, type StoredFile } from '@/lib/storage';
import { gallonsToLiters, lbToKg } from '@/lib/units';
import type { ChemicalLotCreateInput } from '@/lib/validation/brewing';
import type { Paged } from '@/lib/validation/list';
import { ChemicalLot } from '@/models';
import type { CheckedUpload } from '@/lib/storage/upload';
import { checkLowStock } from './low-stock';

// Chemical lots: methanol and catalyst purchases, with their safety data sheets. Oil lots are in ./oil-lots.

export type { ChemicalKind } from '@/models/ChemicalLot';
import type { ChemicalKind } from '@/models/ChemicalLot';
import { numericOrNull } from '@/lib/units/quantity';

/** A chemical lot as shown and sent: quantities in the lot's unit (L for methanol, g for catalysts). */
export type ChemicalLotDto = z.infer<typeof chemicalLotSchema>;

type ChemicalLotRow = Pick<
  InferAttributes<ChemicalLot>,
  | 'id'
  | 'kind'
  | 'description'
  | 'supplier'
  | 'receivedOn'
  | 'quantityUnit'
  | 'quantity'
  | 'remainingQuantity'
  | 'totalCostCents'
  | 'purityPct'
  | 'sdsFileKey'
  | 'sdsFileName'
  | 'notes'
>;
const CHEMICAL_ATTRIBUTES: (keyof ChemicalLotRow)[] = [
  'id',
  'kind',
  'description',
  'supplier',
  'receivedOn',
  'quantityUnit',
  'quantity',
  'remainingQuantity',
  'totalCostCents',
  'purityPct',
  'sdsFileKey',
  'sdsFileName',
  'notes',
];

function chemicalDto(r: ChemicalLotRow): ChemicalLotDto {
  const quantity = Number(r.quantity);
  const remaining = Number(r.remainingQuantity);
  return {
    id: r.id,
    kind: r.kind,
    description: r.description,
    supplier: r.supplier,
    receivedOn: r.receivedOn,
    unit: r.quantityUnit,
    quantity,
    remaining,
    consumed: Number((quantity - remaining).toFixed(3)),
    totalCostCents: Number(r.totalCostCents),
    purityPct: numericOrNull(r.purityPct),
    hasSafetyDataSheet: Boolean(r.sdsFileKey),
    safetyDataSheetName: r.sdsFileName,
    notes: r.notes,
  };
}

const CHEMICAL_SORT: Record<string, string | ReturnType<typeof fn>> = {
  receivedOn: 'receivedOn',
  kind: 'kind',
  supplier: fn('lower', col('supplier')),
  remaining: 'remainingQuantity',
  cost: 'totalCostCents',
};

/**
 * Chemical lots of the actor's co-op, one page, newest first by default.
 * @param actor brewer or admin
 * @param q page, pageSize, sort (receivedOn|kind|supplier|remaining|cost), dir, optional kind
 */
export async function listChemicalLots(
  actor: Actor,
  q: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; kind?: ChemicalKind },
): Promise<Paged<ChemicalLotDto>> {
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const where: WhereOptions<ChemicalLot> = q.kind ? { coopId: actor.coop.id, kind: q.kind } : { coopId: actor.coop.id };
  const [rows, total] = await Promise.all([
    ChemicalLot.findAll({
      attributes: CHEMICAL_ATTRIBUTES,
      where,
      raw: true,
      order: [
        [CHEMICAL_SORT[q.sort] ?? 'receivedOn', dir],
        ['id', dir],
      ],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
    }),
    ChemicalLot.count({ where }),
  ]);
  return { rows: rows.map(chemicalDto), total, page: q.page, pageSize: q.pageSize };
}

/** One chemical lot of the actor's co-op, or 404. */
export async function getChemicalLot(actor: Actor, id: number): Promise<ChemicalLotDto> {
  return readChemical(actor.coop.id, id);
}

/** Converts a typed quantity to the stored unit: litres (from L or US gal) or grams (from g, kg or lb; 1 lb = 0.45359237 kg, NIST SP 811). */
export function toStoredQuantity(
  quantity: number,
  unit: 'L' | 'gal' | 'g' | 'kg' | 'lb',
): { quantity: number; unit: 'L' | 'g' } {
  if (unit === 'gal') return { quantity: gallonsToLiters(quantity), unit: 'L' };
  if (unit === 'kg') return { quantity: quantity * 1000, unit: 'g' };
  if (unit === 'lb') return { quantity: lbToKg(quantity) * 1000, unit: 'g' };
  return { quantity, unit };
}

/**
 * Records a chemical purchase (one lot). Methanol is stored in litres, catalysts in grams.
 * @param actor brewer or admin
 * @param input validated chemicalLotCreateSchema
 * @returns the new lot
 */
export async function createChemicalLot(actor: Actor, input: ChemicalLotCreateInput): Promise<ChemicalLotDto> {
  const stored = toStoredQuantity(input.quantity, input.unit);
  const qty = stored.quantity.toFixed(3);
  if (Number(qty) <= 0) throw invalidFields({ quantity: ['Quantity is too small to record.'] });
  const created = await inTransaction(async (transaction) => {
    const lot = await ChemicalLot.create(
      {
        coopId: actor.coop.id,
        kind: input.kind,
        description: input.description ?? null,
        supplier: input.supplier,
        receivedOn: input.receivedOn,
        quantityUnit: stored.unit,
        quantity: qty,
        remainingQuantity: qty,
        totalCostCents: String(input.totalCost),
        purityPct: input.purityPct === undefined ? null : input.purityPct.toFixed(2),
        notes: input.notes ?? null,
        createdByUserId: actor.user.id,
      },
      { transaction },
    );
    const dto = await readChemical(actor.coop.id, lot.id, transaction);
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'chemical-lot.create',
        entityType: 'chemical_lot',
        entityId: lot.id,
        after: dto,
      },
      transaction,
    );
    return dto;
  });
  await checkLowStock(actor.coop.id);
  return created;
}

async function readChemical(coopId: number, id: number, transaction?: Transaction): Promise<ChemicalLotDto> {
  const row = await ChemicalLot.findOne({
    attributes: CHEMICAL_ATTRIBUTES,
    where: { id, coopId },
    raw: true,
    transaction,
  });
  if (!row) throw notFound('Chemical lot not found.');
  return chemicalDto(row);
}

/**
 * Stores a safety data sheet (PDF) for a chemical lot under a server-made name, replacing any
 * earlier one.
 * @param actor brewer or admin
 * @param id chemical lot id (another co-op's → 404)
 * @param upload a checked PDF upload
 */
export async function attachSafetyDataSheet(actor: Actor, id: number, upload: CheckedUpload): Promise<ChemicalLotDto> {
  const coopId = actor.coop.id;
  await readChemical(coopId, id); // 404 before writing a file
  const key = await putFile(coopId, upload.kind, upload.bytes);
  let previous: string | null = null;
  try {
    const dto = await inTransaction(async (transaction) => {
      const row = await ChemicalLot.findOne({
        attributes: ['sdsFileKey', 'sdsFileName'],
        where: { id, coopId },
        raw: true,
        lock: transaction.LOCK.UPDATE,
        transaction,
      });
      if (!row) throw notFound('Chemical lot not found.');
      previous = row.sdsFileKey;
      await ChemicalLot.update({ sdsFileKey: key, sdsFileName: upload.name }, { where: { id, coopId }, transaction });
      await audit(
        {
          coopId,
          actorUserId: actor.user.id,
          action: 'chemical-lot.sds',
          entityType: 'chemical_lot',
          entityId: id,
          before: { safetyDataSheet: row.sdsFileName },
          after: { safetyDataSheet: upload.name, bytes: upload.bytes.length },
        },
        transaction,
      );
      return readChemical(coopId, id, transaction);
    });
    if (previous) await deleteFile(coopId, previous);
    return dto;
  } catch (e) {
    await deleteFile(coopId, key);
    throw e;
  }
}

/** The stored safety data sheet of a lot, opened for streaming (404 when there is none or the lot is another co-op's). */
export async function getSafetyDataSheet(actor: Actor, id: number): Promise<{ file: StoredFile; name: string }> {
  const row = await ChemicalLot.findOne({
    attributes: ['sdsFileKey', 'sdsFileName', 'kind'],
    where: { id, coopId: actor.coop.id },
    raw: true,
  });
  if (!row?.sdsFileKey) throw notFound('No safety data sheet for this lot.');
  return { file: await openFile(actor.coop.id, row.sdsFileKey), name: row.sdsFileName ?? `sds-${row.kind}-${id}.pdf` };
}
