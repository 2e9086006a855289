import 'server-only';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { sequelize } from '@/models';
import { int, select } from './db';
import { assertMember } from './invoices';
import { assertPeriodOpen, lockCoopBilling } from './locks';
import { currentPeriod, periodToDate } from './periods';

export interface AdjustmentDTO {
  id: number;
  memberId: number;
  memberName: string;
  amountCents: number;
  description: string;
  /** 'YYYY-MM': billed on the member's first invoice for this month or later. */
  period: string;
  billedOn: string | null;
}

/**
 * Adds a charge (positive) or credit (negative) to a member's next invoice — the way to correct
 * anything in a closed month. `period` defaults to the current month; a closed month is refused.
 */
export async function createAdjustment(actor: Actor, input: { memberId: number; amountCents: number; description: string; period?: string }): Promise<AdjustmentDTO> {
  const coopId = actor.coop.id;
  const period = input.period ?? currentPeriod(actor.coop.timezone);
  const id = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertMember(coopId, input.memberId, t);
    await assertPeriodOpen(coopId, periodToDate(period), t);
    const [row] = await select<{ id: number }>(
      `INSERT INTO billing_adjustments (coop_id, membership_id, amount_cents, description, period, created_by_user_id)
       VALUES ($coopId, $m, $amount, $description, $period::date, $userId) RETURNING id`,
      { coopId, m: input.memberId, amount: input.amountCents, description: input.description, period: periodToDate(period), userId: actor.user.id },
      t,
    );
    await audit({ coopId, actorUserId: actor.user.id, action: 'billing.adjustment.create', entityType: 'billing_adjustment', entityId: row!.id, after: { ...input, period } }, t);
    return row!.id;
  });
  const [a] = await listAdjustments(coopId, { id });
  return a!;
}

/** Adjustments of the co-op; by default only those not billed yet. */
export async function listAdjustments(coopId: number, f: { id?: number; pendingOnly?: boolean } = {}): Promise<AdjustmentDTO[]> {
  const rows = await select<{ id: number; membership_id: number; name: string; amount_cents: string; description: string; period: string; billed_on: string | null }>(
    `SELECT a.id, a.membership_id, u.name, a.amount_cents, a.description, to_char(a.period, 'YYYY-MM') AS period,
       (SELECT to_char(i.period, 'YYYY-MM') FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id WHERE l.adjustment_id = a.id AND NOT l.released AND i.status <> 'draft' LIMIT 1) AS billed_on
     FROM billing_adjustments a JOIN memberships m ON m.id = a.membership_id JOIN users u ON u.id = m.user_id
     WHERE a.coop_id = $coopId ${f.id ? 'AND a.id = $id' : ''}
       ${f.pendingOnly ? "AND NOT EXISTS (SELECT 1 FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id WHERE l.adjustment_id = a.id AND NOT l.released AND i.status <> 'draft')" : ''}
     ORDER BY a.id DESC LIMIT 200`,
    { coopId, id: f.id },
  );
  return rows.map((r) => ({ id: r.id, memberId: r.membership_id, memberName: r.name, amountCents: int(r.amount_cents), description: r.description, period: r.period, billedOn: r.billed_on }));
}
