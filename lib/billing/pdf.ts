import 'server-only';
import type { InferAttributes } from 'sequelize';
import { appUrl } from '@/lib/mail';
import { formatCents, formatRateCents, INVOICE_ROUNDING_NOTE } from '@/lib/money';
import { newPdf, pdfResponse, pdfToBuffer } from '@/lib/pdf';
import type { Actor } from '@/lib/auth';
import { getInvoiceDetail } from './invoices';
import { formatVolume, perGallonToPerLiter } from '@/lib/units';
import type { Coop } from '@/models';
import { periodLabel } from './periods';
import { INVOICE_STATUS_LABEL } from './status';
import type { InvoiceDetail } from './types';
import { formatDate } from '@/lib/dates';

/** What an invoice PDF shows of its co-op. */
export type PdfCoop = Pick<InferAttributes<Coop>, 'name' | 'slug' | 'units' | 'currency' | 'timezone'>;

/** The rounding rule, stated once on every invoice (lib/money: half away from zero, per line). */
export const ROUNDING_NOTE = INVOICE_ROUNDING_NOTE;

/** The file name for downloads and attachments, e.g. prairie-lantern-INV-000012.pdf. */
export function invoiceFileName(coopSlug: string, inv: Pick<InvoiceDetail, 'label' | 'id' | 'period'>): string {
  return `${coopSlug}-${inv.label ?? `draft-${inv.period}-${inv.id}`}.pdf`;
}

/**
 * Renders an invoice or credit note with pdfkit and the shipped fonts: the co-op, the member,
 * the month, every line (quantities in the co-op's units, rates per gallon or litre), totals, and
 * how to pay. Drafts are marked DRAFT.
 */
export async function renderInvoicePdf(inv: InvoiceDetail, coop: PdfCoop): Promise<Buffer> {
  const isCredit = inv.kind === 'credit-note';
  const title = isCredit ? 'Credit note' : 'Invoice';
  const doc = newPdf({ title: `${coop.name} ${title} ${inv.label ?? 'draft'}` });
  const money = (c: number) => formatCents(c, coop.currency);
  const left = 50;
  const right = doc.page.width - 50;
  const width = right - left;

  if (inv.status === 'draft') {
    doc
      .save()
      .font('bold')
      .fontSize(90)
      .fillColor('#e7e5e4')
      .rotate(-30, { origin: [300, 420] })
      .text('DRAFT', 120, 380, { lineBreak: false })
      .restore();
    doc.fillColor('#1c1917');
  }

  // Header: co-op and document
  doc
    .font('bold')
    .fontSize(18)
    .fillColor('#16322a')
    .text(coop.name, left, 50, { width: width * 0.6 });
  doc
    .font('regular')
    .fontSize(9)
    .fillColor('#57534e')
    .text(`Community biodiesel co-op · ${appUrl(`/c/${coop.slug}`)}`, { width: width * 0.6 });
  doc.font('bold').fontSize(16).fillColor('#1c1917').text(title, left, 50, { width, align: 'right' });
  doc
    .font('regular')
    .fontSize(10)
    .text(inv.label ?? 'DRAFT — not yet issued', { width, align: 'right' });
  doc.text(`Status: ${INVOICE_STATUS_LABEL[inv.status] ?? inv.status}`, { width, align: 'right' });

  doc.moveDown(2);
  const metaTop = Math.max(doc.y, 120);
  doc.font('bold').fontSize(10).fillColor('#1c1917').text('Bill to', left, metaTop);
  doc.font('regular').text(inv.memberName).text(inv.memberEmail);
  const col2 = left + width / 2;
  doc.font('bold').text('Billing month', col2, metaTop);
  doc.font('regular').text(periodLabel(inv.period), col2);
  if (inv.issuedAt) doc.text(`Issued ${formatDate(inv.issuedAt, coop.timezone)}`, col2);
  if (inv.dueOn && !isCredit) doc.text(`Due ${formatDate(inv.dueOn, coop.timezone)}`, col2);
  if (isCredit && inv.original) doc.text(`Cancels invoice ${inv.original.label ?? ''}`, col2);

  // Lines
  doc.moveDown(2);
  const cols = { date: left, desc: left + 72, qty: left + 290, rate: left + 370, amount: left + 440 };
  const amountW = right - cols.amount;
  let y = Math.max(doc.y, metaTop + 80);
  const header = () => {
    doc.font('bold').fontSize(9).fillColor('#44403c');
    doc.text('Date', cols.date, y, { width: 70 });
    doc.text('Description', cols.desc, y, { width: 215 });
    doc.text('Quantity', cols.qty, y, { width: 75, align: 'right' });
    doc.text('Rate', cols.rate, y, { width: 65, align: 'right' });
    doc.text('Amount', cols.amount, y, { width: amountW, align: 'right' });
    y += 14;
    doc.moveTo(left, y).lineTo(right, y).strokeColor('#a8a29e').lineWidth(0.5).stroke();
    y += 5;
    doc.font('regular').fillColor('#1c1917');
  };
  header();
  const rateUnit = coop.units === 'us' ? '/gal' : '/L';
  for (const l of inv.lines) {
    const rate =
      l.unitPriceCentsPerGallon === null
        ? ''
        : `${formatRateCents(coop.units === 'us' ? l.unitPriceCentsPerGallon : perGallonToPerLiter(l.unitPriceCentsPerGallon), coop.currency)}${rateUnit}`;
    const h = Math.max(12, doc.heightOfString(l.description, { width: 215 }));
    if (y + h > doc.page.height - 150) {
      doc.addPage();
      y = 50;
      header();
    }
    doc.fontSize(9);
    doc.text(l.occurredAt ? formatDate(l.occurredAt, coop.timezone) : '', cols.date, y, { width: 70 });
    doc.text(l.description, cols.desc, y, { width: 215 });
    doc.text(l.quantityLiters === null ? '' : formatVolume(l.quantityLiters, coop.units, 2), cols.qty, y, {
      width: 75,
      align: 'right',
    });
    doc.text(rate, cols.rate, y, { width: 65, align: 'right' });
    doc.text(money(l.amountCents), cols.amount, y, { width: amountW, align: 'right' });
    y += h + 4;
  }
  doc.moveTo(left, y).lineTo(right, y).strokeColor('#a8a29e').lineWidth(0.5).stroke();
  y += 8;

  // Totals
  const totalRow = (label: string, cents: number, bold = false) => {
    doc.font(bold ? 'bold' : 'regular').fontSize(bold ? 11 : 10);
    doc.text(label, cols.qty - 60, y, { width: cols.amount - cols.qty + 50, align: 'right' });
    doc.text(money(cents), cols.amount, y, { width: amountW, align: 'right' });
    y += bold ? 17 : 14;
  };
  totalRow(isCredit ? 'Total credited' : 'Total', inv.totalCents, true);
  if (!isCredit && inv.status !== 'draft') {
    if (inv.paidCents > 0) totalRow('Paid', inv.paidCents);
    if (inv.status !== 'void') totalRow('Amount due', inv.outstandingCents, true);
  }

  // How to pay
  y += 12;
  doc
    .font('bold')
    .fontSize(10)
    .fillColor('#16322a')
    .text(isCredit ? 'About this credit note' : 'How to pay', left, y);
  doc.font('regular').fontSize(9).fillColor('#1c1917');
  if (isCredit) {
    doc.text(
      'This credit note cancels the invoice named above. Anything you had paid on it is held as credit on your account and applied to your next invoice, or refunded on request.',
      { width },
    );
  } else {
    doc.text(`By card: sign in at ${appUrl(`/c/${coop.slug}/invoices/${inv.id}`)} and choose “Pay by card”.`, {
      width,
    });
    doc.text(
      `By cash or cheque: hand it to the co-op's treasurer, or make the cheque payable to ${coop.name}, and write ${inv.label ?? 'the invoice number'} on it.`,
      { width },
    );
    doc.text('Credit on your account (for example from an earlier overpayment) has already been deducted above.', {
      width,
    });
  }
  doc.moveDown();
  doc.fontSize(8).fillColor('#57534e').text(`Amounts in ${coop.currency}. ${ROUNDING_NOTE}`, { width });
  return pdfToBuffer(doc);
}

/**
 * One invoice as a PDF download, with the render time as Server-Timing: for the treasurer any
 * invoice of the co-op (drafts marked DRAFT), for a member only their own issued ones.
 */
export async function invoicePdfResponse(actor: Actor, invoiceId: number, scope: 'co-op' | 'own'): Promise<Response> {
  const inv = await getInvoiceDetail(
    actor.coop.id,
    invoiceId,
    scope === 'co-op' ? { includeDrafts: true } : { membershipId: actor.membershipId, includeDrafts: false },
  );
  const t0 = performance.now();
  const res = pdfResponse(await renderInvoicePdf(inv, actor.coop), invoiceFileName(actor.coop.slug, inv));
  res.headers.set('server-timing', `pdf;dur=${(performance.now() - t0).toFixed(1)}`);
  return res;
}
