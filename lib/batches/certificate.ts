import 'server-only';
import { QueryTypes } from 'sequelize';
import { can, type Actor } from '@/lib/auth';
import { conflict, notFound } from '@/lib/http';
import { newPdf, pdfToBuffer } from '@/lib/pdf';
import { evaluateQuality, evaluateQuickTests, SCREENING_CAUTION } from '@/lib/quality';
import { SAFETY_DEFERENCE } from '@/lib/safety';
import { formatVolume, type UnitSystem } from '@/lib/units';
import { sequelize } from '@/models';
import { computePlan } from './plan';
import { loadBatchRow, quickTestInput, todayIn } from './records';

const VERDICT_TEXT = { pass: 'Pass', fail: 'Fail', 'not tested': 'Not tested', reported: 'Reported', 'screened-within': 'Within (screening)', 'screened-outside': 'Outside (screening)' } as const;
const SCREEN_TEXT = { 'looks-good': 'Looks good', 'needs-attention': 'Needs attention', recorded: 'Recorded', 'not tested': 'Not tested' } as const;

function fmtDate(d: Date | string, timezone: string): string {
  const date = typeof d === 'string' ? new Date(`${d}T12:00:00Z`) : d;
  try {
    return new Intl.DateTimeFormat('en-US', { timeZone: typeof d === 'string' ? 'UTC' : timezone, year: 'numeric', month: 'long', day: 'numeric' }).format(date);
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
  const row = await loadBatchRow(actor.coop.id, id);
  if (row.status !== 'released') {
    if (!can(actor.role, 'batches:read-all')) throw notFound('Batch not found.');
    throw conflict(`Batch ${row.number} is not released yet: certificates are for released batches.`);
  }
  const units: UnitSystem = actor.coop.units;
  const tz = actor.coop.timezone;
  const [lots, tank] = await Promise.all([
    sequelize.query<{ collected_from: string; collected_on: string; liters: string }>(
      `SELECT o.collected_from, o.collected_on, bol.liters FROM batch_oil_lots bol JOIN oil_lots o ON o.id = bol.oil_lot_id AND o.coop_id = bol.coop_id
        WHERE bol.batch_id = :id AND bol.coop_id = :coopId ORDER BY o.collected_on, o.id`,
      { replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ name: string }>(`SELECT name FROM tanks WHERE id = :tankId AND coop_id = :coopId`, {
      replacements: { tankId: row.tank_id, coopId: actor.coop.id }, type: QueryTypes.SELECT,
    }),
  ]);
  const plan = computePlan({
    oilLiters: Number(row.oil_liters),
    titration: { source: row.titration_source, trials: row.titration_trials_ml.map(Number), titrant: row.titrant },
    titrationBlankMl: Number(row.titration_blank_ml), catalyst: row.catalyst, baseGramsPerLiter: Number(row.base_g_per_l),
    purityPct: Number(row.purity_pct), titrantFrom: row.titrant_from, methanolMode: row.methanol_mode,
    methanolPct: row.methanol_pct === null ? undefined : Number(row.methanol_pct), molarRatio: row.molar_ratio === null ? undefined : Number(row.molar_ratio),
  });
  const quality = evaluateQuality(row.quality_standard, row.lab_results ?? {});
  const screening = evaluateQuickTests(quickTestInput(row.quick_tests ?? {}, row.catalyst));
  const catalystGrams = Number(row.actual_catalyst_grams ?? row.computed_catalyst_grams);
  const methanolLiters = Number(row.actual_methanol_liters ?? row.computed_methanol_liters);

  const doc = newPdf({ title: `Batch ${row.number} certificate — ${actor.coop.name}` });
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  doc.font('bold').fontSize(20).fillColor('#16322a').text(`Batch ${row.number} certificate`);
  doc.font('regular').fontSize(11).fillColor('#292524').text(actor.coop.name);
  doc.moveDown(0.8);

  const pair = (label: string, value: string) => {
    doc.font('bold').fontSize(10).text(`${label}: `, { continued: true }).font('regular').text(value);
  };
  doc.font('bold').fontSize(13).fillColor('#16322a').text('Batch');
  doc.fillColor('#292524');
  pair('Batch number', String(row.number));
  pair('Brewed', fmtDate(row.batch_date, tz));
  pair('Released', row.released_at ? fmtDate(row.released_at, tz) : '—');
  pair('Volume released', `${formatVolume(Number(row.released_liters), units, 1)}${units === 'us' ? ` (${Number(row.released_liters).toFixed(1)} L)` : ''}${tank[0] ? ` into ${tank[0].name}` : ''}`);
  doc.moveDown(0.6);

  doc.font('bold').fontSize(13).fillColor('#16322a').text('Inputs');
  doc.fillColor('#292524');
  pair('Oil', `${formatVolume(plan.oilLiters, units, 1)}${lots.length ? ` from ${lots.map((l) => `${l.collected_from} (${l.collected_on})`).join('; ')}` : ''}`);
  pair('Titration', `${plan.titration.trials.map((t) => t.toFixed(2)).join(', ')} mL → average ${plan.titration.averageMl.toFixed(2)} mL (${plan.titration.titrant} titrant)`);
  pair('Oil acidity', `acid number ${plan.oil.acidNumber.toFixed(2)} mg KOH/g, free fatty acids ${plan.oil.ffaPercent.toFixed(2)} % as oleic acid`);
  pair('Catalyst', `${catalystGrams.toFixed(0)} g ${row.catalyst} at ${Number(row.purity_pct)} % purity (planned ${Number(row.computed_catalyst_grams).toFixed(0)} g; ${plan.catalystResult.rule === 'base-over-purity-plus-titration' ? 'base ÷ purity + titration' : '(base + titration) ÷ purity'})`);
  pair('Methanol', `${formatVolume(methanolLiters, units, 2)}${plan.methanol.mode === 'percent' ? ` (${plan.methanol.pct} % of oil volume)` : ` (${plan.methanol.molarRatio}:1 molar ratio)`}`);
  doc.moveDown(0.6);

  doc.font('bold').fontSize(13).fillColor('#16322a').text(`Quality results compared with ${quality.standard} (B100 limits)`);
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
    rowText([r.label, r.limitText, r.value === null ? '—' : `${r.value}${r.unit ? ` ${r.unit}` : ''}`, VERDICT_TEXT[r.verdict]]);
  }
  doc.moveDown(0.3);
  doc.font('bold').fontSize(10).text(`Overall against ${quality.standard}: ${quality.overall === 'pass' ? 'pass (for the properties tested)' : quality.overall === 'fail' ? 'fail' : 'incomplete (no lab results)'}`);
  if (quality.untestedCount > 0) doc.font('regular').fontSize(9).text(`${quality.untestedCount} properties with a limit were not tested.`);
  doc.moveDown(0.6);

  doc.font('bold').fontSize(13).fillColor('#16322a').text('Home quick tests (screening)');
  doc.fillColor('#292524');
  for (const item of screening.items) pair(item.label, `${SCREEN_TEXT[item.status]} — ${item.detail}`);
  doc.moveDown(0.8);

  doc.font('bold').fontSize(10).fillColor('#93370d').text(SCREENING_CAUTION);
  doc.font('regular').fontSize(9).fillColor('#292524').text(
    `This certificate records the co-op's own batch record; it is not a laboratory's certificate of analysis. ${SAFETY_DEFERENCE}`,
  );
  doc.moveDown(0.5);
  doc.fontSize(8).fillColor('#57534e').text(`Issued ${fmtDate(todayIn(tz), tz)} by Tallyvat for ${actor.coop.name}.`);

  return { bytes: await pdfToBuffer(doc), filename: `batch-${row.number}-certificate.pdf` };
}
