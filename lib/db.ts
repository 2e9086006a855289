import 'server-only';
import pg from 'pg';
import { Sequelize, type Transaction } from 'sequelize';

// PostgreSQL BIGINT (int8) and NUMERIC arrive as strings; we parse them on purpose where used.

declare global {
  // eslint-disable-next-line no-var
  var __tallyvatSequelize: Sequelize | undefined;
}

function create(): Sequelize {
  // Without DATABASE_URL (e.g. while `next build` collects routes) the instance points nowhere
  // and every query fails; /api/health then reports the database as down.
  const url = process.env.DATABASE_URL ?? 'postgres://unset@127.0.0.1:1/unset';
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true },
  });
}

/** The one Sequelize instance of this process (cached on globalThis so dev reloads reuse it). */
export const sequelize: Sequelize = globalThis.__tallyvatSequelize ?? (globalThis.__tallyvatSequelize = create());

/** SQLSTATEs worth another try: deadlock detected, serialization failure. */
const RETRYABLE = new Set(['40P01', '40001']);

/** The SQLSTATE of a database error (Sequelize wraps pg's error as `original`/`parent`), e.g. '23505'. */
export function sqlState(e: unknown): string | undefined {
  const err = e as { original?: { code?: string }; parent?: { code?: string }; code?: string } | null;
  return err?.original?.code ?? err?.parent?.code ?? err?.code;
}

/**
 * The one transaction helper: runs fn in a READ COMMITTED transaction (guarded updates and row
 * locks rely on it) and runs it again, up to three times in all, when PostgreSQL aborts it to
 * resolve a deadlock or a serialization failure. Everything fn wrote is rolled back when it throws,
 * so fn must not have effects outside the database (send e-mail after it returns).
 */
export async function inTransaction<T>(fn: (t: Transaction) => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await sequelize.transaction(fn);
    } catch (e) {
      if (attempt < 3 && RETRYABLE.has(sqlState(e) ?? '')) continue;
      throw e;
    }
  }
}

/**
 * A statement with positional parameters ($1, $2, …; an array binds as a PostgreSQL array,
 * for `= ANY($n)`). A named statement is prepared once per pooled connection (PREPARE) and then
 * run with EXECUTE, so PostgreSQL parses and plans it once per connection instead of per request.
 */
export interface Statement {
  /** The PREPARE name (lower-case letters, digits, underscores), or null to send the text each time. */
  name: string | null;
  text: string;
  parts: string[];
  slots: number[];
  /** How many values it takes (its highest $n). */
  params: number;
}

/**
 * Declares a statement for {@link queryRows}. Name the ones the busiest routes run; their text
 * must not depend on the request except through parameters.
 */
export function statement(text: string, name: string | null = null): Statement {
  if (name !== null && !/^[a-z][a-z0-9_]{0,62}$/.test(name)) throw new Error(`Bad statement name ${name}`);
  const parts: string[] = [];
  const slots: number[] = [];
  let last = 0;
  for (const m of text.matchAll(/\$(\d+)/g)) {
    parts.push(text.slice(last, m.index));
    slots.push(Number(m[1]) - 1);
    last = m.index + m[0].length;
  }
  parts.push(text.slice(last));
  return { name, text, parts, slots, params: Math.max(0, ...slots.map((s) => s + 1)) };
}

/** One value as a SQL literal, escaped by Sequelize's own escaping (as `replacements` are). */
function literal(v: unknown): string {
  if (Array.isArray(v)) {
    if (v.length === 0) throw new RangeError('An empty array has no type: leave the condition out instead.');
    return `ARRAY[${v.map((x) => sequelize.escape(x as string)).join(', ')}]`;
  }
  return sequelize.escape(v as string);
}

/** The SQL of a statement with its values bound as literals (the statement's text, ready to send). */
function bindStatement(stmt: Statement, values: readonly unknown[]): string {
  let sql = stmt.parts[0]!;
  for (let i = 0; i < stmt.slots.length; i++) sql += literal(values[stmt.slots[i]!]) + stmt.parts[i + 1];
  return sql;
}

type PgResult = { command: string; rows: unknown[] };
type PgClient = { query: (sql: string) => Promise<PgResult | PgResult[]> };

/**
 * Named statements already prepared on a pooled connection, kept on the connection object itself
 * under a global symbol: the route handlers and the pages are bundled separately, each with its
 * own copy of this module, but they share the one Sequelize pool.
 */
const PREPARED = Symbol.for('tallyvat.preparedStatements');
type Tracked = PgClient & { [PREPARED]?: Set<string> };

/** The SQL that runs these statements on `client`, preparing the named ones it has not seen. */
function batchSql(client: Tracked | null, stmts: readonly Read[], fresh: string[]): string {
  const known = client ? (client[PREPARED] ??= new Set<string>()) : null;
  const sql: string[] = [];
  for (const [stmt, values] of stmts) {
    if (stmt.params > values.length) throw new RangeError(`No value for $${stmt.params}`);
    if (!known || stmt.name === null) {
      sql.push(bindStatement(stmt, values));
      continue;
    }
    if (!known.has(stmt.name)) {
      sql.push(`PREPARE ${stmt.name} AS ${stmt.text}`);
      known.add(stmt.name);
      fresh.push(stmt.name);
    }
    sql.push(stmt.params ? `EXECUTE ${stmt.name}(${values.slice(0, stmt.params).map(literal).join(', ')})` : `EXECUTE ${stmt.name}`);
  }
  return sql.join(';\n');
}

type Manager = { getConnection(o: { type: 'read' | 'write' }): Promise<PgClient>; releaseConnection(c: PgClient): void };

/**
 * Runs statements in one message (outside a transaction PostgreSQL runs them as one implicit
 * transaction, so they see the same snapshot) and returns each one's rows, parsed by the same
 * type parsers as `sequelize.query`. Inside a transaction they go on its connection, unprepared.
 */
async function send(stmts: readonly Read[], transaction?: Transaction | null): Promise<unknown[][]> {
  const own = (transaction as unknown as { connection?: PgClient } | null | undefined)?.connection;
  if (own) return run(own, false, stmts, false);
  const manager = sequelize.connectionManager as unknown as Manager;
  const client = await manager.getConnection({ type: 'write' });
  try {
    return await run(client, true, stmts, true);
  } finally {
    manager.releaseConnection(client);
  }
}

async function run(client: Tracked, prepare: boolean, stmts: readonly Read[], retry: boolean): Promise<unknown[][]> {
  const fresh: string[] = [];
  try {
    const r = await client.query(batchSql(prepare ? client : null, stmts, fresh));
    const results = (Array.isArray(r) ? r : [r]).filter((x) => x.command !== 'PREPARE');
    if (results.length !== stmts.length) throw new Error(`Expected ${stmts.length} results, got ${results.length}`);
    return results.map((x) => x.rows);
  } catch (e) {
    if (!prepare) throw e;
    const code = (e as { code?: string }).code;
    // The message ran as one implicit transaction and was rolled back, so sending it again is safe.
    if (retry && (code === '26000' || code === '42P05')) {
      // The connection's prepared statements are not what we noted ("does not exist" / "already exists"): start over.
      client[PREPARED] = new Set();
      await client.query('DEALLOCATE ALL');
      return run(client, prepare, stmts, false);
    }
    // Whether a PREPARE of this message took effect is unknown after an error: drop those names on both sides.
    for (const name of fresh) {
      client[PREPARED]?.delete(name);
      await client.query(`DEALLOCATE ${name}`).catch(() => undefined);
    }
    throw e;
  }
}

/**
 * Runs one statement on a connection of Sequelize's pool (or the transaction's own connection)
 * and returns its rows. For the hot paths (the session check, list pages, reserving fuel): it
 * skips Sequelize's query pipeline (hooks, logging, result shaping). A write sent this way is one
 * statement or one message, so it is atomic without an explicit transaction.
 */
export async function queryRows<T>(stmt: Statement, values: readonly unknown[], transaction?: Transaction | null): Promise<T[]> {
  return (await send([[stmt, values]], transaction))[0] as T[];
}

/** Runs several statements in one round trip, as one implicit transaction, and returns each one's rows. */
export async function queryRowSets<T extends unknown[][]>(stmts: { [K in keyof T]: Read }, transaction?: Transaction | null): Promise<T> {
  return (await send(stmts as readonly Read[], transaction)) as T;
}

/** One statement with its values, as {@link queryRowSets} takes them. */
export type Read = [Statement, readonly unknown[]];

/**
 * Reads to send and how to turn their rows into an answer. Written this way so a caller can send
 * them in the same round trip as other statements (the session check of `requireMemberAnd`).
 */
export interface ReadPlan<R> {
  reads: Read[];
  finish: (rowSets: unknown[][]) => R | Promise<R>;
}

/** Sends a plan's reads in one round trip and finishes it. */
export async function runReadPlan<R>(plan: ReadPlan<R>, transaction?: Transaction | null): Promise<R> {
  return plan.finish(plan.reads.length ? await queryRowSets<unknown[][]>(plan.reads, transaction) : []);
}
