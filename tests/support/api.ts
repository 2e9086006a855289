// Helpers for integration tests: supertest against the running server, database access
// through Sequelize for setting up and checking rows, factories, and the caught e-mail.
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import bcrypt from 'bcryptjs';
import { QueryTypes, Sequelize } from 'sequelize';
import request from 'supertest';
import { inject } from 'vitest';
import { checkedClient } from './contract';

export const TEST_PASSWORD = 'correct-horse-tallyvat';
export const DEMO_PASSWORD = 'tallyvat-demo-2026';
const HASH = bcrypt.hashSync(TEST_PASSWORD, 10);

export const baseUrl = () => inject('baseUrl');

/**
 * Requests without a session. Writes carry the app's own Origin, as a browser's do (the server
 * refuses writes from any other origin, and writes that name none). Every answer is held to the
 * API contract (tests/support/contract.ts).
 */
export const api = () =>
  checkedClient(
    request(inject('baseUrl')),
    (test, method) => method !== 'GET' && test.set('Origin', inject('baseUrl')),
  );

/**
 * Requests as an integration: `Authorization: Bearer <token>` on every request, no cookie and no
 * Origin (a script's requests carry neither). Answers are held to the API contract too.
 */
export const bearerApi = (token: string) =>
  checkedClient(request(inject('baseUrl')), (test) => test.set('Authorization', `Bearer ${token}`));

let instance: Sequelize | null = null;
/**
 * A Sequelize instance on the test database (for arranging and asserting rows), apart from the
 * app's own: tests reach PostgreSQL through Sequelize like the app does (only lib/db.ts imports pg).
 */
export function db(): Sequelize {
  instance ??= new Sequelize(inject('databaseUrl'), { logging: false, pool: { max: 4, min: 0, idle: 1_000 } });
  return instance;
}

/**
 * Runs one statement with positional `$1, $2 …` values (bound, never spliced) and returns its
 * rows (an INSERT/UPDATE returns rows only with RETURNING). Values as `pg` takes them: arrays bind
 * as PostgreSQL arrays, objects as JSON, undefined as NULL.
 */
export async function sql<T = Record<string, unknown>>(text: string, params: unknown[] = []): Promise<T[]> {
  const bind = params.length ? params.map((v) => (v === undefined ? null : v)) : undefined;
  return (await db().query(text, { bind, type: QueryTypes.SELECT })) as T[];
}

/** A supertest agent holding a signed-in session cookie. */
export async function signIn(email: string, password = TEST_PASSWORD) {
  // Every request carries the app's own Origin, as a browser's writes do.
  const agent = request.agent(inject('baseUrl')).set('Origin', inject('baseUrl'));
  const csrf = await agent.get('/api/auth/csrf').expect(200);
  const res = await agent
    .post('/api/auth/callback/credentials')
    .type('form')
    .send({ csrfToken: csrf.body.csrfToken, email, password, json: 'true' });
  if (res.status !== 200 || String(res.body?.url ?? '').includes('error=')) {
    throw new Error(`sign-in failed for ${email}: ${res.status} ${JSON.stringify(res.body)}`);
  }
  // Every answer this agent gets is held to the API contract (tests/support/contract.ts).
  return checkedClient(agent);
}

let seq = 0;
const uniq = () => `${Date.now().toString(36)}${(seq++).toString(36)}${Math.random().toString(36).slice(2, 6)}`;

export type Role = 'admin' | 'treasurer' | 'brewer' | 'member';

/** Inserts a co-op and returns { id, slug }. */
export async function makeCoop(overrides: { units?: 'us' | 'metric'; settings?: object; name?: string } = {}) {
  const slug = `t-${uniq()}`;
  const [row] = await sql<{ id: number; slug: string }>(
    `INSERT INTO coops (name, slug, units, settings) VALUES ($1, $2, $3, $4) RETURNING id, slug`,
    [overrides.name ?? `Test Co-op ${slug}`, slug, overrides.units ?? 'us', JSON.stringify(overrides.settings ?? {})],
  );
  return row!;
}

/** Inserts a user (password TEST_PASSWORD), optionally with a membership. */
export async function makeUser(
  opts: { coopId?: number; role?: Role; status?: 'active' | 'suspended'; name?: string } = {},
) {
  const email = `u-${uniq()}@example.test`;
  const [u] = await sql<{ id: number }>(
    `INSERT INTO users (email, name, password_hash) VALUES ($1, $2, $3) RETURNING id`,
    [email, opts.name ?? 'Test Person', HASH],
  );
  let membershipId: number | undefined;
  if (opts.coopId) {
    const [m] = await sql<{ id: number }>(
      `INSERT INTO memberships (coop_id, user_id, role, status) VALUES ($1, $2, $3, $4) RETURNING id`,
      [opts.coopId, u!.id, opts.role ?? 'member', opts.status ?? 'active'],
    );
    membershipId = m!.id;
  }
  return { id: u!.id, email, membershipId };
}

/** A co-op with one signed-in agent per role, plus an outsider who belongs to another co-op. */
export async function makeCoopWithRoles() {
  const coop = await makeCoop();
  const other = await makeCoop();
  const users = {
    admin: await makeUser({ coopId: coop.id, role: 'admin' }),
    treasurer: await makeUser({ coopId: coop.id, role: 'treasurer' }),
    brewer: await makeUser({ coopId: coop.id, role: 'brewer' }),
    member: await makeUser({ coopId: coop.id, role: 'member' }),
    outsider: await makeUser({ coopId: other.id, role: 'admin' }),
  };
  const agents = {
    admin: await signIn(users.admin.email),
    treasurer: await signIn(users.treasurer.email),
    brewer: await signIn(users.brewer.email),
    member: await signIn(users.member.email),
    outsider: await signIn(users.outsider.email),
  };
  return { coop, other, users, agents };
}

export interface CaughtMail {
  id: number;
  messageId: string;
  to: string;
  from: string;
  subject: string;
  text: string;
  attachments: { filename: string; contentType: string; size: number }[];
}

/** Messages caught by the local SMTP catcher, newest first. */
export async function caughtMail(to?: string): Promise<CaughtMail[]> {
  const all = (await (await fetch(`${inject('mailUrl')}/api/messages`)).json()) as CaughtMail[];
  return to ? all.filter((m) => m.to.toLowerCase().includes(to.toLowerCase())) : all;
}

/** Waits until a message to `to` arrives (mail is sent asynchronously in some flows). */
export async function waitForMail(
  to: string,
  match: (m: CaughtMail) => boolean = () => true,
  timeoutMs = 10_000,
): Promise<CaughtMail> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const m = (await caughtMail(to)).find(match);
    if (m) return m;
    if (Date.now() > end) throw new Error(`no e-mail to ${to} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Counts rows of a table (for "nothing written" checks). */
export async function countRows(table: string, where = 'true', params: unknown[] = []): Promise<number> {
  const [r] = await sql<{ n: string }>(`SELECT count(*)::text AS n FROM ${table} WHERE ${where}`, params);
  return Number(r!.n);
}

/**
 * Runs one of the operator's scripts (`scripts/<name>.mjs`) as a separate process, as an operator
 * would, against the test database plus `env`; resolves to its exit code and output.
 */
export async function runScript(name: string, args: string[], env: Record<string, string> = {}) {
  const run = promisify(execFile);
  const fullEnv = { ...process.env, DATABASE_URL: inject('databaseUrl'), ...env };
  try {
    const { stdout, stderr } = await run(process.execPath, [`scripts/${name}.mjs`, ...args], { env: fullEnv });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const r = e as { code: number; stdout: string; stderr: string };
    return { code: r.code, stdout: r.stdout, stderr: r.stderr };
  }
}

/** A supertest body parser that keeps the raw bytes (supertest buffers only JSON and text by default). */
export function binary(res: unknown, cb: (err: Error | null, body: Buffer) => void) {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => cb(null, Buffer.concat(chunks)));
}
