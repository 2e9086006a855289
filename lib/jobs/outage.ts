import 'server-only';
import { isDatabaseUnavailable } from '@/lib/db-outage';
import { log } from '@/lib/log';

// The worker while PostgreSQL is away: it stops fetching jobs, says so once, checks every few
// seconds, and fetches again once the database answers (one line each way, like the web
// process's database.down / database.up).

/** SQLSTATEs and socket errors that mean "the server is not there": pg-boss reports raw pg errors. */
const UNREACHABLE_CODE = /^(08...|57P0[123]|53300|ECONNREFUSED|ECONNRESET|ENOTFOUND|EHOSTUNREACH|ETIMEDOUT|EPIPE)$/;
const UNREACHABLE_MESSAGE =
  /Connection terminated|connection error|connection (is )?closed|ECONNREFUSED|ECONNRESET|EPIPE|timeout exceeded when trying to connect|the database system is (starting up|shutting down)|terminating connection/i;

/** True when an error (Sequelize's, or pg's as pg-boss passes it on) means the database could not be reached. */
export function isDatabaseUnreachable(e: unknown): boolean {
  if (isDatabaseUnavailable(e)) return true;
  const err = e as { code?: unknown; message?: unknown; errors?: unknown[] } | null;
  if (!err || typeof err !== 'object') return false;
  if (typeof err.code === 'string' && UNREACHABLE_CODE.test(err.code)) return true;
  if (Array.isArray(err.errors) && err.errors.some((x) => isDatabaseUnreachable(x))) return true;
  return typeof err.message === 'string' && UNREACHABLE_MESSAGE.test(err.message);
}

export interface OutageGuard {
  /** Call with every error the worker meets; true when it was the outage (handled, not to be logged again). */
  report(e: unknown): boolean;
  /** Whether the worker is paused for an outage. */
  paused(): boolean;
  /** Stops the probe (the worker is stopping). */
  close(): void;
}

/**
 * Watches for the database going away: on the first error that says so, logs `worker.paused` once
 * and calls `pause` (stop fetching); then runs `probe` every `everyMs` until it succeeds, calls
 * `resume`, and logs `worker.resumed` once with how long it was down.
 */
export function outageGuard(o: {
  pause: () => Promise<void>;
  resume: () => Promise<void>;
  probe: () => Promise<unknown>;
  everyMs?: number;
}): OutageGuard {
  let down = false;
  let since = 0;
  let timer: NodeJS.Timeout | undefined;
  let closed = false;
  const every = o.everyMs ?? 2_000;

  const check = async () => {
    timer = undefined;
    if (closed) return;
    try {
      await o.probe();
      await o.resume();
      down = false;
      log.info({ event: 'worker.resumed', downForMs: Date.now() - since }, 'database reachable again; fetching jobs');
    } catch {
      timer = setTimeout(check, every);
    }
  };

  return {
    report(e) {
      if (!isDatabaseUnreachable(e)) return false;
      if (down || closed) return true;
      down = true;
      since = Date.now();
      const err = e as { code?: string; message?: string; original?: { message?: string } };
      log.error(
        { event: 'worker.paused', reason: err?.original?.message ?? err?.message, code: err?.code },
        'database unreachable; the worker stops fetching jobs until it is back',
      );
      o.pause()
        .catch(() => undefined)
        .finally(() => {
          if (!closed) timer = setTimeout(check, every);
        });
      return true;
    },
    paused: () => down,
    close() {
      closed = true;
      if (timer) clearTimeout(timer);
    },
  };
}
