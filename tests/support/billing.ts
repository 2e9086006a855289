// Factories and helpers for the billing tests: a co-op with named members, a tank and draws
// inserted directly with SQL (amounts locked as the draw screens would lock them), runs driven
// through the API, and the payments fake's test controls.
import crypto from 'node:crypto';
import { expect, inject } from 'vitest';
import { makeCoop, makeUser, signIn, sql } from './api';

export const WEBHOOK_SECRET = 'whsec_tallyvat_test';

/** 'YYYY-MM' n months before the current month in Chicago (the test co-ops' time zone). */
export function monthsAgo(n: number): string {
  const now = new Intl.DateTimeFormat('en-CA', {
    timeZone: 'America/Chicago',
    year: 'numeric',
    month: '2-digit',
  }).format(new Date());
  const [y, m] = now.split('-').map(Number) as [number, number];
  const d = new Date(Date.UTC(y, m - 1 - n, 1));
  return `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`;
}

/** Noon on a day of a month in Chicago, as an ISO instant. */
export const dayIn = (period: string, day: number) =>
  new Date(`${period}-${String(day).padStart(2, '0')}T18:00:00Z`).toISOString();

type Agent = Awaited<ReturnType<typeof signIn>>;

/**
 * A co-op (US units, Chicago) with monthly dues, a treasurer and members with the given names
 * (so invoice numbers, ordered by name, are predictable). Everyone joined long ago.
 */
export async function makeBillingCoop(opts: { dues?: number; members: string[]; units?: 'us' | 'metric' }) {
  const coop = await makeCoop({ settings: { monthlyDuesCents: opts.dues ?? 0 }, units: opts.units });
  const treasurer = await makeUser({ coopId: coop.id, role: 'treasurer', name: 'Zed Treasurer' });
  const members: Record<string, { id: number; email: string; membershipId: number }> = {};
  for (const name of opts.members) {
    const u = await makeUser({ coopId: coop.id, role: 'member', name });
    members[name] = { id: u.id, email: u.email, membershipId: u.membershipId! };
  }
  await sql(`UPDATE memberships SET joined_at = '2020-01-01' WHERE coop_id = $1`, [coop.id]);
  const [tank] = await sql<{ id: number }>(
    `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Main tank', 1000) RETURNING id`,
    [coop.id],
  );
  return { coop, treasurer, members, tankId: tank!.id, treasurerAgent: await signIn(treasurer.email) };
}

/** Inserts a draw with hand-computed locked amounts (total = fuel + surcharge + tax). */
export async function insertDraw(o: {
  coopId: number;
  tankId: number;
  membershipId: number;
  liters: string;
  occurredAt: string;
  use?: 'road' | 'off-road' | 'heating';
  unitPrice: number;
  surchargeRate?: number;
  taxRate?: number;
  fuelCents: number;
  surchargeCents?: number;
  taxCents?: number;
  reverses?: number;
}): Promise<number> {
  const s = o.surchargeCents ?? 0;
  const t = o.taxCents ?? 0;
  const [d] = await sql<{ id: number }>(
    `INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, unit_price_cents_per_gallon, surcharge_cents_per_gallon,
       road_tax_cents_per_gallon, fuel_cents, surcharge_cents, tax_cents, total_cents, reverses_draw_id, occurred_at)
     VALUES ($1,$2,$3,$4,$5,$6,$7,$8,$9,$10,$11,$12,$13,$14) RETURNING id`,
    [
      o.coopId,
      o.tankId,
      o.membershipId,
      o.liters,
      o.use ?? 'road',
      o.unitPrice,
      o.surchargeRate ?? 0,
      o.taxRate ?? 0,
      o.fuelCents,
      s,
      t,
      o.fuelCents + s + t,
      o.reverses ?? null,
      o.occurredAt,
    ],
  );
  return d!.id;
}

/** Starts the month's run through the API and waits until it has finished. */
export async function runMonth(agent: Agent, slug: string, period: string, memberIds?: number[]) {
  const res = await agent.post(`/api/coops/${slug}/billing/runs`).send(memberIds ? { period, memberIds } : { period });
  expect([200, 202], JSON.stringify(res.body)).toContain(res.status);
  return waitForRun(agent, slug, res.body.run.id as number);
}

export async function waitForRun(agent: Agent, slug: string, runId: number) {
  for (let i = 0; i < 600; i++) {
    const r = await agent.get(`/api/coops/${slug}/billing/runs/${runId}`).expect(200);
    if (r.body.run.status !== 'running') {
      expect(r.body.run.status, JSON.stringify(r.body.run)).toBe('completed');
      return r.body.run as { id: number; totalMembers: number; doneMembers: number; drafts: number };
    }
    await new Promise((res) => setTimeout(res, 100));
  }
  throw new Error('run did not finish');
}

export async function issueMonth(agent: Agent, slug: string, period: string) {
  const res = await agent.post(`/api/coops/${slug}/billing/periods/${period}/issue`).send({});
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as { issued: number; firstNumber: string; lastNumber: string };
}

/** The invoice rows of a co-op's month straight from the database. */
export async function invoicesOf(coopId: number, period: string) {
  return sql<{
    id: number;
    membership_id: number;
    number: number | null;
    status: string;
    kind: string;
    total_cents: string;
    paid_cents: string;
  }>(
    `SELECT id, membership_id, number, status, kind, total_cents, paid_cents FROM invoices WHERE coop_id = $1 AND period = $2::date ORDER BY number NULLS LAST, id`,
    [coopId, `${period}-01`],
  );
}

// ── The payments fake's test controls ──
const fake = (path: string) => `${inject('paymentsUrl')}${path}`;
const postJson = (path: string, body: unknown) =>
  fetch(fake(path), { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

export async function fakeCharges(): Promise<
  { id: string; amount: number; metadata: Record<string, string>; idempotencyKey: string | null }[]
> {
  return (await fetch(fake('/__fake/charges'))).json();
}
export const setOutage = (down: boolean, mode: '503' | 'lose-response' = '503') =>
  postJson('/__fake/outage', { down, mode });
export const holdWebhooks = (hold: boolean) => postJson('/__fake/webhooks', { hold });
export async function heldEvents(): Promise<{ id: string; type: string; payload: string; signature: string }[]> {
  return (await fetch(fake('/__fake/webhooks/held'))).json();
}
export const clearHeld = () => fetch(fake('/__fake/webhooks/held'), { method: 'DELETE' });

/** Signs a payload the way the payments service does (t=…,v1=HMAC-SHA256 of "t.payload"), computed independently of the SDK. */
export function signPayload(payload: string, secret = WEBHOOK_SECRET, at = Math.floor(Date.now() / 1000)): string {
  const v1 = crypto.createHmac('sha256', secret).update(`${at}.${payload}`).digest('hex');
  return `t=${at},v1=${v1}`;
}
