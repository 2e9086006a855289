import 'server-only';
import {
  col,
  fn,
  literal,
  Op,
  type Includeable,
  type InferAttributes,
  type Transaction,
  type WhereOptions,
} from 'sequelize';
import { notFound, invalidFields } from '@/lib/http';
import { Coop, Invoice, InvoiceLine, MemberCredit, Membership, Payment, PaymentAttempt, User } from '@/models';
import { cents } from './cents';
import { OPEN_STATUSES, openStatusSql, outstandingSql } from './status';
import { isPeriodClosed } from './locks';
import { todayIn } from '@/lib/dates';
import { numericOrNull } from '@/lib/units/quantity';
import { invoiceLabel, periodToDate } from './periods';
import type { InvoiceDetail, InvoiceStatus, InvoiceSummary, MemberBalance } from './types';
import type { Paged } from '@/lib/validation/list';
import { paymentsOfInvoice } from './payments-read';

type InvoiceWhere = WhereOptions<InferAttributes<Invoice>>;

/** The columns a summary shows. */
const SUMMARY_ATTRIBUTES = [
  'id',
  'kind',
  'number',
  'status',
  'period',
  'membershipId',
  'totalCents',
  'paidCents',
  'issuedAt',
  'dueOn',
  'emailStatus',
  'creditNoteForId',
] as const satisfies readonly (keyof InferAttributes<Invoice>)[];

/** What a summary joins: the member's name and e-mail, the co-op's time zone (for "overdue") and the credit note voiding it. */
const SUMMARY_INCLUDE: Includeable[] = [
  {
    model: Membership,
    as: 'membership',
    attributes: ['id'],
    include: [{ model: User, as: 'user', attributes: ['name', 'email'] }],
  },
  { model: Coop, as: 'coop', attributes: ['timezone'] },
  { model: Invoice, as: 'creditNote', attributes: ['id', 'number'] },
];

/** An invoice read with {@link SUMMARY_ATTRIBUTES} and {@link SUMMARY_INCLUDE}, as the lists show it. */
export function summaryOf(inv: Invoice): InvoiceSummary {
  const total = cents(inv.totalCents);
  const paid = cents(inv.paidCents);
  const open = inv.kind === 'invoice' && OPEN_STATUSES.includes(inv.status);
  const outstanding = open ? Math.max(total - paid, 0) : 0;
  const today = todayIn(inv.coop!.timezone);
  return {
    id: inv.id,
    kind: inv.kind,
    number: inv.number,
    label: invoiceLabel(inv.kind, inv.number),
    status: inv.status,
    period: String(inv.period).slice(0, 7),
    memberId: inv.membershipId,
    memberName: inv.membership!.user!.name,
    memberEmail: inv.membership!.user!.email,
    totalCents: total,
    paidCents: paid,
    outstandingCents: outstanding,
    issuedAt: inv.issuedAt ? new Date(inv.issuedAt).toISOString() : null,
    dueOn: inv.dueOn,
    overdue: outstanding > 0 && inv.dueOn !== null && inv.dueOn < today,
    emailStatus: inv.emailStatus,
    creditNoteForId: inv.creditNoteForId,
    creditNoteId: inv.creditNote?.id ?? null,
  };
}

const dirOf = (dir: 'asc' | 'desc') => (dir === 'asc' ? 'ASC' : 'DESC');
/**
 * The main table's alias in SQL is the model's class name, which a production build minifies:
 * expressions that must name it take it from the class at run time.
 */
const invoiceAlias = () => `"${Invoice.name}"`;
const SORTS = {
  number: () => 'number',
  member: () => fn('lower', col('membership->user.name')),
  total: () => 'totalCents',
  outstanding: () => {
    const i = invoiceAlias();
    return literal(`CASE WHEN ${openStatusSql(i)} THEN ${outstandingSql(i)} ELSE 0 END`);
  },
  status: () => 'status',
  period: () => 'period',
} as const;
export type InvoiceSort = keyof typeof SORTS;

/**
 * Invoices and credit notes of the co-op, filtered and paged on the server.
 * @param filter.period 'YYYY-MM'; filter.membershipId limits to one member (their own page)
 */
export async function listInvoices(
  coopId: number,
  filter: {
    period?: string;
    status?: InvoiceStatus | 'open';
    membershipId?: number;
    includeDrafts?: boolean;
    page: number;
    pageSize: number;
    sort: InvoiceSort;
    dir: 'asc' | 'desc';
  },
): Promise<Paged<InvoiceSummary>> {
  const and: InvoiceWhere[] = [{ coopId }];
  if (filter.period) and.push({ period: periodToDate(filter.period) });
  if (filter.status === 'open') and.push({ status: OPEN_STATUSES, kind: 'invoice' });
  else if (filter.status) and.push({ status: filter.status });
  if (filter.membershipId) and.push({ membershipId: filter.membershipId });
  if (!filter.includeDrafts) and.push({ status: { [Op.ne]: 'draft' } });
  const where = { [Op.and]: and };
  const dir = dirOf(filter.dir);
  const [rows, total] = await Promise.all([
    Invoice.findAll({
      where,
      attributes: [...SUMMARY_ATTRIBUTES],
      include: SUMMARY_INCLUDE,
      order: [
        [SORTS[filter.sort](), `${dir} NULLS LAST`],
        ['id', dir],
      ],
      limit: filter.pageSize,
      offset: (filter.page - 1) * filter.pageSize,
    }),
    Invoice.count({ where }),
  ]);
  return { rows: rows.map(summaryOf), total, page: filter.page, pageSize: filter.pageSize };
}

/**
 * One invoice with its lines, payments and card-attempt state. With `membershipId` only that
 * member's invoice is found (another's is a 404); drafts only for the treasurer.
 */
export async function getInvoiceDetail(
  coopId: number,
  id: number,
  opts: { membershipId?: number; includeDrafts: boolean },
): Promise<InvoiceDetail> {
  const and: InvoiceWhere[] = [{ id, coopId }];
  if (opts.membershipId) and.push({ membershipId: opts.membershipId });
  if (!opts.includeDrafts) and.push({ status: { [Op.ne]: 'draft' } });
  const inv = await Invoice.findOne({
    where: { [Op.and]: and },
    attributes: [...SUMMARY_ATTRIBUTES, 'voidReason', 'voidedAt', 'emailedAt', 'emailAttempts'],
    include: [...SUMMARY_INCLUDE, { model: Invoice, as: 'original', attributes: ['id', 'number'] }],
  });
  if (!inv) throw notFound('Invoice not found.');
  const [lines, payments, pending, failed, succeeded, periodClosed] = await Promise.all([
    InvoiceLine.findAll({
      where: { invoiceId: id, coopId },
      attributes: [
        'id',
        'kind',
        'description',
        'occurredAt',
        'quantityLiters',
        'unitPriceCentsPerGallon',
        'amountCents',
      ],
      order: [
        ['sortKey', 'ASC'],
        ['id', 'ASC'],
      ],
      raw: true,
    }),
    paymentsOfInvoice(coopId, id),
    PaymentAttempt.findOne({
      where: { invoiceId: id, coopId, status: 'pending' },
      attributes: ['id', 'createdAt'],
      raw: true,
    }),
    PaymentAttempt.findOne({
      where: { invoiceId: id, coopId, status: 'failed' },
      attributes: ['failureMessage', 'completedAt'],
      order: [['id', 'DESC']],
      raw: true,
    }),
    PaymentAttempt.count({ where: { invoiceId: id, coopId, status: 'succeeded' } }),
    isPeriodClosed(coopId, String(inv.period).slice(0, 10)),
  ]);
  return {
    ...summaryOf(inv),
    lines: lines.map((l) => ({
      id: String(l.id),
      kind: l.kind,
      description: l.description,
      occurredAt: l.occurredAt ? new Date(l.occurredAt).toISOString() : null,
      quantityLiters: numericOrNull(l.quantityLiters),
      unitPriceCentsPerGallon: numericOrNull(l.unitPriceCentsPerGallon),
      amountCents: cents(l.amountCents),
    })),
    payments,
    pendingAttempt: pending ? { id: pending.id, createdAt: new Date(pending.createdAt).toISOString() } : null,
    lastFailedAttempt:
      failed && succeeded === 0
        ? {
            message: failed.failureMessage ?? 'The card was declined.',
            at: new Date(failed.completedAt ?? Date.now()).toISOString(),
          }
        : null,
    voidReason: inv.voidReason,
    voidedAt: inv.voidedAt ? new Date(inv.voidedAt).toISOString() : null,
    creditNote: inv.creditNote
      ? { id: inv.creditNote.id, label: invoiceLabel('credit-note', inv.creditNote.number) }
      : null,
    original: inv.original ? { id: inv.original.id, label: invoiceLabel('invoice', inv.original.number) } : null,
    periodClosed,
    emailedAt: inv.emailedAt ? new Date(inv.emailedAt).toISOString() : null,
    emailAttempts: inv.emailAttempts,
  };
}

/**
 * Outstanding, credit and unmatched money of one member: three sums, read in parallel (one
 * after another inside a transaction, whose connection runs one statement at a time).
 */
export async function memberBalance(coopId: number, membershipId: number, t?: Transaction): Promise<MemberBalance> {
  const outstanding = async () => {
    const row = (await Invoice.findOne({
      attributes: [[fn('COALESCE', fn('SUM', literal(outstandingSql())), 0), 'outstanding']],
      where: { coopId, membershipId, kind: 'invoice', status: OPEN_STATUSES },
      raw: true,
      transaction: t,
    })) as unknown as { outstanding: string } | null;
    return cents(row?.outstanding);
  };
  const credit = async () =>
    cents(await MemberCredit.sum('amountCents', { where: { coopId, membershipId }, transaction: t }));
  const unallocated = async () =>
    cents(await Payment.sum('unallocatedCents', { where: { coopId, membershipId }, transaction: t }));
  const [outstandingCents, creditCents, unallocatedCents] = t
    ? [await outstanding(), await credit(), await unallocated()]
    : await Promise.all([outstanding(), credit(), unallocated()]);
  return { outstandingCents, creditCents, unallocatedCents };
}

/** Members of the co-op for the treasurer's pickers (payments, adjustments). */
export async function listMembersForBilling(
  coopId: number,
): Promise<{ id: number; name: string; email: string; status: string }[]> {
  const rows = await Membership.findAll({
    where: { coopId },
    attributes: ['id', 'status'],
    include: [{ model: User, as: 'user', attributes: ['name', 'email'] }],
    order: [
      [fn('lower', col('user.name')), 'ASC'],
      ['id', 'ASC'],
    ],
  });
  return rows.map((m) => ({ id: m.id, name: m.user!.name, email: m.user!.email, status: m.status }));
}

/** 422 unless the membership belongs to the co-op. */
export async function assertMember(coopId: number, membershipId: number, t?: Transaction): Promise<void> {
  const m = await Membership.findOne({ where: { id: membershipId, coopId }, attributes: ['id'], transaction: t });
  if (!m) throw invalidFields({ memberId: ['Choose a member of this co-op.'] });
}
