// Tallyvat as several instances: the test run's server (A) and a second `next start` (B) started
// here from the same build and environment — one PostgreSQL, one storage fake, one job worker —
// driven alternately, as a round-robin load balancer would. Nothing an instance keeps in memory
// may change an answer: sessions, reservations, files, billing runs and the sign-in throttle all
// live in PostgreSQL or the object store.
import fs from 'node:fs';
import path from 'node:path';
import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
// @ts-expect-error plain ESM helpers shared with the start script
import { freePort } from '../../scripts/lib/pg.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { startNext, stopChild, waitForHealth } from '../../scripts/lib/app.mjs';
import { makeCoop, makeUser, sql, TEST_PASSWORD } from '../support/api';
import { insertBatch } from '../support/batches';
import { makeBillingCoop, monthsAgo } from '../support/billing';

let A = '';
let B = '';
let next: ChildProcess | null = null;

/** A browser's cookie jar, usable against either instance (one site behind a load balancer). */
class Client {
  private cookies = new Map<string, string>();
  /** Another client holding copies of these cookies (a stolen or second-tab cookie). */
  clone(): Client {
    const c = new Client();
    c.cookies = new Map(this.cookies);
    return c;
  }
  async fetch(base: string, url: string, init: RequestInit & { json?: unknown } = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    headers.set('origin', base);
    if (this.cookies.size) headers.set('cookie', [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '));
    let body = init.body;
    if (init.json !== undefined) {
      headers.set('content-type', 'application/json');
      body = JSON.stringify(init.json);
    }
    const res = await fetch(`${base}${url}`, { ...init, headers, body, redirect: 'manual' });
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const eq = pair!.indexOf('=');
      const name = pair!.slice(0, eq);
      const value = pair!.slice(eq + 1);
      if (/max-age=0|expires=thu, 01 jan 1970/i.test(c) || value === '') this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    return res;
  }
  json = async (base: string, url: string, init: RequestInit & { json?: unknown } = {}) => {
    const res = await this.fetch(base, url, init);
    return { status: res.status, body: (await res.json().catch(() => null)) as Record<string, any> };
  };
  /** next-auth's credentials sign-in as the sign-in form makes it; returns the HTTP status and whether it failed. */
  async signIn(base: string, email: string, password = TEST_PASSWORD) {
    const csrf = (await this.json(base, '/api/auth/csrf')).body.csrfToken as string;
    const form = new URLSearchParams({ csrfToken: csrf, email, password, json: 'true' });
    const res = await this.json(base, '/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: form,
    });
    return { status: res.status, failed: res.status !== 200 || String(res.body?.url ?? '').includes('error=') };
  }
}

async function signedIn(base: string, email: string): Promise<Client> {
  const c = new Client();
  const r = await c.signIn(base, email);
  if (r.failed) throw new Error(`sign-in failed for ${email} on ${base}: ${r.status}`);
  return c;
}

beforeAll(async () => {
  A = inject('baseUrl');
  const port = await freePort();
  B = `http://127.0.0.1:${port}`;
  // The same environment as A (APP_URL names A, as every instance behind one address would).
  const env = { ...(JSON.parse(inject('workerEnv')) as Record<string, string>), TALLYVAT_SERVICE: 'web-b' };
  const log = fs.createWriteStream(path.resolve('.data', 'test', 'next-b.log'));
  next = startNext({ env, port, host: '127.0.0.1', stdio: ['ignore', 'pipe', 'pipe'] }).child as ChildProcess;
  next.stdout?.pipe(log);
  next.stderr?.pipe(log);
  await waitForHealth(B, next, 120_000);
}, 150_000);

afterAll(async () => {
  if (next) await stopChild(next);
});

describe('two web instances behind one address', () => {
  it('a session made on A works on B, and signing out on B ends it on A', async () => {
    const coop = await makeCoop();
    const u = await makeUser({ coopId: coop.id, role: 'member' });
    const c = await signedIn(A, u.email);
    const me = await c.json(B, '/api/me');
    expect(me.status).toBe(200);
    expect(me.body.email).toBe(u.email);
    expect((await c.json(A, '/api/me')).status).toBe(200);
    const copy = c.clone();
    const csrf = (await c.json(B, '/api/auth/csrf')).body.csrfToken as string;
    const out = await c.fetch(B, '/api/auth/signout', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken: csrf, json: 'true' }),
    });
    expect(out.status).toBeLessThan(400);
    // Even a copy of the old cookie is dead on A: the session row was revoked.
    const [row] = await sql<{ revoked: boolean }>(
      `SELECT bool_and(revoked_at IS NOT NULL) AS revoked FROM sessions WHERE user_id = $1`,
      [u.id],
    );
    expect(row!.revoked).toBe(true);
    expect((await copy.json(A, '/api/me')).status).toBe(401);
    expect((await copy.json(B, '/api/me')).status).toBe(401);
  });

  it('a reservation made on B is seen on A', async () => {
    const coop = await makeCoop({ units: 'metric' });
    const brewer = await signedIn(A, (await makeUser({ coopId: coop.id, role: 'brewer' })).email);
    const member = await signedIn(A, (await makeUser({ coopId: coop.id, role: 'member' })).email);
    const base = `/api/coops/${coop.slug}`;
    const tank = await brewer.json(A, `${base}/tanks`, {
      method: 'POST',
      json: { name: 'Shared tank', capacity: '500' },
    });
    expect(tank.status).toBe(201);
    expect(
      (
        await brewer.json(B, `${base}/tanks/${tank.body.id}/dips`, {
          method: 'POST',
          json: { measured: '100', reason: 'Opening balance', unitCost: '3.00' },
        })
      ).status,
    ).toBe(201);
    const today = new Date().toISOString().slice(0, 10);
    const r = await member.json(B, `${base}/reservations`, {
      method: 'POST',
      json: { tankId: tank.body.id, quantity: '12.5', windowStart: today, windowEnd: today },
    });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const seen = await brewer.json(A, `${base}/reservations`);
    expect(seen.status).toBe(200);
    expect(seen.body.items.map((x: { id: number }) => x.id)).toContain(r.body.id);
    const tanks = await member.json(A, `${base}/tanks`);
    expect(tanks.body.tanks.find((x: { id: number }) => x.id === tank.body.id)).toMatchObject({
      onHand: 100,
      reserved: 12.5,
      available: 87.5,
    });
  });

  it('a file uploaded on A downloads from B with the same bytes and headers, and only for its co-op', async () => {
    const coop = await makeCoop();
    const other = await makeCoop();
    const brewer = await signedIn(A, (await makeUser({ coopId: coop.id, role: 'brewer' })).email);
    const outsider = await signedIn(A, (await makeUser({ coopId: other.id, role: 'admin' })).email);
    const batchId = await insertBatch(coop.id, { number: 1 });
    const pdf = Buffer.from(`%PDF-1.4\n% lab report ${Date.now()}\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n`);
    const form = new FormData();
    form.set('purpose', 'lab-report');
    form.set('file', new Blob([pdf], { type: 'application/pdf' }), 'lab.pdf');
    const files = `/api/coops/${coop.slug}/batches/${batchId}/files`;
    const up = await brewer.json(A, files, { method: 'POST', body: form });
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    const got = await brewer.fetch(B, `${files}/${up.body.id}`);
    expect(got.status).toBe(200);
    expect(Buffer.from(await got.arrayBuffer()).equals(pdf)).toBe(true);
    expect(got.headers.get('content-type')).toBe('application/pdf');
    expect(got.headers.get('content-disposition')).toBe('attachment; filename="lab.pdf"');
    expect(got.headers.get('x-content-type-options')).toBe('nosniff');
    expect(got.headers.get('content-security-policy')).toMatch(/sandbox/);
    expect(got.headers.get('cache-control')).toBe('private, no-store');
    expect((await outsider.fetch(B, `/api/coops/${other.slug}/batches/${batchId}/files/${up.body.id}`)).status).toBe(
      404,
    );
  });

  it('a billing run started on A is followed to the end on B (the worker builds it)', async () => {
    const c = await makeBillingCoop({ dues: 1500, members: ['Ada Two', 'Bo Two', 'Cy Two'] });
    const treasurer = await signedIn(A, c.treasurer.email);
    const period = monthsAgo(1);
    const base = `/api/coops/${c.coop.slug}/billing`;
    const started = await treasurer.json(A, `${base}/runs`, { method: 'POST', json: { period } });
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    let run: Record<string, any> = started.body.run;
    for (let i = 0; i < 300 && run.status === 'running'; i++) {
      await new Promise((r) => setTimeout(r, 100));
      const r = await treasurer.json(B, `${base}/runs/${run.id}`);
      expect(r.status).toBe(200);
      run = r.body.run;
    }
    expect(run.status).toBe('completed');
    expect(run.totalMembers).toBeGreaterThanOrEqual(3);
    expect(run.doneMembers).toBe(run.totalMembers);
    // What B reported is what the worker wrote.
    const [drafts] = await sql<{ n: number }>(
      `SELECT count(*)::int AS n FROM invoices WHERE coop_id = $1 AND status = 'draft'`,
      [c.coop.id],
    );
    expect(run.drafts).toBe(drafts!.n);
    expect(drafts!.n).toBeGreaterThanOrEqual(3);
    expect((await treasurer.json(A, `${base}/periods/${period}`)).status).toBe(200);
  });

  it('the sign-in throttle counts failures on both instances together', async () => {
    const coop = await makeCoop();
    const u = await makeUser({ coopId: coop.id });
    try {
      for (let i = 1; i <= 10; i++) {
        const r = await new Client().signIn(i % 2 ? A : B, u.email, `wrong-password-${i}-xx`);
        expect(r.status, `attempt ${i}`).not.toBe(429);
        expect(r.failed).toBe(true);
      }
      // The 11th, with the right password, is refused on either instance.
      expect((await new Client().signIn(B, u.email)).status).toBe(429);
      expect((await new Client().signIn(A, u.email)).status).toBe(429);
    } finally {
      await sql('DELETE FROM sign_in_attempts WHERE email = $1', [u.email]);
    }
  });

  it(
    '200 concurrent reservations split across both instances never oversell the tank',
    { timeout: 120_000 },
    async () => {
      const coop = await makeCoop({ units: 'metric' });
      const brewer = await signedIn(A, (await makeUser({ coopId: coop.id, role: 'brewer' })).email);
      const members: Client[] = [];
      for (let i = 0; i < 10; i++)
        members.push(await signedIn(i % 2 ? B : A, (await makeUser({ coopId: coop.id, role: 'member' })).email));
      const base = `/api/coops/${coop.slug}`;
      const tank = await brewer.json(A, `${base}/tanks`, {
        method: 'POST',
        json: { name: 'Race tank', capacity: '1000' },
      });
      expect(
        (
          await brewer.json(B, `${base}/tanks/${tank.body.id}/dips`, {
            method: 'POST',
            json: { measured: '150', reason: 'Opening balance', unitCost: '3.00' },
          })
        ).status,
      ).toBe(201);
      const today = new Date().toISOString().slice(0, 10);
      const statuses = await Promise.all(
        Array.from({ length: 200 }, async (_, i) => {
          const r = await members[i % members.length]!.json(i % 2 ? B : A, `${base}/reservations`, {
            method: 'POST',
            json: { tankId: tank.body.id, quantity: '1', windowStart: today, windowEnd: today },
          });
          return r.status;
        }),
      );
      const count = (s: number) => statuses.filter((x) => x === s).length;
      expect(
        statuses.filter((s) => s !== 201 && s !== 409),
        'only 201 or 409',
      ).toEqual([]);
      expect(count(201)).toBe(150);
      expect(count(409)).toBe(50);
      const [t] = await sql<{ on_hand: string; reserved: string; open: string }>(
        `SELECT t.on_hand_liters::text AS on_hand, t.reserved_liters::text AS reserved,
              (SELECT COALESCE(sum(quantity_liters), 0)::text FROM reservations r WHERE r.tank_id = t.id AND r.status = 'open') AS open
         FROM tanks t WHERE t.id = $1`,
        [tank.body.id],
      );
      expect(Number(t!.reserved)).toBe(150);
      expect(Number(t!.open)).toBe(150);
      expect(Number(t!.reserved)).toBeLessThanOrEqual(Number(t!.on_hand));
    },
  );
});
