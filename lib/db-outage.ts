import { ConnectionError, type Sequelize } from 'sequelize';
import { log } from '@/lib/log';

// Whether the database can be reached, as this process last saw it. No 'server-only' marker and no
// import of lib/db: instrumentation.ts (outside the React server layer) uses it for page errors.

/** Seconds a client is asked to wait before trying again while the database is unreachable. */
export const DATABASE_RETRY_AFTER_SECONDS = 5;

/**
 * SQLSTATEs meaning "the server is not there for you right now": class 08 (connection exception),
 * 57P01–57P03 (administrator or crash shutdown, server starting up), 53300 (too many connections).
 */
const UNAVAILABLE_SQLSTATE = /^(08...|57P0[123]|53300)$/;
/** What pg says, without a SQLSTATE, when the socket under a query goes away. */
const UNAVAILABLE_MESSAGE =
  /Connection terminated|Client has encountered a connection error|connection (is )?closed|ECONNRESET|ECONNREFUSED|EPIPE|timeout exceeded when trying to connect/i;

/**
 * True when an error means the database could not be reached (refused, host unknown or unreachable,
 * connect or pool-acquire timeout, the server shutting down or starting up, the connection cut
 * under a query) rather than a problem with the request itself.
 */
export function isDatabaseUnavailable(e: unknown): boolean {
  if (e instanceof ConnectionError) return true;
  const err = e as {
    name?: string;
    original?: { code?: unknown; message?: unknown };
    parent?: { code?: unknown };
  } | null;
  if (!err || typeof err !== 'object') return false;
  if (typeof err.name === 'string' && err.name.startsWith('SequelizeConnection')) return true;
  const code = err.original?.code ?? err.parent?.code;
  if (typeof code === 'string' && UNAVAILABLE_SQLSTATE.test(code)) return true;
  if (!err.name?.startsWith('Sequelize')) return false;
  return typeof err.original?.message === 'string' && UNAVAILABLE_MESSAGE.test(err.original.message);
}

interface DatabaseState {
  down: boolean;
  since: number;
  watching: boolean;
}

declare global {
  var __tallyvatDbState: DatabaseState | undefined;
}

/** One state per process (route handlers and pages are bundled apart but share it and the pool). */
const state: DatabaseState = (globalThis.__tallyvatDbState ??= { down: false, since: Date.now(), watching: false });

/**
 * Records that the database could not be reached. Logged once when the state changes, not on
 * every request that meets the outage.
 */
export function noteDatabaseUnavailable(e: unknown): void {
  if (state.down) return;
  state.down = true;
  state.since = Date.now();
  const err = e as { name?: string; original?: { code?: string; message?: string } } | null;
  log.error(
    { event: 'database.down', reason: err?.original?.message ?? err?.name, code: err?.original?.code },
    'database unreachable; answering 503 until it is back',
  );
}

/** Records that the database answered again (logged once, with how long it was away). */
export function noteDatabaseAvailable(): void {
  if (!state.down) return;
  state.down = false;
  const downForMs = Date.now() - state.since;
  state.since = Date.now();
  log.info({ event: 'database.up', downForMs }, 'database reachable again');
}

/** Whether this process last saw the database as unreachable. */
export function databaseSeemsDown(): boolean {
  return state.down;
}

/** Marks the database as back when the pool opens a new connection (the first sign after an outage). */
export function watchDatabase(sequelize: Sequelize): void {
  if (state.watching) return;
  state.watching = true;
  sequelize.addHook('afterConnect', 'tallyvatDatabaseUp', () => noteDatabaseAvailable());
}
