import 'server-only';
import { fn, col, Op } from 'sequelize';
import type { z } from 'zod';
import type { dangerAcknowledgedSchema } from '@/lib/api/dto/batch';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { requireCan } from '@/lib/auth/require';
import { conflict, notFound } from '@/lib/http';
import { AuditEvent, Batch, BatchTemperature } from '@/models';

/** The audit action that records a brewer acknowledging a batch's Danger temperature readings. */
export const DANGER_ACK_ACTION = 'batch.danger-acknowledged';

/** A batch with a Danger reading (at or above methanol's boiling point) no brewer has acknowledged. */
export interface DangerAlert {
  batchId: number;
  number: number;
  /** Highest Danger reading since the last acknowledgement, °C. */
  maxTempC: number;
  lastAt: string;
}

/**
 * Batches under way whose latest Danger reading came after the last acknowledgement (kept as an
 * audit event, so who acknowledged and when stays on record). Reads only.
 * @param coopId the actor's co-op
 * @param batchId only this batch (the batch page); all of the co-op's batches when omitted (the overview)
 */
export async function unacknowledgedDangers(coopId: number, batchId?: number): Promise<DangerAlert[]> {
  const where = { coopId, level: 'danger' as const, ...(batchId === undefined ? {} : { batchId }) };
  const readings = (await BatchTemperature.findAll({
    where,
    attributes: ['batchId', [fn('max', col('measured_at')), 'lastAt'], [fn('max', col('temp_c')), 'maxTempC']],
    group: ['batchId'],
    raw: true,
  })) as unknown as { batchId: number; lastAt: Date; maxTempC: string }[];
  if (!readings.length) return [];
  const ids = readings.map((r) => r.batchId);
  const [acks, batches] = await Promise.all([
    AuditEvent.findAll({
      where: { coopId, action: DANGER_ACK_ACTION, entityType: 'batch', entityId: ids.map(String) },
      attributes: ['entityId', [fn('max', col('created_at')), 'ackAt']],
      group: ['entityId'],
      raw: true,
    }) as unknown as Promise<{ entityId: string; ackAt: Date }[]>,
    Batch.findAll({
      where: { coopId, id: ids, status: { [Op.notIn]: ['released', 'rejected'] } },
      attributes: ['id', 'number'],
      raw: true,
    }),
  ]);
  const ackAt = new Map(acks.map((a) => [Number(a.entityId), new Date(a.ackAt).getTime()]));
  const numbers = new Map(batches.map((b) => [b.id, b.number]));
  return readings
    .filter((r) => numbers.has(r.batchId) && new Date(r.lastAt).getTime() > (ackAt.get(r.batchId) ?? -Infinity))
    .map((r) => ({
      batchId: r.batchId,
      number: numbers.get(r.batchId)!,
      maxTempC: Number(r.maxTempC),
      lastAt: new Date(r.lastAt).toISOString(),
    }))
    .sort((a, b) => a.number - b.number);
}

/**
 * A brewer acknowledges a batch's Danger readings (recorded in the audit log); the banner goes
 * until a new Danger reading.
 * @param actor brewer or admin
 * @param batchId the batch (another co-op's → 404)
 */
export async function acknowledgeDanger(
  actor: Actor,
  batchId: number,
): Promise<z.infer<typeof dangerAcknowledgedSchema>> {
  requireCan(actor, 'batches:write');
  const batch = await Batch.findOne({
    where: { id: batchId, coopId: actor.coop.id },
    attributes: ['id', 'number'],
    raw: true,
  });
  if (!batch) throw notFound('Batch not found.');
  const open = await unacknowledgedDangers(actor.coop.id, batchId);
  if (!open.length) throw conflict(`Batch ${batch.number} has no Danger reading to acknowledge.`);
  await audit({
    coopId: actor.coop.id,
    actorUserId: actor.user.id,
    action: DANGER_ACK_ACTION,
    entityType: 'batch',
    entityId: batchId,
    before: null,
    after: { maxTempC: open[0]!.maxTempC, lastAt: open[0]!.lastAt },
  });
  return { acknowledged: true };
}
