import 'server-only';
import { col, fn, literal, Op, type InferAttributes } from 'sequelize';
import { Invoice, MemberCredit, Membership, Payment, User } from '@/models';
import { cents } from './cents';
import { csvRows, type CsvValue } from '@/lib/csv';
import { isoDay } from '@/lib/dates';
import { centsToDecimal } from './csv';
import { OPEN_STATUSES, outstandingSql } from './status';
import { invoiceLabel, periodToDate } from './periods';
import { INVOICE_STATUS_LABEL, METHOD_LABEL } from './status';
import type { InvoiceKind } from './types';

export type ExportKind = 'invoices' | 'payments' | 'balances';

/** A payment row of the export, as read raw and nested. */
type PaymentExportRow = Pick<
  InferAttributes<Payment>,
  | 'id'
  | 'receivedOn'
  | 'method'
  | 'reference'
  | 'amountCents'
  | 'appliedCents'
  | 'creditedCents'
  | 'unallocatedCents'
  | 'refundedCents'
  | 'stripeChargeId'
  | 'note'
> & {
  membership: { user: Pick<InferAttributes<User>, 'name'> };
  invoice: { number: number | null; kind: InvoiceKind | null };
};

/** Sums per member, keyed by membership id (raw grouped rows). */
async function sumsByMember(rows: Promise<unknown[]>): Promise<Map<number, number>> {
  return new Map(
    ((await rows) as { membershipId: number; s: string | null }[]).map((r) => [r.membershipId, cents(r.s)]),
  );
}

/**
 * The accountant's exports for a month: invoices (with credit notes), payments received, or a
 * balance summary per member. Amounts are decimals in the co-op's currency.
 */
export async function buildCsv(coopId: number, kind: ExportKind, period: string, timeZone: string): Promise<string> {
  const periodDate = periodToDate(period);
  if (kind === 'invoices') {
    const rows = await Invoice.findAll({
      where: { coopId, period: periodDate, status: { [Op.ne]: 'draft' } },
      attributes: ['kind', 'number', 'period', 'status', 'issuedAt', 'dueOn', 'totalCents', 'paidCents', 'emailStatus'],
      include: [
        {
          model: Membership,
          as: 'membership',
          attributes: ['id'],
          include: [{ model: User, as: 'user', attributes: ['name', 'email'] }],
        },
        { model: Invoice, as: 'original', attributes: ['number'] },
      ],
      order: [['number', 'ASC']],
    });
    const out: CsvValue[][] = [
      [
        'number',
        'type',
        'month',
        'member',
        'email',
        'status',
        'issued_on',
        'due_on',
        'total',
        'paid',
        'outstanding',
        'cancels',
        'email_status',
      ],
    ];
    for (const r of rows) {
      const total = cents(r.totalCents);
      const paid = cents(r.paidCents);
      const outstanding = r.kind === 'invoice' && OPEN_STATUSES.includes(r.status) ? Math.max(total - paid, 0) : 0;
      out.push([
        invoiceLabel(r.kind, r.number),
        r.kind === 'invoice' ? 'invoice' : 'credit note',
        String(r.period).slice(0, 7),
        r.membership!.user!.name,
        r.membership!.user!.email,
        INVOICE_STATUS_LABEL[r.status] ?? r.status,
        r.issuedAt ? isoDay(r.issuedAt, timeZone) : null,
        r.dueOn,
        centsToDecimal(total),
        centsToDecimal(paid),
        centsToDecimal(outstanding),
        r.original?.number ? invoiceLabel('invoice', r.original.number) : '',
        r.emailStatus,
      ]);
    }
    return csvRows(out);
  }
  if (kind === 'payments') {
    const rows = (await Payment.findAll({
      where: { coopId, period: periodDate },
      attributes: [
        'id',
        'receivedOn',
        'method',
        'reference',
        'amountCents',
        'appliedCents',
        'creditedCents',
        'unallocatedCents',
        'refundedCents',
        'stripeChargeId',
        'note',
      ],
      include: [
        {
          model: Membership,
          as: 'membership',
          attributes: [],
          include: [{ model: User, as: 'user', attributes: ['name'] }],
        },
        { model: Invoice, as: 'invoice', attributes: ['number', 'kind'] },
      ],
      order: [
        ['receivedOn', 'ASC'],
        ['id', 'ASC'],
      ],
      raw: true,
      nest: true,
    })) as unknown as PaymentExportRow[];
    const out: CsvValue[][] = [
      [
        'payment_id',
        'received_on',
        'member',
        'method',
        'reference',
        'invoice',
        'amount',
        'applied',
        'held_as_credit',
        'unmatched',
        'refunded',
        'card_charge',
        'note',
      ],
    ];
    for (const r of rows) {
      out.push([
        String(r.id),
        r.receivedOn,
        r.membership.user.name,
        METHOD_LABEL[r.method] ?? r.method,
        r.reference,
        r.invoice.kind && r.invoice.number ? invoiceLabel(r.invoice.kind, r.invoice.number) : '',
        centsToDecimal(cents(r.amountCents)),
        centsToDecimal(cents(r.appliedCents)),
        centsToDecimal(cents(r.creditedCents)),
        centsToDecimal(cents(r.unallocatedCents)),
        centsToDecimal(cents(r.refundedCents)),
        r.stripeChargeId,
        r.note,
      ]);
    }
    return csvRows(out);
  }
  const billed = { coopId, kind: 'invoice' as const };
  const byMember = { group: ['membershipId'], raw: true as const };
  const [members, invoiced, paid, outstanding, credit, unmatched] = await Promise.all([
    Membership.findAll({
      where: { coopId },
      attributes: ['id', 'status'],
      include: [{ model: User, as: 'user', attributes: ['name', 'email'] }],
      order: [
        [fn('lower', col('user.name')), 'ASC'],
        ['id', 'ASC'],
      ],
    }),
    sumsByMember(
      Invoice.findAll({
        ...byMember,
        attributes: ['membershipId', [fn('SUM', col('total_cents')), 's']],
        where: { ...billed, period: periodDate, status: { [Op.notIn]: ['draft', 'void'] } },
      }),
    ),
    sumsByMember(
      Invoice.findAll({
        ...byMember,
        attributes: ['membershipId', [fn('SUM', col('paid_cents')), 's']],
        where: { ...billed, period: periodDate, status: { [Op.notIn]: ['draft', 'void'] } },
      }),
    ),
    sumsByMember(
      Invoice.findAll({
        ...byMember,
        attributes: ['membershipId', [fn('SUM', literal(outstandingSql())), 's']],
        where: { ...billed, status: OPEN_STATUSES },
      }),
    ),
    sumsByMember(
      MemberCredit.findAll({
        ...byMember,
        attributes: ['membershipId', [fn('SUM', col('amount_cents')), 's']],
        where: { coopId },
      }),
    ),
    sumsByMember(
      Payment.findAll({
        ...byMember,
        attributes: ['membershipId', [fn('SUM', col('unallocated_cents')), 's']],
        where: { coopId },
      }),
    ),
  ]);
  const out: CsvValue[][] = [
    [
      'member',
      'email',
      'membership',
      'invoiced_this_month',
      'paid_on_this_month',
      'outstanding_all_months',
      'credit',
      'unmatched_payments',
      'balance_owed',
    ],
  ];
  for (const m of members) {
    const [inv, pd, os, cr, un] = [invoiced, paid, outstanding, credit, unmatched].map(
      (sums) => sums.get(m.id) ?? 0,
    ) as [number, number, number, number, number];
    out.push([
      m.user!.name,
      m.user!.email,
      m.status,
      centsToDecimal(inv),
      centsToDecimal(pd),
      centsToDecimal(os),
      centsToDecimal(cr),
      centsToDecimal(un),
      centsToDecimal(os - cr - un),
    ]);
  }
  return csvRows(out);
}

/** A CSV download with a safe file name. */
export function csvResponse(csv: string, filename: string): Response {
  const safe = filename.replace(/[^A-Za-z0-9._-]/g, '_');
  return new Response(`\uFEFF${csv}`, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${safe}"`,
      'cache-control': 'private, no-store',
    },
  });
}
