import 'server-only';
import { can, type Actor } from '@/lib/auth';
import { conflict, notFound } from '@/lib/http';
import { newPdf, pdfToBuffer } from '@/lib/pdf';
import {
  evaluateQuality,
  evaluateQuickTests,
  formatQualityLimit,
  formatQualityValue,
  SCREENING_CAUTION,
} from '@/lib/quality';
import { SAFETY_DEFERENCE } from '@/lib/safety';
import { formatVolume, type UnitSystem } from '@/lib/units';
import { computePlan } from './plan';
import { batchOilLotShares, tankName } from './read';
import { labResultsOf, loadBatch, isBrewed, planInputOf, quickTestInput, quickTestsOf } from './stored';
import { todayIn } from '@/lib/dates';

const VERDICT_TEXT = {
  pass: 'Pass',
  fail: 'Fail',
  'not tested': 'Not tested',
  reported: 'Reported',
  'screened-within': 'Within (screening)',
  'screened-outside': 'Outside (screening)',
} as const;
const SCREEN_TEXT = {
  'looks-good': 'Looks good',
  'needs-attention': 'Needs attention',
  recorded: 'Recorded',
  'not tested': 'Not tested',
} as const;

function fmtDate(d: Date | string, timezone: string): string {
  const date = typeof d === 'string' ? new Date(`${d}T12:00:00Z`) : d;
  try {
    return new Intl.DateTimeFormat('en-US', {
      timeZone: typeof d === 'string' ? 'UTC' : timezone,
      year: 'numeric',
      month: 'long',
      day: 'numeric',
    }).format(date);
  } catch {
    return date.toISOString().slice(0, 10);
  }
}

/**
 * The batch certificate as a PDF (pdfkit with the shipped fonts): batch number and dates, the
 * inputs, the quality results against the named standard, the home-test screening results and
 * the caution that home tests are screening only. Released batches only: for members another
 * batch is a 404, for brewers and admins a 409.
 * @returns the PDF bytes and a file name
 */
export async function batchCertificate(actor: Actor, id: number): Promise<{ bytes: Buffer; filename: string }> {
  const row = await loadBatch(actor.coop.id, id);
  if (row.status !== 'released' || !isBrewed(row)) {
    if (!can(actor.role, 'batches:read-all')) throw notFound('Batch not found.');
    throw conflict(`Batch ${row.number} is not released yet: certificates are for released batches.`);
  }
  const units: UnitSystem = actor.coop.units;
  const tz = actor.coop.timezone;
  const [lots, tank] = await Promise.all([batchOilLotShares(actor.coop.id, id), tankName(actor.coop.id, row.tankId)]);
  const plan = computePlan(planInputOf(row), {}, { system: actor.coop.units });
  const quality = evaluateQuality(row.qualityStandard, labResultsOf(row));
  const screening = evaluateQuickTests(quickTestInput(quickTestsOf(row), row.catalyst));
  const catalystGrams = Number(row.actualCatalystGrams ?? row.computedCatalystGrams);
  const methanolLiters = Number(row.actualMethanolLiters ?? row.computedMethanolLiters);

  // A certificate only when the standard is met in full by laboratory results; otherwise a batch quality record.
  const meets = quality.verdict.kind === 'meets';
  const kind = meets ? `certificate (${quality.standard})` : 'quality record';
  const doc = newPdf({ title: `Batch ${row.number} ${kind} — ${actor.coop.name}` });
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  doc
    .font('bold')
    .fontSize(20)
    .fillColor('#16322a')
    .text(meets ? `Batch ${row.number} certificate — meets ${quality.standard}` : `Batch ${row.number} quality record`);
  doc.font('regular').fontSize(11).fillColor('#292524').text(actor.coop.name);
  doc.moveDown(0.8);

  const pair = (label: string, value: string) => {
    doc.font('bold').fontSize(10).text(`${label}: `, { continued: true }).font('regular').text(value);
  };
  doc.font('bold').fontSize(13).fillColor('#16322a').text('Batch');
  doc.fillColor('#292524');
  pair('Batch number', String(row.number));
  pair('Brewed', fmtDate(row.batchDate, tz));
  pair('Released', row.releasedAt ? fmtDate(row.releasedAt, tz) : '—');
  pair(
    'Volume released',
    `${formatVolume(Number(row.releasedLiters), units, 1)}${units === 'us' ? ` (${Number(row.releasedLiters).toFixed(1)} L)` : ''}${tank ? ` into ${tank}` : ''}`,
  );
  doc.moveDown(0.6);

  doc.font('bold').fontSize(13).fillColor('#16322a').text('Inputs');
  doc.fillColor('#292524');
  pair(
    'Oil',
    `${formatVolume(plan.oilLiters, units, 1)}${lots.length ? ` from ${lots.map((l) => `${l.oilLot.collectedFrom} (${l.oilLot.collectedOn})`).join('; ')}` : ''}`,
  );
  pair(
    'Titration',
    `${plan.titration.trials.map((t) => t.toFixed(2)).join(', ')} mL → average ${plan.titration.averageMl.toFixed(2)} mL (${plan.titration.titrant} titrant)`,
  );
  pair(
    'Oil acidity',
    `acid number ${plan.oil.acidNumber.toFixed(2)} mg KOH/g, free fatty acids ${plan.oil.ffaPercent.toFixed(2)} % as oleic acid`,
  );
  pair(
    'Catalyst',
    `${catalystGrams.toFixed(0)} g ${row.catalyst} at ${Number(row.purityPct)} % purity (planned ${Number(row.computedCatalystGrams).toFixed(0)} g; ${plan.catalystResult.rule === 'base-over-purity-plus-titration' ? 'base ÷ purity + titration' : '(base + titration) ÷ purity'})`,
  );
  pair(
    'Methanol',
    `${formatVolume(methanolLiters, units, 2)}${plan.methanol.mode === 'percent' ? ` (${plan.methanol.pct} % of oil volume)` : ` (${plan.methanol.molarRatio}:1 molar ratio)`}`,
  );
  doc.moveDown(0.6);

  doc
    .font('bold')
    .fontSize(13)
    .fillColor('#16322a')
    .text(`Quality results compared with ${quality.standard} (B100 limits)`);
  doc.fillColor('#292524').moveDown(0.2);
  const cols = [0.38, 0.24, 0.2, 0.18].map((f) => f * width);
  const rowText = (cells: string[], bold = false) => {
    const y = doc.y;
    let x = left;
    let h = 0;
    doc.font(bold ? 'bold' : 'regular').fontSize(9);
    cells.forEach((c, i) => {
      doc.text(c, x, y, { width: cols[i]! - 6 });
      h = Math.max(h, doc.y - y);
      x += cols[i]!;
    });
    doc.x = left;
    doc.y = y + h + 3;
  };
  rowText(['Property', `Limit (${quality.standard})`, 'Result', 'Verdict'], true);
  for (const r of quality.rows) {
    rowText([
      r.label,
      formatQualityLimit(r, units),
      formatQualityValue(r, units),
      `${VERDICT_TEXT[r.verdict]}${r.laboratory ? ` (${r.laboratory}${r.date ? `, ${r.date}` : ''})` : ''}`,
    ]);
  }
  doc.moveDown(0.3);
  doc.font('bold').fontSize(10).text(`${quality.standard}: ${quality.verdict.text}`);
  if (quality.untestedCount > 0)
    doc
      .font('regular')
      .fontSize(9)
      .text(
        `${quality.untestedCount} of ${quality.verdict.requiredCount} required properties have no laboratory result.`,
      );
  doc.moveDown(0.6);

  doc.font('bold').fontSize(13).fillColor('#16322a').text('Home quick tests (screening)');
  doc.fillColor('#292524');
  for (const item of screening.items) pair(item.label, `${SCREEN_TEXT[item.status]} — ${item.detail}`);
  doc.moveDown(0.8);

  doc.font('bold').fontSize(10).fillColor('#93370d').text(SCREENING_CAUTION);
  doc
    .font('regular')
    .fontSize(9)
    .fillColor('#292524')
    .text(
      `This ${meets ? 'certificate' : 'quality record'} is the co-op's own batch record; it is not a laboratory's certificate of analysis. ${SAFETY_DEFERENCE}`,
    );
  doc.moveDown(0.5);
  doc
    .fontSize(8)
    .fillColor('#57534e')
    .text(`Issued ${fmtDate(todayIn(tz), tz)} by Tallyvat for ${actor.coop.name}.`);

  return {
    bytes: await pdfToBuffer(doc),
    filename: `batch-${row.number}-${meets ? 'certificate' : 'quality-record'}.pdf`,
  };
}
