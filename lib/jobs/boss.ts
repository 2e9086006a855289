import 'server-only';
import { PgBoss, type Queue } from 'pg-boss';
import { QUEUES, type QueueName } from './names';

declare global {
  var __tallyvatBoss: Promise<PgBoss> | undefined;
}

/**
 * Every queue with its retry policy. Mail: 8 tries with exponential back-off from 10 s (capped at
 * 10 min), then the dead letter. A job whose worker died is taken again after its heartbeat is
 * missed for 10 s (pg-boss's minimum).
 */
const QUEUE_OPTIONS: Record<QueueName, Omit<Queue, 'name'>> = {
  [QUEUES.invoiceMail]: {
    retryLimit: 8,
    retryDelay: 10,
    retryBackoff: true,
    retryDelayMax: 600,
    heartbeatSeconds: 10,
    expireInSeconds: 120,
    deadLetter: QUEUES.mailDead,
  },
  [QUEUES.invitationMail]: {
    retryLimit: 8,
    retryDelay: 10,
    retryBackoff: true,
    retryDelayMax: 600,
    heartbeatSeconds: 10,
    expireInSeconds: 120,
    deadLetter: QUEUES.mailDead,
  },
  [QUEUES.mail]: {
    retryLimit: 8,
    retryDelay: 10,
    retryBackoff: true,
    retryDelayMax: 600,
    heartbeatSeconds: 10,
    expireInSeconds: 120,
    deadLetter: QUEUES.mailDead,
  },
  [QUEUES.mailDead]: { retryLimit: 3, retryDelay: 30 },
  [QUEUES.runChunk]: {
    retryLimit: 5,
    retryDelay: 5,
    retryBackoff: true,
    retryDelayMax: 120,
    heartbeatSeconds: 10,
    expireInSeconds: 600,
    deadLetter: QUEUES.runDead,
  },
  [QUEUES.runDead]: { retryLimit: 3, retryDelay: 30 },
  [QUEUES.expireReservations]: { retryLimit: 0, expireInSeconds: 300 },
  [QUEUES.settlePayments]: { retryLimit: 0, expireInSeconds: 300 },
  [QUEUES.housekeeping]: { retryLimit: 0, expireInSeconds: 600 },
};

/** Creates the queues that do not exist yet (dead letters first: a queue names its dead letter). */
export async function ensureQueues(boss: PgBoss): Promise<void> {
  const existing = new Set((await boss.getQueues()).map((q) => q.name));
  const order = [
    QUEUES.mailDead,
    QUEUES.runDead,
    ...Object.values(QUEUES).filter((n) => n !== QUEUES.mailDead && n !== QUEUES.runDead),
  ];
  for (const name of order) {
    if (existing.has(name)) continue;
    try {
      await boss.createQueue(name, { ...QUEUE_OPTIONS[name], policy: 'standard' });
    } catch (e) {
      // Two processes starting at once: the other one created it.
      if (!(await boss.getQueue(name))) throw e;
    }
  }
}

/** Options shared by the web process's and the worker's pg-boss instance. */
export function bossOptions(role: 'web' | 'worker') {
  return {
    connectionString: process.env.DATABASE_URL ?? 'postgres://unset@127.0.0.1:1/unset',
    schema: 'pgboss',
    // The web process only sends jobs: no maintenance, no cron, a small pool.
    ...(role === 'web'
      ? { supervise: false, schedule: false, max: 2 }
      : { max: Number(process.env.WORKER_POOL_MAX ?? 6), superviseIntervalSeconds: 5, maintenanceIntervalSeconds: 60 }),
  };
}

/**
 * The web process's pg-boss (started once, lazily: it installs or migrates its own schema
 * `pgboss` the first time and creates the queues). Only used to send jobs.
 */
export function webBoss(): Promise<PgBoss> {
  return (globalThis.__tallyvatBoss ??= (async () => {
    const boss = new PgBoss(bossOptions('web'));
    boss.on('error', (e) => console.error('[jobs] pg-boss:', e.message));
    try {
      await boss.start();
      await ensureQueues(boss);
      return boss;
    } catch (e) {
      globalThis.__tallyvatBoss = undefined;
      throw e;
    }
  })());
}
