// The worker's timed jobs (every minute: lapsed reservations; every five: housekeeping). The test
// stack leaves them unscheduled (JOB_SCHEDULES=off) so nothing lands inside another test's
// before/after comparison; here their functions run in-process against the test database.
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { countRows, makeCoop, makeUser, sql } from '../support/api';

describe('timed jobs', () => {
  let jobs: typeof import('@/lib/jobs/worker');
  let db: typeof import('@/lib/db');
  beforeAll(async () => {
    process.env.DATABASE_URL = inject('databaseUrl');
    jobs = await import('@/lib/jobs/worker');
    db = await import('@/lib/db');
  });
  afterAll(async () => {
    await db?.sequelize.close();
  });

  it('expiry: every co-op’s lapsed reservations expire once, release their litres and are audited; open ones stay', async () => {
    const made = [];
    for (let i = 0; i < 2; i++) {
      const coop = await makeCoop();
      const member = await makeUser({ coopId: coop.id, role: 'member' });
      const [tank] = await sql<{ id: number }>(
        `WITH t AS (INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, value_cents, reserved_liters) VALUES ($1, 'Main', 1000, 500, 100000, 30) RETURNING id, coop_id, on_hand_liters),
              l AS (INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, on_hand_liters FROM t)
         SELECT id FROM t`,
        [coop.id],
      );
      const reserve = async (windowEnd: string) =>
        (
          await sql<{ id: number }>(
            `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end)
           VALUES ($1, $2, $3, $4, now() - interval '3 days', ${windowEnd}) RETURNING id`,
            [coop.id, tank!.id, member.membershipId, i === 0 ? 10 : 20],
          )
        )[0]!.id;
      made.push({
        coop,
        tankId: tank!.id,
        lapsed: await reserve(`now() - interval '1 hour'`),
        open: await reserve(`now() + interval '1 day'`),
        liters: i === 0 ? 10 : 20,
      });
    }
    expect(await jobs.expireReservations()).toBeGreaterThanOrEqual(2);
    for (const m of made) {
      const rows = await sql<{ id: number; status: string }>(
        'SELECT id, status FROM reservations WHERE coop_id = $1 ORDER BY id',
        [m.coop.id],
      );
      expect(rows).toEqual([
        { id: m.lapsed, status: 'expired' },
        { id: m.open, status: 'open' },
      ]);
      const [tank] = await sql<{ reserved_liters: string }>('SELECT reserved_liters FROM tanks WHERE id = $1', [
        m.tankId,
      ]);
      expect(Number(tank!.reserved_liters)).toBeCloseTo(30 - m.liters, 3);
      expect(
        await countRows('audit_events', "coop_id = $1 AND action = 'reservation.expire' AND entity_id = $2", [
          m.coop.id,
          String(m.lapsed),
        ]),
      ).toBe(1);
    }
    // A second run finds nothing of these co-ops to do.
    await jobs.expireReservations();
    for (const m of made)
      expect(await countRows('audit_events', "coop_id = $1 AND action = 'reservation.expire'", [m.coop.id])).toBe(1);
  });

  it('housekeeping: prunes sign-in attempts older than a day and links expired over 30 days ago, keeps recent ones', async () => {
    const email = `prune-${Date.now()}@example.test`;
    const user = await makeUser();
    await sql(
      `INSERT INTO sign_in_attempts (email, address, succeeded, created_at) VALUES ($1, '', false, now() - interval '2 days'), ($1, '', false, now() - interval '1 hour')`,
      [email],
    );
    await sql(
      `INSERT INTO auth_tokens (user_id, kind, token_hash, expires_at) VALUES ($1, 'password-reset', repeat('b', 64), now() - interval '31 days'), ($1, 'password-reset', repeat('c', 64), now() - interval '1 day')`,
      [user.id],
    );
    await jobs.housekeeping();
    expect(await countRows('sign_in_attempts', 'email = $1', [email])).toBe(1);
    expect(await countRows('auth_tokens', 'user_id = $1', [user.id])).toBe(1);
  });
});
