import 'server-only';
import type { Actor } from '@/lib/auth';
import { temperatureCheck } from '@/lib/chemistry';
import { audit } from '@/lib/audit';
import { conflict, HttpError } from '@/lib/http';
import { checkLowStock } from '@/lib/supplies/low-stock';
import { tempToC, volumeToLiters } from '@/lib/units';
import type { BatchCreateInput } from '@/lib/validation/brewing';
import { inTransaction } from '@/lib/db';
import { todayIn } from '@/lib/dates';
import { Batch, BatchTemperature } from '@/models';
import type { BatchStatus } from '@/models/Batch';
import { computePlan } from './plan';
import { fieldError, nextLotPurity, planColumns, resolveTitration, writeOilLots } from './plan-inputs';
import { lockBatchNumbers } from './queries';
import { getBatch, type BatchDto, type TemperatureDto } from './read';
import { loadBatch } from './stored';

// Writing batches: create from a plan, move forward, log temperatures. Recording the steps (and
// changing the plan) is in ./update; release and rejection live in ./release.

/** The working steps in order; a batch only moves forward through them, then to released or rejected. */
export const STEPS = ['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;
export const FINAL: readonly BatchStatus[] = ['released', 'rejected', 'imported'];
/** Released, rejected and imported batches are final: their record can no longer change. */
export const isFinal = (s: string) => (FINAL as readonly string[]).includes(s);

/**
 * Creates a batch in status 'planned' from the planner's inputs: computes the plan, numbers the
 * batch (per co-op sequence under an advisory lock), records the oil lots it will use.
 * @param actor brewer or admin
 * @param input validated batchCreateSchema (volumes in the co-op's units)
 */
export async function createBatch(actor: Actor, input: BatchCreateInput): Promise<BatchDto> {
  const units = actor.coop.units;
  const oilLiters = volumeToLiters(input.oilVolume, units);
  const id = await inTransaction(async (t) => {
    const { titration, lot } = await resolveTitration(actor, input, t);
    const catalyst = input.catalyst ?? actor.coop.settings.recipe?.catalyst ?? 'KOH';
    const plan = computePlan(
      {
        ...input,
        oilLiters,
        titration,
        nextLotPurityPct: input.purityPct === undefined ? await nextLotPurity(actor.coop.id, catalyst, t) : null,
      },
      actor.coop.settings.recipe,
      { system: units },
    );
    const uses = input.oilLots
      ? input.oilLots.map((u) => ({ oilLotId: u.oilLotId, liters: volumeToLiters(u.volume, units) }))
      : lot && lot.remainingLiters > 0
        ? [{ oilLotId: lot.id, liters: Math.min(oilLiters, lot.remainingLiters) }]
        : [];

    await lockBatchNumbers(actor.coop.id, t);
    const last = await Batch.max<number | null, Batch>('number', { where: { coopId: actor.coop.id }, transaction: t });
    const batch = await Batch.create(
      {
        coopId: actor.coop.id,
        number: Number(last ?? 0) + 1,
        ...planColumns(plan),
        batchDate: input.batchDate ?? todayIn(actor.coop.timezone),
        qualityStandard: actor.coop.settings.qualityStandard === 'EN 14214' ? 'EN 14214' : 'ASTM D6751',
        notes: input.notes ?? null,
        createdByUserId: actor.user.id,
      },
      { transaction: t },
    );
    await writeOilLots(actor, batch.id, oilLiters, uses, t);
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'batch.create',
        entityType: 'batch',
        entityId: batch.id,
        after: { number: batch.number, ...planColumns(plan), oilLots: uses },
      },
      t,
    );
    return batch.id;
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}
/**
 * Moves a batch forward to a later working step (skipping is allowed, going back is not).
 * Final batches → 409. Starting the reaction sets the batch's date to today.
 */
export async function advanceBatch(actor: Actor, id: number, to: (typeof STEPS)[number]): Promise<BatchDto> {
  await inTransaction(async (t) => {
    const row = await loadBatch(actor.coop.id, id, t, true);
    if (isFinal(row.status)) throw conflict(`Batch ${row.number} is ${row.status}; its steps can no longer change.`);
    const from = STEPS.indexOf(row.status as (typeof STEPS)[number]);
    const target = STEPS.indexOf(to);
    if (target <= from)
      throw new HttpError(409, `A batch only moves forward: batch ${row.number} is already at “${row.status}”.`, {
        to: [`Choose a step after “${row.status}”.`],
      });
    const changes: Record<string, unknown> = { status: to, statusChangedAt: new Date() };
    if (row.status === 'planned') changes.batchDate = todayIn(actor.coop.timezone);
    await Batch.update(changes, { where: { id, coopId: actor.coop.id }, transaction: t });
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'batch.advance',
        entityType: 'batch',
        entityId: id,
        before: { status: row.status },
        after: { status: to },
      },
      t,
    );
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}

/**
 * Adds a reaction temperature reading (typed in °F or °C by the co-op's units) and returns the
 * check lib/chemistry gives it — warnings show as readings are entered. Final batches → 409.
 */
export async function addTemperature(
  actor: Actor,
  id: number,
  input: { temp: number; measuredAt?: string },
): Promise<TemperatureDto> {
  const tempC = tempToC(input.temp, actor.coop.units);
  if (!(tempC > -50 && tempC < 200)) throw fieldError({ temp: ['Check this reading: it is outside −50 … 200 °C.'] });
  const rounded = Math.round(tempC * 100) / 100;
  return inTransaction(async (t) => {
    const row = await loadBatch(actor.coop.id, id, t, true);
    if (isFinal(row.status))
      throw conflict(`Batch ${row.number} is ${row.status}; its record can no longer be changed.`);
    const check = temperatureCheck(rounded, actor.coop.units, { elevationM: actor.coop.settings.elevationM ?? 0 });
    const reading = await BatchTemperature.create(
      {
        coopId: actor.coop.id,
        batchId: id,
        measuredAt: input.measuredAt ? new Date(input.measuredAt) : new Date(),
        tempC: rounded.toFixed(2),
        level: check.level,
        createdByUserId: actor.user.id,
      },
      { transaction: t },
    );
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'batch.temperature',
        entityType: 'batch',
        entityId: id,
        after: { tempC: rounded, level: check.level },
      },
      t,
    );
    return {
      id: String(reading.id),
      measuredAt: reading.measuredAt.toISOString(),
      tempC: rounded,
      level: check.level,
      message: check.message,
    };
  });
}
