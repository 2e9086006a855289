import 'server-only';
import type { InferAttributes } from 'sequelize';
import type { Batch } from '@/models';
import { lruMemo } from '@/lib/cache/lru-memo';
import { evaluateQuality, type QualityResults, type StandardVerdict } from '@/lib/quality';

type BatchRecord = InferAttributes<Batch>;

/** A batch's quality in the one wording (lib/quality evaluateQuality): "Meets …", "Fails: …" or "Screened — n of m …". */
export interface BatchQuality {
  text: string;
  kind: StandardVerdict['kind'];
}

const verdictMemo = lruMemo<Readonly<BatchQuality & { overall: 'pass' | 'fail' | 'incomplete' }>>(5_000);

/**
 * The one verdict of a stored batch, judged from its results (a verdict stored under an older
 * rule is not trusted). Used by the batch list and the overview; the batch page and the PDF take
 * the full evaluation from the same function.
 */
export function qualityOf(
  row: Pick<BatchRecord, 'qualityStandard' | 'labResults'>,
): Readonly<BatchQuality & { overall: 'pass' | 'fail' | 'incomplete' }> {
  // A list page judges 25 batches (≈ 35 µs each); the verdict depends on nothing but these two
  // columns, so each distinct pair is judged once per process.
  return verdictMemo(`${row.qualityStandard}\n${JSON.stringify(row.labResults ?? {})}`, () => {
    const e = evaluateQuality(row.qualityStandard, (row.labResults ?? {}) as QualityResults);
    return Object.freeze({ text: e.verdict.text, kind: e.verdict.kind, overall: e.overall });
  });
}
