import 'server-only';
import type { adjustmentSchema } from '@/lib/api/dto/billing';
import type { z } from 'zod';
import { Op, type InferAttributes } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { BillingAdjustment, Invoice, InvoiceLine, Membership, User } from '@/models';
import { assertMember } from './invoices';
import { assertPeriodOpen, lockCoopBilling } from './locks';
import { cents } from './cents';
import { currentPeriod, dateToPeriod, periodToDate } from './periods';

export type AdjustmentDTO = z.infer<typeof adjustmentSchema>;

/**
 * Adds a charge (positive) or credit (negative) to a member's next invoice — the way to correct
 * anything in a closed month. `period` defaults to the current month; a closed month is refused.
 */
export async function createAdjustment(
  actor: Actor,
  input: { memberId: number; amountCents: number; description: string; period?: string },
): Promise<AdjustmentDTO> {
  const coopId = actor.coop.id;
  const period = input.period ?? currentPeriod(actor.coop.timezone);
  const id = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertMember(coopId, input.memberId, t);
    await assertPeriodOpen(coopId, periodToDate(period), t);
    const row = await BillingAdjustment.create(
      {
        coopId,
        membershipId: input.memberId,
        amountCents: input.amountCents,
        description: input.description,
        period: periodToDate(period),
        createdByUserId: actor.user.id,
      },
      { transaction: t },
    );
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'billing.adjustment.create',
        entityType: 'billing_adjustment',
        entityId: row.id,
        after: { ...input, period },
      },
      t,
    );
    return row.id;
  });
  const [a] = await listAdjustments(coopId, { id });
  return a!;
}

/** An adjustment as listed: its columns, the member's name and the month of the issued invoice that billed it. */
type AdjustmentListRow = Pick<
  InferAttributes<BillingAdjustment>,
  'id' | 'membershipId' | 'amountCents' | 'description' | 'period'
> & {
  membership: { user: Pick<InferAttributes<User>, 'name'> };
  billedLine: { id: InferAttributes<InvoiceLine>['id'] | null; invoice: Pick<InferAttributes<Invoice>, 'period'> };
};

/** Adjustments of the co-op, newest first (at most 200); by default only those not billed yet. */
export async function listAdjustments(
  coopId: number,
  f: { id?: number; pendingOnly?: boolean } = {},
): Promise<AdjustmentDTO[]> {
  const rows = (await BillingAdjustment.findAll({
    attributes: ['id', 'membershipId', 'amountCents', 'description', 'period'],
    where: {
      coopId,
      ...(f.id ? { id: f.id } : {}),
      // Not billed: no unreleased line of an issued invoice names it (a draft's line does not count).
      ...(f.pendingOnly ? { '$billedLine.id$': null } : {}),
    },
    include: [
      {
        model: Membership,
        as: 'membership',
        attributes: [],
        required: true,
        include: [{ model: User, as: 'user', attributes: ['name'], required: true }],
      },
      {
        model: InvoiceLine,
        as: 'billedLine',
        attributes: ['id'],
        required: false,
        where: { released: false },
        include: [
          {
            model: Invoice,
            as: 'invoice',
            attributes: ['period'],
            required: true,
            where: { status: { [Op.ne]: 'draft' } },
          },
        ],
      },
    ],
    order: [['id', 'DESC']],
    limit: 200,
    subQuery: false,
    raw: true,
    nest: true,
  })) as unknown as AdjustmentListRow[];
  return rows.map((r) => ({
    id: r.id,
    memberId: r.membershipId,
    memberName: r.membership.user.name,
    amountCents: cents(r.amountCents),
    description: r.description,
    period: dateToPeriod(r.period),
    billedOn: r.billedLine.id === null ? null : dateToPeriod(r.billedLine.invoice.period),
  }));
}
