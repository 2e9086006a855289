import 'server-only';
import { centsToDecimal, csvCell } from './csv';
import { int, select } from './db';
import { invoiceLabel, periodToDate } from './periods';
import { INVOICE_STATUS_LABEL, METHOD_LABEL } from './status';

export type ExportKind = 'invoices' | 'payments' | 'balances';

const line = (cells: string[]) => `${cells.join(',')}\r\n`;

/**
 * The accountant's exports for a month: invoices (with credit notes), payments received, or a
 * balance summary per member. Amounts are decimals in the co-op's currency.
 */
export async function buildCsv(coopId: number, kind: ExportKind, period: string): Promise<string> {
  const b = { coopId, period: periodToDate(period) };
  if (kind === 'invoices') {
    const rows = await select<Record<string, string | number | null>>(
      `SELECT i.kind, i.number, to_char(i.period, 'YYYY-MM') AS period, u.name, u.email, i.status, to_char(i.issued_at, 'YYYY-MM-DD') AS issued_on,
              to_char(i.due_on, 'YYYY-MM-DD') AS due_on, i.total_cents, i.paid_cents,
              CASE WHEN i.kind = 'invoice' AND i.status IN ('issued','partly-paid') THEN GREATEST(i.total_cents - i.paid_cents, 0) ELSE 0 END AS outstanding,
              o.number AS original_number, i.email_status
       FROM invoices i JOIN memberships m ON m.id = i.membership_id JOIN users u ON u.id = m.user_id LEFT JOIN invoices o ON o.id = i.credit_note_for_id
       WHERE i.coop_id = $coopId AND i.period = $period::date AND i.status <> 'draft' ORDER BY i.number`,
      b,
    );
    let out = line(['number', 'type', 'month', 'member', 'email', 'status', 'issued_on', 'due_on', 'total', 'paid', 'outstanding', 'cancels', 'email_status']);
    for (const r of rows) {
      const k = r.kind as 'invoice' | 'credit-note';
      out += line([
        csvCell(invoiceLabel(k, Number(r.number))), k === 'invoice' ? 'invoice' : 'credit note', csvCell(r.period as string), csvCell(r.name as string), csvCell(r.email as string),
        csvCell(INVOICE_STATUS_LABEL[String(r.status)] ?? String(r.status)), csvCell(r.issued_on as string), csvCell(r.due_on as string),
        centsToDecimal(int(r.total_cents)), centsToDecimal(int(r.paid_cents)), centsToDecimal(int(r.outstanding)),
        csvCell(r.original_number ? invoiceLabel('invoice', Number(r.original_number)) : ''), csvCell(r.email_status as string),
      ]);
    }
    return out;
  }
  if (kind === 'payments') {
    const rows = await select<Record<string, string | number | null>>(
      `SELECT p.id, to_char(p.received_on, 'YYYY-MM-DD') AS received_on, u.name, p.method, p.reference, i.number AS inv_number, i.kind AS inv_kind,
              p.amount_cents, p.applied_cents, p.credited_cents, p.unallocated_cents, p.refunded_cents, p.stripe_charge_id, p.note
       FROM payments p JOIN memberships m ON m.id = p.membership_id JOIN users u ON u.id = m.user_id LEFT JOIN invoices i ON i.id = p.invoice_id
       WHERE p.coop_id = $coopId AND p.period = $period::date ORDER BY p.received_on, p.id`,
      b,
    );
    let out = line(['payment_id', 'received_on', 'member', 'method', 'reference', 'invoice', 'amount', 'applied', 'held_as_credit', 'unmatched', 'refunded', 'card_charge', 'note']);
    for (const r of rows) {
      out += line([
        String(r.id), csvCell(r.received_on as string), csvCell(r.name as string), METHOD_LABEL[String(r.method)] ?? String(r.method), csvCell(r.reference as string | null),
        csvCell(r.inv_number ? invoiceLabel(r.inv_kind as 'invoice', Number(r.inv_number)) : ''),
        centsToDecimal(int(r.amount_cents)), centsToDecimal(int(r.applied_cents)), centsToDecimal(int(r.credited_cents)),
        centsToDecimal(int(r.unallocated_cents)), centsToDecimal(int(r.refunded_cents)), csvCell(r.stripe_charge_id as string | null), csvCell(r.note as string | null),
      ]);
    }
    return out;
  }
  const rows = await select<Record<string, string | number | null>>(
    `SELECT u.name, u.email, m.status,
       (SELECT COALESCE(SUM(total_cents), 0) FROM invoices i WHERE i.membership_id = m.id AND i.coop_id = $coopId AND i.period = $period::date AND i.kind = 'invoice' AND i.status NOT IN ('draft','void')) AS invoiced,
       (SELECT COALESCE(SUM(paid_cents), 0) FROM invoices i WHERE i.membership_id = m.id AND i.coop_id = $coopId AND i.period = $period::date AND i.kind = 'invoice' AND i.status NOT IN ('draft','void')) AS paid,
       (SELECT COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)), 0) FROM invoices i WHERE i.membership_id = m.id AND i.coop_id = $coopId AND i.kind = 'invoice' AND i.status IN ('issued','partly-paid')) AS outstanding,
       (SELECT COALESCE(SUM(amount_cents), 0) FROM member_credits c WHERE c.membership_id = m.id AND c.coop_id = $coopId) AS credit,
       (SELECT COALESCE(SUM(unallocated_cents), 0) FROM payments p WHERE p.membership_id = m.id AND p.coop_id = $coopId) AS unmatched
     FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.coop_id = $coopId ORDER BY lower(u.name), m.id`,
    b,
  );
  let out = line(['member', 'email', 'membership', 'invoiced_this_month', 'paid_on_this_month', 'outstanding_all_months', 'credit', 'unmatched_payments', 'balance_owed']);
  for (const r of rows) {
    const owed = int(r.outstanding) - int(r.credit) - int(r.unmatched);
    out += line([
      csvCell(r.name as string), csvCell(r.email as string), csvCell(r.status as string), centsToDecimal(int(r.invoiced)), centsToDecimal(int(r.paid)),
      centsToDecimal(int(r.outstanding)), centsToDecimal(int(r.credit)), centsToDecimal(int(r.unmatched)), centsToDecimal(owed),
    ]);
  }
  return out;
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
