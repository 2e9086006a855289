import 'server-only';
import { csvRows } from '@/lib/csv';
import { formatCents } from '@/lib/money';
import { newPdf, pdfToBuffer } from '@/lib/pdf';
import { formatRate, perGallonToPerUnit } from '@/lib/tank/pricing-policy/convert';
import { formatVolume, volumeFromLiters, volumeLabel } from '@/lib/units';
import { VOLUME_COLUMNS, type QuarterlyReport, type VolumeRow } from './quarterly';

/** CSV: one row per month and a total row; volumes in the co-op's unit (3 decimals), money in dollars. */
export function quarterlyCsv(r: QuarterlyReport): string {
  const unit = volumeLabel(r.coop.units) === 'gal' ? 'us_gal' : 'l';
  const header = ['period', ...VOLUME_COLUMNS.map((c) => `${c.csv}_${unit}`), 'road_tax_collected', 'draws'];
  const line = (row: VolumeRow) => [
    row.period,
    ...VOLUME_COLUMNS.map((c) => volumeFromLiters(Number(row[c.key]), r.coop.units).toFixed(3)),
    (row.roadTaxCents / 100).toFixed(2),
    row.draws,
  ];
  return csvRows([header, ...r.months.map(line), line(r.total)]);
}

/** A one-page PDF of the quarterly volume report with the filing disclaimer. */
export async function quarterlyPdf(r: QuarterlyReport): Promise<Buffer> {
  const doc = newPdf({ title: `${r.coop.name} fuel volumes ${r.year} Q${r.quarter}` });
  doc.font('bold').fontSize(18).text(`Fuel volumes — ${r.year} Q${r.quarter}`);
  doc.font('regular').fontSize(11).fillColor('#444').text(r.coop.name).moveDown();
  const unit = volumeLabel(r.coop.units);
  const headers = ['Month', ...VOLUME_COLUMNS.map((c) => c.short), 'Road tax'];
  const widths = [70, 62, 62, 58, 58, 58, 62, 70];
  const rows = [...r.months, r.total].map((m) => [
    m.period,
    ...VOLUME_COLUMNS.map((c) => formatVolume(Number(m[c.key]), r.coop.units, 1)),
    formatCents(m.roadTaxCents),
  ]);
  let y = doc.y;
  const drawRow = (cells: string[], bold: boolean) => {
    let x = 50;
    doc
      .font(bold ? 'bold' : 'regular')
      .fontSize(9)
      .fillColor('#111');
    cells.forEach((c, i) => {
      doc.text(c, x, y, { width: widths[i]! - 4, align: i === 0 ? 'left' : 'right' });
      x += widths[i]!;
    });
    y += 18;
  };
  drawRow(headers, true);
  doc
    .moveTo(50, y - 4)
    .lineTo(550, y - 4)
    .strokeColor('#999')
    .stroke();
  rows.forEach((cells, i) => drawRow(cells, i === rows.length - 1));
  doc.x = 50;
  doc.y = y + 10;
  doc.font('regular').fontSize(9).fillColor('#333');
  doc.text(
    `Volumes in ${unit === 'gal' ? 'US gallons' : 'litres'}. Drawn volumes are net of reversing entries. Months are calendar months in ${r.coop.timezone}.`,
  );
  if (r.roadTaxCentsPerGallon)
    doc.text(
      `Road-fuel tax configured by the co-op: ${formatRate(perGallonToPerUnit(r.roadTaxCentsPerGallon, r.coop.units))} per ${r.coop.units === 'us' ? 'gallon' : 'litre'} on road use.`,
    );
  doc.moveDown().font('bold').text('Note').font('regular').text(r.disclaimer);
  return pdfToBuffer(doc);
}
