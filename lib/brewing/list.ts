import 'server-only';
import type { z } from 'zod';
import type { batchRowSchema } from '@/lib/api/dto/brewing';
import { can, type Actor } from '@/lib/auth';
import { roundHalfUp } from '@/lib/money';
import { Batch, BatchStatusCount } from '@/models';
import type { BatchStatus } from '@/models/Batch';
import { numericOrNull } from '@/lib/units/quantity';
import { type BatchRecord } from './stored';
import { qualityOf } from './verdicts';

// The batch list: a page of the co-op's batches, sorted and filtered in SQL.

/** One row of the batch list. */
export type BatchListRow = z.infer<typeof batchRowSchema>;

/** Sort keys of the list → columns; every sort ends on the batch number (unique per co-op). */
const LIST_SORT: Record<string, keyof BatchRecord> = {
  number: 'number',
  date: 'batchDate',
  status: 'status',
  volume: 'releasedLiters',
  costPerGallon: 'costPerGallonCents',
};
const LIST_ATTRIBUTES = [
  'id',
  'number',
  'status',
  'batchDate',
  'oilLiters',
  'releasedLiters',
  'totalCostCents',
  'costPerGallonCents',
  'qualityStandard',
  'qualityVerdict',
  'screeningVerdict',
  'labResults',
] as const satisfies readonly (keyof BatchRecord)[];
const IN_PROGRESS: BatchStatus[] = ['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'];

type BatchListQuery = { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; status?: string };
type BatchListPage = { rows: BatchListRow[]; total: number; page: number; pageSize: number };

/**
 * A page of the co-op's batches, sorted and filtered in SQL (an index on (coop_id, number) or
 * (coop_id, batch_date, number) gives the order), with the total from the per-status counts the
 * batches' triggers keep (a few rows instead of counting the co-op's batches on every page); both
 * read in parallel. Members and treasurers see released batches only.
 */
export async function listBatches(actor: Actor, q: BatchListQuery): Promise<BatchListPage> {
  const all = can(actor.role, 'batches:read-all');
  if (!all && q.status && q.status !== 'released') return { rows: [], total: 0, page: q.page, pageSize: q.pageSize };
  const statuses = !all
    ? q.status
      ? ['released']
      : ['released', 'imported']
    : q.status === 'in-progress'
      ? IN_PROGRESS
      : q.status
        ? [q.status]
        : null;
  const where = statuses ? { coopId: actor.coop.id, status: statuses } : { coopId: actor.coop.id };
  const key = LIST_SORT[q.sort] ?? 'number';
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  // NOT NULL sort columns need no NULLS LAST, so the indexes give the order; volume and cost may be null.
  const order: [string, string][] =
    key === 'number'
      ? [['number', dir]]
      : key === 'batchDate' || key === 'status'
        ? [
            [key, dir],
            ['number', dir],
          ]
        : [
            [key, `${dir} NULLS LAST`],
            ['number', dir],
          ];
  const [rows, total] = await Promise.all([
    Batch.findAll({
      attributes: [...LIST_ATTRIBUTES],
      where,
      order,
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
      raw: true,
    }),
    BatchStatusCount.sum('n', { where }),
  ]);
  return {
    rows: rows.map((r) => {
      const releasedLiters = numericOrNull(r.releasedLiters);
      return {
        id: r.id,
        number: r.number,
        status: r.status,
        batchDate: r.batchDate,
        oilLiters: Number(r.oilLiters),
        releasedLiters,
        costPerGallonCents: numericOrNull(r.costPerGallonCents),
        costPerLiterCents:
          r.totalCostCents !== null && releasedLiters ? roundHalfUp(Number(r.totalCostCents) / releasedLiters) : null,
        qualityStandard: r.qualityStandard,
        screeningVerdict: r.screeningVerdict,
        // Judged from the results themselves (a verdict stored under an older rule is not trusted).
        ...(r.status === 'imported'
          ? // An imported batch has no results here, only the verdict recorded then.
            {
              qualityVerdict: r.qualityVerdict,
              qualityText:
                r.qualityVerdict === 'incomplete'
                  ? 'Not recorded'
                  : `${r.qualityVerdict === 'pass' ? 'Passed' : 'Failed'} (as recorded)`,
              qualityKind: r.qualityVerdict === 'fail' ? ('fails' as const) : ('screened' as const),
            }
          : ((v) => ({ qualityVerdict: v.overall, qualityText: v.text, qualityKind: v.kind }))(qualityOf(r))),
      };
    }),
    total: Number(total ?? 0),
    page: q.page,
    pageSize: q.pageSize,
  };
}
