import 'server-only';
import { col, fn, Op, where, type Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { conflict } from '@/lib/http';
import { assertPeriodOpen, lockCoopBilling } from '@/lib/billing/locks';
import { currentPeriod, periodToDate } from '@/lib/billing/periods';
import { todayIn, formatDate } from '@/lib/dates';
import { formatCents } from '@/lib/money';
import { emailSchema } from '@/lib/validation/auth';
import { BillingAdjustment, InvoiceLine, Membership } from '@/models';
import type { CsvRow } from './csv-read';
import { rowChecker, type Checked, type OpeningKind } from './opening';
import { readDate, readMoneyCents } from './values';

const COLUMNS = [
  { key: 'email', headings: ['E-mail', 'Email', 'Email address', 'E-mail address'], required: true },
  { key: 'balance', headings: ['Balance', 'Amount', 'Owes'], required: true },
  { key: 'asOf', headings: ['As of', 'Date', 'As at'], required: true },
] as const;
type Key = (typeof COLUMNS)[number]['key'];

/** Every opening balance's adjustment starts with these words (how a second one for a member is spotted). */
export const OPENING_BALANCE_PREFIX = 'Opening balance as of';

interface Plan {
  membershipId: number;
  amountCents: number;
  asOf: string;
}

/**
 * Members' opening balances: what each member owed (positive) or held in credit (negative) on a
 * date, carried by their next invoice as an adjustment ("Opening balance as of …") billed in the
 * current month. Zero balances need no row. A member gets one opening balance.
 */
export const openingBalances: OpeningKind<Key, Plan> = {
  kind: 'opening-balances',
  columns: COLUMNS,
  async check(actor: Actor, rows: CsvRow<Key>[], t?: Transaction): Promise<Checked<Plan>[]> {
    const { units, timezone, currency } = actor.coop;
    const emails = [
      ...new Set(
        rows.flatMap((r) => {
          const e = emailSchema.safeParse(r.cells.email);
          return e.success ? [e.data] : [];
        }),
      ),
    ];
    const members = emails.length
      ? await Membership.findAll({
          attributes: ['id'],
          where: { coopId: actor.coop.id },
          include: [
            {
              association: 'user',
              attributes: ['email', 'name'],
              required: true,
              where: where(fn('lower', col('user.email')), { [Op.in]: emails }),
            },
          ],
          transaction: t,
        })
      : [];
    const byEmail = new Map(members.map((m) => [m.user!.email.toLowerCase(), { id: m.id, name: m.user!.name }]));
    const already = new Set(
      (
        await BillingAdjustment.findAll({
          attributes: ['membershipId'],
          where: {
            coopId: actor.coop.id,
            membershipId: [...byEmail.values()].map((m) => m.id),
            description: { [Op.startsWith]: OPENING_BALANCE_PREFIX },
          },
          raw: true,
          transaction: t,
        })
      ).map((a) => a.membershipId),
    );
    const today = todayIn(timezone);
    const seen = new Map<string, number>();
    return rows.map(({ line, cells }) => {
      const c = rowChecker(line, cells);
      const email = c.take(
        'email',
        (() => {
          const e = emailSchema.safeParse(cells.email);
          return e.success
            ? { ok: true as const, value: e.data }
            : {
                ok: false as const,
                error: cells.email ? `"${cells.email}" is not an e-mail address.` : 'Empty: enter the member’s e-mail.',
              };
        })(),
      );
      const member = email ? byEmail.get(email) : undefined;
      if (email && !member)
        c.fail(
          'email',
          `${email} is not a member of this co-op yet: invite them first; their balance can be imported once they have joined.`,
        );
      if (email && seen.has(email)) c.fail('email', `Same member as row ${seen.get(email)}: one balance per member.`);
      else if (email) seen.set(email, line);
      if (member && already.has(member.id)) c.fail('email', 'This member already has an opening balance.');
      const cents = c.take('balance', readMoneyCents(cells.balance, units));
      if (cents === 0) c.fail('balance', 'A zero balance needs no row: leave it out.');
      const asOf = c.take('asOf', readDate(cells.asOf, units));
      if (asOf && asOf > today) c.fail('asOf', 'The date is in the future.');
      const owes = (cents ?? 0) > 0;
      const note =
        cents !== null && asOf && member
          ? `${member.name} ${owes ? 'owes' : 'has a credit of'} ${formatCents(Math.abs(cents), currency)} as of ${formatDate(asOf, timezone)}; carried by the next invoice.`
          : '';
      return c.done(
        note,
        member && cents !== null && asOf ? { membershipId: member.id, amountCents: cents, asOf } : null,
      );
    });
  },
  async apply(actor, rows, t) {
    const coopId = actor.coop.id;
    await lockCoopBilling(t, coopId);
    const period = periodToDate(currentPeriod(actor.coop.timezone));
    await assertPeriodOpen(coopId, period, t);
    const created = await BillingAdjustment.bulkCreate(
      rows.map((r) => ({
        coopId,
        membershipId: r.plan!.membershipId,
        amountCents: r.plan!.amountCents,
        period,
        createdByUserId: actor.user.id,
        description: `${OPENING_BALANCE_PREFIX} ${formatDate(r.plan!.asOf, actor.coop.timezone)}`,
      })),
      { transaction: t, returning: ['id'] },
    );
    return created.map((a) => a.id);
  },
};

/**
 * Undoes opening balances: refused (409) once any of them is on an invoice (a draft included:
 * prepare the month again after undoing), since a bill has then been built on it.
 */
export async function undoOpeningBalances(coopId: number, adjustmentIds: number[], t: Transaction): Promise<void> {
  await lockCoopBilling(t, coopId);
  const billed = await InvoiceLine.count({ where: { coopId, adjustmentId: adjustmentIds }, transaction: t });
  if (billed > 0)
    throw conflict(
      'Some of these balances are already on an invoice, so the import can no longer be undone. Correct a balance with an adjustment instead.',
    );
  await BillingAdjustment.destroy({ where: { coopId, id: adjustmentIds }, transaction: t });
}
