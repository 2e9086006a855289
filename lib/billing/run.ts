import 'server-only';
import type { runSchema } from '@/lib/api/dto/billing';
import type { z } from 'zod';
import type { InferAttributes, Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { HttpError, invalidFields } from '@/lib/http';
import { enqueue, QUEUES, type RunChunkJob } from '@/lib/jobs';
import { BillingRun, Coop, Invoice, Membership } from '@/models';
import { assertPeriodOpen, isPeriodClosed, lockCoopBilling, periodBounds, periodClosedError } from './locks';
import { currentPeriod, periodToDate } from './periods';
import * as q from './run/queries';

/** Members per chunk; each chunk is one transaction, so a crash loses at most one chunk's work. */
export const RUN_CHUNK = 500;
/**
 * A run whose chunks no worker has touched for this long is taken to be lost (e.g. no worker is
 * running, or its jobs were deleted); a worker that dies mid-chunk does not count: the queue
 * gives its chunk to another worker within seconds.
 */
const STALE_AFTER_MS = 10 * 60_000;

export type RunDTO = z.infer<typeof runSchema>;

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

async function loadScope(
  coopId: number,
  periodDate: string,
  only: number[] | null,
  t?: Transaction,
): Promise<q.RunScope> {
  const coop = await Coop.findByPk(coopId, { attributes: ['timezone', 'settings'], raw: true, transaction: t });
  const { end } = await periodBounds(periodDate, coop!.timezone, t);
  const dues = Number(coop!.settings?.monthlyDuesCents ?? 0);
  return { coopId, period: periodDate, end, duesCents: Number.isSafeInteger(dues) && dues > 0 ? dues : 0, only };
}

/**
 * Starts (or joins) the invoicing run for a month. Drafts are built by the worker, one job per
 * chunk of members; the first chunk's job is queued in the same transaction as the run row.
 * Progress is on the run row, written by each chunk's transaction. A run that is still alive is
 * returned as is (a double click does not start two); one that no worker has advanced for ten
 * minutes is marked abandoned and replaced — re-running is always safe because every chunk is
 * idempotent.
 */
export async function startRun(
  actor: Actor,
  input: { period: string; memberIds?: number[] },
): Promise<{ run: RunDTO; started: boolean }> {
  const coopId = actor.coop.id;
  const periodDate = periodToDate(input.period);
  if (input.period > currentPeriod(actor.coop.timezone)) {
    throw invalidFields({ period: ['That month has not started yet.'] });
  }
  const only = input.memberIds?.length ? [...new Set(input.memberIds)] : null;
  const result = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertPeriodOpen(coopId, periodDate, t);
    if (only && (await Membership.count({ where: { coopId, id: only }, transaction: t })) !== only.length) {
      throw invalidFields({ memberIds: ['Choose members of this co-op.'] });
    }
    const running = await BillingRun.findOne({
      where: { coopId, period: periodDate, status: 'running' },
      lock: t.LOCK.UPDATE,
      transaction: t,
    });
    if (running) {
      if (Date.now() - new Date(running.heartbeatAt).getTime() < STALE_AFTER_MS)
        return { run: running.get({ plain: true }), started: false };
      await running.update({ status: 'abandoned', finishedAt: new Date() }, { transaction: t });
      await audit(
        {
          coopId,
          actorUserId: actor.user.id,
          action: 'billing.run.abandon',
          entityType: 'billing_run',
          entityId: running.id,
          before: { status: 'running', doneMembers: running.doneMembers },
        },
        t,
      );
    }
    const scope = await loadScope(coopId, periodDate, only, t);
    const total = await q.countMembersToBill(scope, t);
    const run = await BillingRun.create(
      { coopId, period: periodDate, memberIds: only, totalMembers: total, startedByUserId: actor.user.id },
      { transaction: t },
    );
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'billing.run.start',
        entityType: 'billing_run',
        entityId: run.id,
        after: { period: input.period, totalMembers: total, memberIds: only },
      },
      t,
    );
    await enqueue<RunChunkJob>(QUEUES.runChunk, { coopId, runId: run.id, afterId: 0, done: 0 }, { transaction: t });
    return { run: run.get({ plain: true }), started: true };
  });
  return { run: toDto(result.run), started: result.started };
}

/**
 * One chunk of a run (a worker job): under the co-op's billing lock, builds the drafts of the
 * next RUN_CHUNK members after `afterId`, advances the run's progress and queues the next
 * chunk — all in one transaction, so a worker killed mid-chunk leaves nothing half done and the
 * queue runs the chunk again. A chunk replayed after its transaction committed (the worker died
 * before the queue heard it finished) finds the run's progress moved on and does nothing.
 * When no member is left, the run is marked completed. A closed month fails the run at once;
 * other errors are retried by the queue and, after the last try, fail the run (runGaveUp).
 */
export async function runChunk(job: RunChunkJob): Promise<'chunk' | 'completed' | 'stale'> {
  const { coopId, runId, afterId } = job;
  try {
    return await inTransaction(async (t) => {
      await lockCoopBilling(t, coopId);
      const run = await BillingRun.findOne({ where: { id: runId, coopId }, lock: t.LOCK.UPDATE, transaction: t });
      if (!run || run.status !== 'running' || run.doneMembers !== job.done) return 'stale';
      const periodDate = String(run.period).slice(0, 10);
      if (await isPeriodClosed(coopId, periodDate, t)) throw periodClosedError(periodDate);
      const scope = await loadScope(coopId, periodDate, run.memberIds, t);
      const ids = await q.nextMembersToBill(scope, afterId, RUN_CHUNK, t);
      if (ids.length === 0) {
        const drafts = await Invoice.count({
          where: { coopId, period: periodDate, kind: 'invoice', status: 'draft' },
          transaction: t,
        });
        const members = Math.max(run.totalMembers, run.doneMembers);
        await run.update(
          {
            status: 'completed',
            finishedAt: new Date(),
            heartbeatAt: new Date(),
            drafts,
            totalMembers: members,
            doneMembers: members,
          },
          { transaction: t },
        );
        await audit(
          {
            coopId,
            actorUserId: run.startedByUserId,
            action: 'billing.run.complete',
            entityType: 'billing_run',
            entityId: runId,
            after: { period: periodDate.slice(0, 7), members, drafts },
          },
          t,
        );
        return 'completed';
      }
      const drafts = await buildDrafts(t, scope, runId, ids);
      const done = run.doneMembers + ids.length;
      // The run row is locked (FOR UPDATE) until this transaction ends, so these sums are exact.
      await run.update(
        {
          doneMembers: done,
          totalMembers: Math.max(run.totalMembers, done),
          drafts: run.drafts + drafts,
          heartbeatAt: new Date(),
        },
        { transaction: t },
      );
      await enqueue<RunChunkJob>(
        QUEUES.runChunk,
        { coopId, runId, afterId: ids[ids.length - 1]!, done },
        { transaction: t },
      );
      return 'chunk';
    });
  } catch (e) {
    if (!(e instanceof HttpError)) throw e;
    await runGaveUp(coopId, runId, e.message);
    return 'stale';
  }
}

/** Marks a run failed (its chunk's job used up its tries, or the month closed under it). */
export async function runGaveUp(coopId: number, runId: number, message?: string): Promise<void> {
  console.error(`[billing] run ${runId} failed${message ? `: ${message}` : ''}`);
  await BillingRun.update(
    {
      status: 'failed',
      error:
        message ?? 'The run stopped on an unexpected error; start it again to continue (finished members are kept).',
      finishedAt: new Date(),
    },
    { where: { id: runId, coopId, status: 'running' } },
  );
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
