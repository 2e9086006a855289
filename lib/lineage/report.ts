import 'server-only';
import type { z } from 'zod';
import type { recallReportSchema } from '@/lib/api/dto/lineage';
import type { Actor } from '@/lib/auth';
import { csvRows } from '@/lib/csv';
import { formatCents } from '@/lib/money';
import { newPdf, pdfToBuffer } from '@/lib/pdf';
import { RECALL_DEFERENCE } from '@/lib/safety';
import { formatMl } from '@/lib/tank/volume';
import { getBatchLineage } from './read';

const OUTCOME = { cleared: 'Cleared', retreated: 'Re-treated', disposed: 'Disposed of' } as const;

/** A batch's lineage as the co-op's dated report: the API's RecallReport. */
export type RecallReport = z.infer<typeof recallReportSchema>;

/**
 * The recall report of a batch: the batch, each review's finding and outcome, what was held, and
 * every affected draw and member (brewers, treasurers, admins: lineage:read).
 */
export async function getRecallReport(actor: Actor, batchId: number): Promise<RecallReport> {
  return {
    ...(await getBatchLineage(actor, batchId)),
    coopName: actor.coop.name,
    generatedAt: new Date().toISOString(),
  };
}

const vol = (r: RecallReport, ml: number) => formatMl(ml, r.units);

/** CSV: one section per kind of row (review, draw, member, tank), in the co-op's unit; money in currency units. */
export function recallCsv(r: RecallReport): string {
  const unit = r.units === 'us' ? 'us_gal' : 'l';
  const q = (ml: number) => (r.units === 'us' ? ml / 3785.411784 : ml / 1000).toFixed(3);
  const rows: (string | number | null)[][] = [
    ['section', 'batch', 'date', 'id', 'name', 'detail', `quantity_${unit}`, 'value', 'outcome'],
  ];
  for (const v of r.reviews) {
    rows.push([
      'review',
      r.number,
      v.openedAt,
      v.id,
      v.cause,
      v.finding,
      q(v.heldLiters * 1000),
      null,
      v.outcome ?? 'open',
    ]);
    if (v.outcome)
      rows.push([
        'outcome',
        r.number,
        v.closedAt,
        v.id,
        OUTCOME[v.outcome],
        [v.outcomeNotes, v.disposalMethod].filter(Boolean).join(' — '),
        null,
        null,
        v.outcome,
      ]);
  }
  for (const d of r.draws)
    rows.push([
      'draw',
      r.number,
      d.occurredAt,
      d.drawId,
      d.memberName,
      d.isReversal ? `reversal at ${d.tankName}` : d.tankName,
      q(d.batchMl),
      (d.valueCents / 100).toFixed(2),
      null,
    ]);
  for (const m of r.members)
    rows.push([
      'member',
      r.number,
      null,
      m.membershipId,
      m.name,
      m.email,
      q(m.batchMl),
      (m.valueCents / 100).toFixed(2),
      null,
    ]);
  for (const t of r.inTanks)
    rows.push([
      'in-tank',
      r.number,
      null,
      t.tankId,
      t.tankName,
      t.mixing === 'fifo' ? 'first in, first out' : 'well mixed',
      q(t.ml),
      null,
      null,
    ]);
  return csvRows(rows);
}

/** A PDF of the recall report. */
export async function recallPdf(r: RecallReport): Promise<Buffer> {
  const doc = newPdf({ title: `${r.coopName} recall report — batch ${r.number}` });
  doc.font('bold').fontSize(18).text(`Recall report — batch ${r.number}`);
  doc
    .font('regular')
    .fontSize(10)
    .fillColor('#444')
    .text(`${r.coopName} · generated ${r.generatedAt.slice(0, 10)}`)
    .moveDown();
  doc.fillColor('#111');
  const h = (s: string) => doc.moveDown(0.5).font('bold').fontSize(12).text(s).font('regular').fontSize(10);
  h('Reviews');
  if (r.reviews.length === 0) doc.text('This batch has not been under review.');
  for (const v of r.reviews) {
    doc.text(
      `Opened ${v.openedAt.slice(0, 10)} (${v.cause === 'lab-result' ? 'late laboratory result' : 'flagged'}): ${v.finding}`,
    );
    doc.text(`Held when opened: ${vol(r, v.heldLiters * 1000)}.`);
    doc.text(
      v.outcome
        ? `Closed ${v.closedAt?.slice(0, 10)}: ${OUTCOME[v.outcome]}. ${v.outcomeNotes ?? ''}${v.disposalMethod ? ` Method: ${v.disposalMethod}.` : ''}${v.retreatBatchId ? ` Re-treated in batch id ${v.retreatBatchId}.` : ''}`
        : 'Still open: the batch’s fuel is held.',
    );
  }
  h('Where the fuel is now');
  if (r.inTanks.length === 0) doc.text('None of this batch is left in a tank.');
  for (const t of r.inTanks)
    doc.text(`${t.tankName}: ${vol(r, t.ml)} (${t.mixing === 'fifo' ? 'first in, first out' : 'well mixed'})`);
  h(`Members who drew it (${r.members.length})`);
  for (const m of r.members)
    doc.text(`${m.name} <${m.email}> — ${vol(r, m.batchMl)}, fuel charge ${formatCents(m.valueCents)}`);
  h(`Draws (${r.draws.length})`);
  for (const d of r.draws)
    doc.text(
      `#${d.drawId} ${d.occurredAt.slice(0, 10)} ${d.memberName} at ${d.tankName}: ${vol(r, d.batchMl)} of this batch${d.isReversal ? ' (reversal)' : ''}`,
    );
  doc
    .moveDown()
    .font('bold')
    .text('Note')
    .font('regular')
    .text(
      `Volumes per draw follow the tank's mixing model (well mixed: in proportion; first in, first out: oldest fuel first), so they are the co-op's best estimate, not a measurement. ${RECALL_DEFERENCE}`,
    );
  return pdfToBuffer(doc);
}
