import 'server-only';
import { fn, Op } from 'sequelize';
import { PgBoss, type Job } from 'pg-boss';
import { settleUnknownAttempts } from '@/lib/billing/card';
import { invoiceEmailGaveUp, deliverInvoiceEmailJob } from '@/lib/billing/mail';
import { runChunk, runGaveUp } from '@/lib/billing/run';
import { inTransaction, sequelize } from '@/lib/db';
import { deliverInvitationJob, invitationMailGaveUp } from '@/lib/invitations/deliver';
import { deliverMail } from '@/lib/mail';
import { expireLapsedReservations } from '@/lib/reservations/expire';
import { AuthToken, Invoice, Reservation, SignInAttempt } from '@/models';
import { bossOptions, ensureQueues } from './boss';
import { enqueueInvoiceMails } from './index';
import { QUEUES, type InvitationMailJob, type InvoiceMailJob, type PlainMailJob, type RunChunkJob } from './names';

const log = (...a: unknown[]) => console.log('[worker]', ...a);

/** Invoice e-mails handled at once by one worker process (PDF rendering is the CPU part). */
const MAIL_CONCURRENCY = Number(process.env.WORKER_MAIL_CONCURRENCY ?? 8);

async function plainMail(job: Job<PlainMailJob>): Promise<void> {
  const { to, subject, text } = job.data;
  await deliverMail({ to, subject, text });
}

/** Lapsed reservations of every co-op that has any, each co-op in its own transaction. */
export async function expireReservations(): Promise<number> {
  const coops = await Reservation.findAll({
    attributes: ['coopId'],
    where: { status: 'open', windowEnd: { [Op.lt]: fn('now') } },
    group: ['coopId'],
    raw: true,
  });
  let n = 0;
  for (const { coopId } of coops) n += await inTransaction((t) => expireLapsedReservations(coopId, t));
  return n;
}

/**
 * Prunes sign-in attempts older than a day (the limit looks back 15 minutes), links used or
 * expired more than 30 days ago, and queues mail jobs for invoices left "queued" for over two
 * minutes without one (a web process that died between issuing and queuing).
 */
export async function housekeeping(): Promise<void> {
  const attempts = await SignInAttempt.destroy({ where: { createdAt: { [Op.lt]: new Date(Date.now() - 86_400_000) } } });
  const tokens = await AuthToken.destroy({ where: { expiresAt: { [Op.lt]: new Date(Date.now() - 30 * 86_400_000) } } });
  const stuck = await Invoice.findAll({
    attributes: ['id', 'coopId'],
    where: { emailStatus: 'queued', updatedAt: { [Op.lt]: new Date(Date.now() - 120_000) } },
    raw: true,
  });
  const byCoop = new Map<number, number[]>();
  for (const r of stuck) byCoop.set(r.coopId, [...(byCoop.get(r.coopId) ?? []), r.id]);
  for (const [coopId, ids] of byCoop) await enqueueInvoiceMails(coopId, ids);
  if (attempts || tokens || stuck.length) log(`housekeeping: ${attempts} sign-in attempts and ${tokens} links pruned, ${stuck.length} invoice e-mails re-queued`);
}

/**
 * Starts a worker: pg-boss with maintenance and cron on, the queues, a handler per queue and
 * the schedules. Returns a stop function that lets running jobs finish (SIGTERM) — a worker
 * killed outright loses nothing either: its jobs are taken again after their heartbeat lapses.
 */
export async function startWorker(): Promise<{ stop: () => Promise<void> }> {
  const boss = new PgBoss(bossOptions('worker'));
  boss.on('error', (e) => console.error('[worker] pg-boss:', e.message));
  await boss.start();
  await ensureQueues(boss);
  // The producers in this process (a run chunk queues the next, housekeeping re-queues mail) use the web singleton.
  globalThis.__tallyvatBoss = Promise.resolve(boss);

  const fast = { pollingIntervalSeconds: 0.5, burstWhenBatchFull: true } as const;
  await boss.work<InvoiceMailJob>(QUEUES.invoiceMail, { ...fast, batchSize: 1, localConcurrency: MAIL_CONCURRENCY }, async ([job]) => {
    await deliverInvoiceEmailJob(job!.data.coopId, job!.data.invoiceId);
  });
  await boss.work<InvitationMailJob>(QUEUES.invitationMail, { ...fast, batchSize: 1, localConcurrency: MAIL_CONCURRENCY }, async ([job]) => {
    await deliverInvitationJob(job!.data.coopId, job!.data.invitationId);
  });
  await boss.work<PlainMailJob>(QUEUES.mail, { ...fast, batchSize: 1, localConcurrency: 4 }, async ([job]) => plainMail(job!));
  await boss.work<InvoiceMailJob | InvitationMailJob | PlainMailJob>(QUEUES.mailDead, { pollingIntervalSeconds: 2 }, async ([job]) => {
    const d = job!.data;
    if ('invoiceId' in d) await invoiceEmailGaveUp(d.coopId, d.invoiceId);
    else if ('invitationId' in d) await invitationMailGaveUp(d.coopId, d.invitationId);
    else console.error(`[worker] e-mail to ${d.to} ("${d.subject}") given up after every try`);
  });
  await boss.work<RunChunkJob>(QUEUES.runChunk, { ...fast, batchSize: 1, localConcurrency: 2 }, async ([job]) => {
    await runChunk(job!.data);
  });
  await boss.work<RunChunkJob>(QUEUES.runDead, { pollingIntervalSeconds: 2 }, async ([job]) => runGaveUp(job!.data.coopId, job!.data.runId));
  await boss.work(QUEUES.expireReservations, async () => {
    const n = await expireReservations();
    if (n > 0) log(`${n} lapsed reservations expired`);
  });
  await boss.work(QUEUES.housekeeping, async () => housekeeping());
  await boss.work(QUEUES.settlePayments, async () => {
    const n = await settleUnknownAttempts();
    if (n > 0) log(`${n} card payments with an unknown outcome settled`);
  });

  // JOB_SCHEDULES=off (the test stack) leaves the timed jobs unscheduled: tests that compare the
  // database before and after a request must not see a minute's expiry land in between; the
  // jobs' functions are tested by calling them.
  const schedules = [[QUEUES.expireReservations, '* * * * *'], [QUEUES.housekeeping, '*/5 * * * *'], [QUEUES.settlePayments, '* * * * *']] as const;
  for (const [queue, cron] of schedules) {
    if (process.env.JOB_SCHEDULES === 'off') await boss.unschedule(queue);
    else await boss.schedule(queue, cron);
  }
  log('ready');

  return {
    async stop() {
      await boss.stop({ graceful: true, timeout: 20_000 });
      await sequelize.close();
    },
  };
}
