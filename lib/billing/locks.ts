import 'server-only';
import type { Transaction } from 'sequelize';
import { HttpError } from '@/lib/http';
import { BillingPeriod } from '@/models';
import { periodLabel } from './periods';
import { advisoryLockCoopBilling, monthInstants } from './queries';

/**
 * Serialises the money writes of one co-op (runs, issue, payments, refunds, void, close) inside
 * the caller's transaction. A co-op has at most a few hundred members and one treasurer, so one
 * lock per co-op costs nothing and rules out every double-spend race between these paths.
 */
export async function lockCoopBilling(t: Transaction, coopId: number): Promise<void> {
  await advisoryLockCoopBilling(t, coopId);
}

/** True when the month ('YYYY-MM-01') is closed for the co-op. */
export async function isPeriodClosed(coopId: number, periodDate: string, t?: Transaction): Promise<boolean> {
  return (await BillingPeriod.count({ where: { coopId, period: periodDate, status: 'closed' }, transaction: t })) > 0;
}
/** The 409 every closed-month refusal answers with (services and the database triggers agree). */
export function periodClosedError(periodDate: string): HttpError {
  const label = periodLabel(periodDate.slice(0, 7));
  return new HttpError(
    409,
    `${label} is closed: its draws, invoices and payments can no longer change. Record the correction as an adjustment in an open month.`,
    undefined,
    {
      code: 'period-closed',
      period: periodDate.slice(0, 7),
    },
  );
}

/** Refuses (409) when the month is closed. */
export async function assertPeriodOpen(coopId: number, periodDate: string, t?: Transaction): Promise<void> {
  if (await isPeriodClosed(coopId, periodDate, t)) throw periodClosedError(periodDate);
}

/** The month's first and next-month's first instants in the co-op's time zone. */
export async function periodBounds(
  periodDate: string,
  timeZone: string,
  t?: Transaction,
): Promise<{ start: Date; end: Date }> {
  return monthInstants(periodDate, timeZone, t);
}
