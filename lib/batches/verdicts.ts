import 'server-only';
import type { InferAttributes } from 'sequelize';
import { Batch } from '@/models';
import { evaluateQuality, type QualityResults, type StandardVerdict } from '@/lib/quality';

type BatchRecord = InferAttributes<Batch>;

/** A batch's quality in the one wording (lib/quality evaluateQuality): "Meets …", "Fails: …" or "Screened — n of m …". */
export interface BatchQuality {
  text: string;
  kind: StandardVerdict['kind'];
}

/**
 * The one verdict of a stored batch, judged from its results (a verdict stored under an older
 * rule is not trusted). Used by the batch list and the overview; the batch page and the PDF take
 * the full evaluation from the same function.
 */
export function qualityOf(row: Pick<BatchRecord, 'qualityStandard' | 'labResults'>): BatchQuality & { overall: 'pass' | 'fail' | 'incomplete' } {
  const e = evaluateQuality(row.qualityStandard, (row.labResults ?? {}) as QualityResults);
  return { text: e.verdict.text, kind: e.verdict.kind, overall: e.overall };
}

/** One of the latest released batches, for the overview. */
export interface ReleasedQuality {
  id: number;
  number: number;
  releasedAt: string;
  releasedLiters: number;
  quality: BatchQuality;
}

/**
 * Quality verdicts for the overview's brewing section: the batches under way (the same ten the
 * overview lists: `working` statuses, by number) and the latest `releasedCount` released batches.
 * Two indexed reads (batches_coop_status_number) run together, with only the columns the verdict
 * needs: no query per batch. Reads only.
 * @param coopId the actor's co-op
 * @param working the statuses counted as under way
 * @param releasedCount how many released batches, newest first
 */
export async function overviewQuality(coopId: number, working: readonly string[], releasedCount = 3): Promise<{ working: Map<number, BatchQuality>; released: ReleasedQuality[] }> {
  const [under, released] = await Promise.all([
    Batch.findAll({ attributes: ['id', 'qualityStandard', 'labResults'], where: { coopId, status: [...working] as BatchRecord['status'][] }, order: [['number', 'ASC']], limit: 10, raw: true }),
    Batch.findAll({
      attributes: ['id', 'number', 'releasedAt', 'releasedLiters', 'qualityStandard', 'labResults'],
      where: { coopId, status: 'released' }, order: [['number', 'DESC']], limit: releasedCount, raw: true,
    }),
  ]);
  const pick = ({ text, kind }: BatchQuality) => ({ text, kind });
  return {
    working: new Map(under.map((r) => [r.id, pick(qualityOf(r))])),
    released: released.map((r) => ({
      id: r.id, number: r.number, releasedAt: new Date(r.releasedAt ?? 0).toISOString(), releasedLiters: Number(r.releasedLiters ?? 0), quality: pick(qualityOf(r)),
    })),
  };
}
