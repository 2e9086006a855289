import 'server-only';
import { fn, Op } from 'sequelize';
import { PgBoss, type Job, type JobResult } from 'pg-boss';
import { settleUnknownAttempts } from '@/lib/billing/card';
import { invoiceEmailGaveUp, deliverInvoiceEmailJob } from '@/lib/billing/mail';
import { runChunk, runGaveUp } from '@/lib/billing/run';
import { inTransaction, sequelize } from '@/lib/db';
import { deliverInvitationJob, invitationMailGaveUp } from '@/lib/members/invitations/deliver';
import { sendOnce } from '@/lib/mail/once';
import { log as logger } from '@/lib/log';
import { expireLapsedReservations } from '@/lib/tank/reservations/expire';
import { AuthToken, Invoice, MailSend, Reservation, SignInAttempt } from '@/models';
import { bossOptions, ensureQueues } from './boss';
import { emailChangeMailKey, enqueueInvoiceMails } from './index';
import { isDatabaseUnreachable, outageGuard } from './outage';
import { QUEUES, type InvitationMailJob, type InvoiceMailJob, type PlainMailJob, type RunChunkJob } from './names';

const log = (...a: unknown[]) => console.log('[worker]', ...a);

/** Invoice e-mails handled at once by one worker process (PDF rendering is the CPU part): this many
 * fetch loops, each taking a few jobs per fetch. pg-boss fetches again at once only while a fetch
 * comes back full and holds more than one job, so one job per fetch would cap a loop at two jobs a
 * second (the half-second poll). */
const MAIL_CONCURRENCY = Number(process.env.WORKER_MAIL_CONCURRENCY ?? 8);
const MAIL_BATCH = 4;

/**
 * A plain e-mail: the job is what it is (its id survives retries), so it is its own ledger
 * subject — except an e-mail-change confirmation, whose subject names its link (the profile
 * shows its delivery from the ledger).
 */
async function plainMail(job: Job<PlainMailJob>): Promise<void> {
  const { to, subject, text, record } = job.data;
  const ledger = record?.kind === 'email-change' ? emailChangeMailKey(record.authTokenId) : `mail.${job.id}`;
  await sendOnce({ subject: ledger, coopId: null, jobRef: `${QUEUES.mail}:${job.id}`, mail: { to, subject, text } });
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
 * minutes without a live job (a web process that died between issuing and queuing). An invoice
 * still waiting its turn in a large send has a live job and is left alone.
 * @returns how many invoice e-mails were queued again
 */
export async function housekeeping(): Promise<number> {
  const attempts = await SignInAttempt.destroy({
    where: { createdAt: { [Op.lt]: new Date(Date.now() - 86_400_000) } },
  });
  const tokens = await AuthToken.destroy({ where: { expiresAt: { [Op.lt]: new Date(Date.now() - 30 * 86_400_000) } } });
  // Plain e-mails' ledger rows (an invoice's or invitation's stay: they are its send history and Message-IDs).
  const old = new Date(Date.now() - 30 * 86_400_000);
  await MailSend.destroy({
    where: {
      [Op.or]: [{ subject: { [Op.startsWith]: 'mail.' } }, { subject: { [Op.startsWith]: 'email-change.' } }],
      state: 'sent',
      sentAt: { [Op.lt]: old },
    },
  });
  const stuck = await Invoice.findAll({
    attributes: ['id', 'coopId'],
    where: { emailStatus: 'queued', updatedAt: { [Op.lt]: new Date(Date.now() - 120_000) } },
    raw: true,
  });
  const byCoop = new Map<number, number[]>();
  for (const r of stuck) byCoop.set(r.coopId, [...(byCoop.get(r.coopId) ?? []), r.id]);
  let requeued = 0;
  for (const [coopId, ids] of byCoop) requeued += await enqueueInvoiceMails(coopId, ids);
  if (attempts || tokens || requeued)
    log(`housekeeping: ${attempts} sign-in attempts and ${tokens} links pruned, ${requeued} invoice e-mails re-queued`);
  return requeued;
}

/** Registers a handler per queue; returns the queue names (to stop fetching during an outage). */
async function registerWork(boss: PgBoss, guard: (e: unknown) => void): Promise<string[]> {
  // A handler's error is first shown to the outage guard (it pauses the worker), then rethrown for pg-boss's retry.
  const g =
    <T>(f: (jobs: Job<T>[]) => Promise<unknown>) =>
    async (jobs: Job<T>[]) => {
      try {
        await f(jobs);
      } catch (e) {
        guard(e);
        throw e;
      }
    };
  const fast = { pollingIntervalSeconds: 0.5, burstWhenBatchFull: true } as const;
  // Mail jobs come a few per fetch and are settled one by one: one failed send retries alone.
  const mail = { ...fast, batchSize: MAIL_BATCH, perJobResults: true } as const;
  const each =
    <T>(f: (job: Job<T>) => Promise<unknown>) =>
    async (jobs: Job<T>[]): Promise<JobResult[]> =>
      Promise.all(
        jobs.map(async (job): Promise<JobResult> => {
          try {
            await f(job);
            return { id: job.id, status: 'completed' };
          } catch (e) {
            guard(e);
            return { id: job.id, status: 'failed', output: { message: e instanceof Error ? e.message : String(e) } };
          }
        }),
      );
  await boss.work(
    QUEUES.invoiceMail,
    { ...mail, localConcurrency: MAIL_CONCURRENCY },
    each<InvoiceMailJob>(async (job) => {
      await deliverInvoiceEmailJob(job.data.coopId, job.data.invoiceId, `${QUEUES.invoiceMail}:${job.id}`);
    }),
  );
  await boss.work(
    QUEUES.invitationMail,
    { ...mail, localConcurrency: MAIL_CONCURRENCY },
    each<InvitationMailJob>(async (job) => {
      await deliverInvitationJob(job.data.coopId, job.data.invitationId, `${QUEUES.invitationMail}:${job.id}`);
    }),
  );
  await boss.work(QUEUES.mail, { ...mail, localConcurrency: 2 }, each<PlainMailJob>(plainMail));
  await boss.work<InvoiceMailJob | InvitationMailJob | PlainMailJob>(
    QUEUES.mailDead,
    { pollingIntervalSeconds: 2 },
    g(async ([job]) => {
      const d = job!.data;
      if ('invoiceId' in d) await invoiceEmailGaveUp(d.coopId, d.invoiceId);
      else if ('invitationId' in d) await invitationMailGaveUp(d.coopId, d.invitationId);
      else console.error(`[worker] e-mail to ${d.to} ("${d.subject}") given up after every try`);
    }),
  );
  await boss.work<RunChunkJob>(
    QUEUES.runChunk,
    { ...fast, batchSize: 1, localConcurrency: 2 },
    g(async ([job]) => runChunk(job!.data)),
  );
  await boss.work<RunChunkJob>(
    QUEUES.runDead,
    { pollingIntervalSeconds: 2 },
    g(async ([job]) => runGaveUp(job!.data.coopId, job!.data.runId)),
  );
  await boss.work(
    QUEUES.expireReservations,
    g(async () => {
      const n = await expireReservations();
      if (n > 0) log(`${n} lapsed reservations expired`);
    }),
  );
  await boss.work(
    QUEUES.housekeeping,
    g(async () => housekeeping()),
  );
  await boss.work(
    QUEUES.settlePayments,
    g(async () => {
      const n = await settleUnknownAttempts();
      if (n > 0) log(`${n} card payments with an unknown outcome settled`);
    }),
  );
  return [
    QUEUES.invoiceMail,
    QUEUES.invitationMail,
    QUEUES.mail,
    QUEUES.mailDead,
    QUEUES.runChunk,
    QUEUES.runDead,
    QUEUES.expireReservations,
    QUEUES.housekeeping,
    QUEUES.settlePayments,
  ];
}

/** Starts pg-boss, waiting (one line, then quietly every 2 s) while the database cannot be reached. */
async function startBoss(): Promise<PgBoss> {
  let waiting = false;
  for (;;) {
    const boss = new PgBoss(bossOptions('worker'));
    boss.on('error', () => undefined);
    try {
      await boss.start();
      await ensureQueues(boss);
      boss.removeAllListeners('error');
      if (waiting) logger.info({ event: 'worker.resumed' }, 'database reachable; starting');
      return boss;
    } catch (e) {
      if (!isDatabaseUnreachable(e)) throw e;
      if (!waiting)
        logger.error(
          { event: 'worker.paused', reason: (e as Error).message },
          'database unreachable; the worker waits for it',
        );
      waiting = true;
      await boss.stop({ graceful: false, close: true, timeout: 1_000 }).catch(() => undefined);
      await new Promise((r) => setTimeout(r, 2_000));
    }
  }
}

/**
 * Starts a worker: pg-boss with maintenance and cron on, the queues, a handler per queue and
 * the schedules. Returns a stop function that lets running jobs finish (SIGTERM) — a worker
 * killed outright loses nothing either: its jobs are taken again after their heartbeat lapses.
 * While the database is down the worker stops fetching and resumes by itself (lib/jobs/outage.ts).
 */
export async function startWorker(): Promise<{ stop: () => Promise<void> }> {
  const boss = await startBoss();
  // The producers in this process (a run chunk queues the next, housekeeping re-queues mail) use the web singleton.
  globalThis.__tallyvatBoss = Promise.resolve(boss);
  let queues: string[] = [];
  const guard = outageGuard({
    pause: async () => {
      for (const q of queues) await boss.offWork(q, { wait: false });
    },
    resume: async () => {
      queues = await registerWork(boss, (e) => guard.report(e));
    },
    probe: () => sequelize.authenticate(),
  });
  boss.on('error', (e) => {
    if (!guard.report(e)) console.error('[worker] pg-boss:', e.message);
  });
  queues = await registerWork(boss, (e) => guard.report(e));

  // JOB_SCHEDULES=off (the test stack) leaves the timed jobs unscheduled: tests that compare the
  // database before and after a request must not see a minute's expiry land in between; the
  // jobs' functions are tested by calling them.
  const schedules = [
    [QUEUES.expireReservations, '* * * * *'],
    [QUEUES.housekeeping, '*/5 * * * *'],
    [QUEUES.settlePayments, '* * * * *'],
  ] as const;
  for (const [queue, cron] of schedules) {
    if (process.env.JOB_SCHEDULES === 'off') await boss.unschedule(queue);
    else await boss.schedule(queue, cron);
  }
  log('ready');

  return {
    async stop() {
      guard.close();
      await boss.stop({ graceful: true, timeout: 20_000 });
      await sequelize.close();
    },
  };
}
