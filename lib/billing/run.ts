import 'server-only';
import { after } from 'next/server';
import type { InferAttributes, Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { HttpError } from '@/lib/http';
import { BillingRun, Coop, Invoice, Membership } from '@/models';
import { assertPeriodOpen, isPeriodClosed, lockCoopBilling, periodBounds, periodClosedError } from './locks';
import { currentPeriod, periodToDate } from './periods';
import * as q from './queries/run';

/** Members per chunk; each chunk is one transaction, so a crash loses at most one chunk's work. */
export const RUN_CHUNK = 500;
/** A run whose heartbeat is older than this is taken to have died with its server. */
const STALE_AFTER_MS = 60_000;

export interface RunDTO {
  id: number;
  period: string;
  status: 'running' | 'completed' | 'failed' | 'abandoned';
  totalMembers: number;
  doneMembers: number;
  drafts: number;
  limitedToMembers: number | null;
  error: string | null;
  startedAt: string;
  finishedAt: string | null;
}

type RunAttributes = InferAttributes<BillingRun>;

const toDto = (r: RunAttributes): RunDTO => ({
  id: r.id,
  period: String(r.period).slice(0, 7),
  status: r.status,
  totalMembers: r.totalMembers,
  doneMembers: r.doneMembers,
  drafts: r.drafts,
  limitedToMembers: r.memberIds ? r.memberIds.length : null,
  error: r.error,
  startedAt: new Date(r.createdAt).toISOString(),
  finishedAt: r.finishedAt ? new Date(r.finishedAt).toISOString() : null,
});

/**
 * Builds (or rebuilds) the draft invoices of one chunk of members with set-based SQL, inside the
 * caller's transaction. Idempotent: drafts of these members are rebuilt from scratch; issued
 * invoices are never touched; a draw or adjustment already on a live invoice is skipped.
 * Lines: one per draw (its locked fuel amount; reversals negative), dues, one surcharge and one
 * road-tax line summed from the draws' locked amounts, adjustments, then credit applied.
 * @returns the number of drafts that exist for the chunk afterwards
 */
async function buildDrafts(t: Transaction, s: q.RunScope, runId: number, membershipIds: number[]): Promise<number> {
  await q.deleteDraftsOf(t, s, membershipIds);
  const drafts = await q.createEmptyDrafts(t, s, runId, membershipIds);
  if (drafts.length === 0) return 0;
  await q.insertDrawLines(t, s, drafts);
  await q.insertSurchargeAndTaxLines(t, s.coopId, drafts);
  if (s.duesCents > 0) await q.insertDuesLines(t, s, drafts);
  await q.insertAdjustmentLines(t, s, drafts);
  await q.insertCreditLines(t, s.coopId, drafts);
  // A member with nothing left to bill (e.g. their draws went onto another month's draft) gets no invoice.
  const empty = await q.deleteEmptyDrafts(t, s.coopId, drafts);
  await q.refreshDraftTotals(t, s.coopId, drafts);
  return drafts.length - empty;
}

async function loadScope(coopId: number, periodDate: string, only: number[] | null, t?: Transaction): Promise<q.RunScope> {
  const coop = await Coop.findByPk(coopId, { attributes: ['timezone', 'settings'], raw: true, transaction: t });
  const { end } = await periodBounds(periodDate, coop!.timezone, t);
  const dues = Number(coop!.settings?.monthlyDuesCents ?? 0);
  return { coopId, period: periodDate, end, duesCents: Number.isSafeInteger(dues) && dues > 0 ? dues : 0, only };
}

/**
 * Starts (or joins) the invoicing run for a month. Drafts are built in the background in chunks
 * after the response; progress is on the run row. A run that is still alive is returned as is
 * (a double click does not start two); one whose server died is marked abandoned and replaced —
 * re-running is always safe because every chunk is idempotent.
 */
export async function startRun(actor: Actor, input: { period: string; memberIds?: number[] }): Promise<{ run: RunDTO; started: boolean }> {
  const coopId = actor.coop.id;
  const periodDate = periodToDate(input.period);
  if (input.period > currentPeriod(actor.coop.timezone)) {
    throw new HttpError(422, 'Some fields need attention.', { period: ['That month has not started yet.'] });
  }
  const only = input.memberIds?.length ? [...new Set(input.memberIds)] : null;
  const result = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertPeriodOpen(coopId, periodDate, t);
    if (only && (await Membership.count({ where: { coopId, id: only }, transaction: t })) !== only.length) {
      throw new HttpError(422, 'Some fields need attention.', { memberIds: ['Choose members of this co-op.'] });
    }
    const running = await BillingRun.findOne({ where: { coopId, period: periodDate, status: 'running' }, lock: t.LOCK.UPDATE, transaction: t });
    if (running) {
      if (Date.now() - new Date(running.heartbeatAt).getTime() < STALE_AFTER_MS) return { run: running.get({ plain: true }), started: false };
      await running.update({ status: 'abandoned', finishedAt: new Date() }, { transaction: t });
      await audit({ coopId, actorUserId: actor.user.id, action: 'billing.run.abandon', entityType: 'billing_run', entityId: running.id, before: { status: 'running', doneMembers: running.doneMembers } }, t);
    }
    const scope = await loadScope(coopId, periodDate, only, t);
    const total = await q.countMembersToBill(scope, t);
    const run = await BillingRun.create({ coopId, period: periodDate, memberIds: only, totalMembers: total, startedByUserId: actor.user.id }, { transaction: t });
    await audit({ coopId, actorUserId: actor.user.id, action: 'billing.run.start', entityType: 'billing_run', entityId: run.id, after: { period: input.period, totalMembers: total, memberIds: only } }, t);
    return { run: run.get({ plain: true }), started: true };
  });
  if (result.started) after(() => processRun(coopId, result.run.id));
  return { run: toDto(result.run), started: result.started };
}

/**
 * Works through a run chunk by chunk (each chunk its own transaction under the co-op's billing
 * lock) until no member is left, then marks it completed. Any failure marks it failed with the
 * message; the treasurer may simply start it again.
 */
export async function processRun(coopId: number, runId: number): Promise<void> {
  let afterId = 0;
  try {
    for (;;) {
      const stop = await inTransaction(async (t) => {
        await lockCoopBilling(t, coopId);
        const run = await BillingRun.findOne({ where: { id: runId, coopId }, lock: t.LOCK.UPDATE, transaction: t });
        if (!run || run.status !== 'running') return true;
        const periodDate = String(run.period).slice(0, 10);
        if (await isPeriodClosed(coopId, periodDate, t)) throw periodClosedError(periodDate);
        const scope = await loadScope(coopId, periodDate, run.memberIds, t);
        const ids = await q.nextMembersToBill(scope, afterId, RUN_CHUNK, t);
        if (ids.length === 0) {
          const drafts = await Invoice.count({ where: { coopId, period: periodDate, kind: 'invoice', status: 'draft' }, transaction: t });
          const members = Math.max(run.totalMembers, run.doneMembers);
          await run.update({ status: 'completed', finishedAt: new Date(), heartbeatAt: new Date(), drafts, totalMembers: members, doneMembers: members }, { transaction: t });
          await audit({ coopId, actorUserId: run.startedByUserId, action: 'billing.run.complete', entityType: 'billing_run', entityId: runId, after: { period: periodDate.slice(0, 7), members, drafts } }, t);
          return true;
        }
        const drafts = await buildDrafts(t, scope, runId, ids);
        const done = run.doneMembers + ids.length;
        // The run row is locked (FOR UPDATE) until this transaction ends, so these sums are exact.
        await run.update({ doneMembers: done, totalMembers: Math.max(run.totalMembers, done), drafts: run.drafts + drafts, heartbeatAt: new Date() }, { transaction: t });
        afterId = ids[ids.length - 1]!;
        return false;
      });
      if (stop) return;
    }
  } catch (e) {
    console.error(`[billing] run ${runId} failed:`, e);
    const message = e instanceof HttpError ? e.message : 'The run stopped on an unexpected error; start it again to continue (finished members are kept).';
    await BillingRun.update({ status: 'failed', error: message, finishedAt: new Date() }, { where: { id: runId, coopId, status: 'running' } }).catch(() => {});
  }
}

/** One run of the co-op (404 for another co-op's). */
export async function getRun(actor: Actor, runId: number): Promise<RunDTO> {
  const run = await BillingRun.findOne({ where: { id: runId, coopId: actor.coop.id }, raw: true });
  if (!run) throw new HttpError(404, 'Run not found.');
  return toDto(run);
}

/** The latest run of a month, if any. */
export async function latestRun(coopId: number, periodDate: string): Promise<RunDTO | null> {
  const run = await BillingRun.findOne({ where: { coopId, period: periodDate }, order: [['id', 'DESC']], raw: true });
  return run ? toDto(run) : null;
}
