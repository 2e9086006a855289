// Reservations racing dips: 16 workers reserve (and, when refused, cancel one of their own to
// keep the tank busy) for RACE_SECONDS while a brewer's dips alternately raise and lower the
// stock. The guard is on the tank row being updated (lib/tank/reservations/queries), so every
// reservation is answered 201 or 409 — never a 5xx from the CHECK reserved ≤ on hand — and at the
// end the tank agrees with its reservations and its ledger.
import { beforeAll, describe, expect, it } from 'vitest';
import { makeCoopWithRoles, makeUser, signIn, sql } from '../support/api';
import { prng } from '../support/prng';

/**
 * How long the race runs. The issue asks for 20 s; the default is 10 s so the integration suite
 * stays within CI's time budget on a shared 2-core runner (every second here is ~16 requests in
 * flight against one server). Set RESERVATION_RACE_SECONDS=20 for the full run.
 */
const RACE_SECONDS = Number(process.env.RESERVATION_RACE_SECONDS ?? 10);
const WORKERS = 16;

describe(`${WORKERS} workers reserving for ${RACE_SECONDS} s while dips raise and lower the stock`, () => {
  let slug: string;
  let tankId: number;
  let brewer: Awaited<ReturnType<typeof signIn>>;
  let agents: Awaited<ReturnType<typeof signIn>>[];

  beforeAll(async () => {
    const ctx = await makeCoopWithRoles();
    slug = ctx.coop.slug;
    brewer = ctx.agents.brewer;
    tankId = (await brewer.post(`/api/coops/${slug}/tanks`).send({ name: 'Raced tank', capacity: '1000' }).expect(201))
      .body.id;
    await brewer
      .post(`/api/coops/${slug}/tanks/${tankId}/dips`)
      .send({ measured: '200', reason: 'Opening balance', unitCost: '3.00' })
      .expect(201);
    // Eight members, two workers each (a member's requests also race each other).
    const members = [ctx.agents.member];
    for (let i = 0; i < 7; i++)
      members.push(await signIn((await makeUser({ coopId: ctx.coop.id, role: 'member' })).email));
    agents = Array.from({ length: WORKERS }, (_, i) => members[i % members.length]!);
  });

  it(
    'answers every reservation 201 or 409 and keeps reserved = open reservations ≤ on hand = ledger',
    async () => {
      const url = `/api/coops/${slug}`;
      const today = new Date().toISOString().slice(0, 10);
      const until = new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10);
      const sizes = ['0.5', '1', '2.5', '4', '7.5', '12'];
      const deadline = Date.now() + RACE_SECONDS * 1000;
      const reserveStatuses: number[] = [];
      const cancelStatuses: number[] = [];
      const dipStatuses: number[] = [];
      const failures: string[] = [];

      const worker = async (w: number) => {
        const rnd = prng(1000 + w);
        const agent = agents[w]!;
        const mine: number[] = [];
        while (Date.now() < deadline) {
          const quantity = sizes[Math.floor(rnd() * sizes.length)]!;
          const r = await agent
            .post(`${url}/reservations`)
            .send({ tankId, quantity, windowStart: today, windowEnd: until });
          reserveStatuses.push(r.status);
          if (r.status === 201) mine.push(r.body.id);
          else if (r.status !== 409) failures.push(`reserve ${r.status}: ${JSON.stringify(r.body)}`);
          if (r.status === 409 && mine.length > 0) {
            const id = mine.splice(Math.floor(rnd() * mine.length), 1)[0]!;
            const c = await agent.post(`${url}/reservations/${id}/cancel`);
            cancelStatuses.push(c.status);
            if (c.status !== 200) failures.push(`cancel ${c.status}: ${JSON.stringify(c.body)}`);
          }
        }
      };
      // Dips alternate between 300 gal and 150 gal: raising always works; lowering is refused (409)
      // whenever more than 150 gal is reserved at that moment.
      const dips = async () => {
        for (let i = 0; Date.now() < deadline; i++) {
          const measured = i % 2 === 0 ? '300' : '150';
          const r = await brewer
            .post(`${url}/tanks/${tankId}/dips`)
            .send({ measured, reason: i % 2 === 0 ? 'Batch top-up' : 'Recount' });
          dipStatuses.push(r.status);
          if (r.status !== 201 && r.status !== 409) failures.push(`dip ${r.status}: ${JSON.stringify(r.body)}`);
        }
      };
      await Promise.all([...Array.from({ length: WORKERS }, (_, w) => worker(w)), dips()]);

      expect(failures, 'only 201/409 (reservations, dips) and 200 (cancels)').toEqual([]);
      expect(reserveStatuses.filter((s) => s === 201).length).toBeGreaterThan(0);
      expect(reserveStatuses.filter((s) => s === 409).length).toBeGreaterThan(0);
      expect(dipStatuses.filter((s) => s === 201).length).toBeGreaterThan(1);

      const [t] = await sql<{
        on_hand: string;
        reserved: string;
        value: string;
        ledger_q: string;
        ledger_v: string;
        open_q: string;
      }>(
        `SELECT t.on_hand_liters AS on_hand, t.reserved_liters AS reserved, t.value_cents AS value,
              (SELECT sum(quantity_liters) FROM tank_movements m WHERE m.tank_id = t.id) AS ledger_q,
              (SELECT sum(value_cents) FROM tank_movements m WHERE m.tank_id = t.id) AS ledger_v,
              (SELECT coalesce(sum(quantity_liters), 0) FROM reservations r WHERE r.tank_id = t.id AND r.status = 'open') AS open_q
       FROM tanks t WHERE t.id = $1`,
        [tankId],
      );
      expect(t!.reserved).toBe(t!.open_q);
      expect(Number(t!.reserved)).toBeLessThanOrEqual(Number(t!.on_hand));
      expect(t!.ledger_q).toBe(t!.on_hand);
      expect(t!.ledger_v).toBe(t!.value);
    },
    RACE_SECONDS * 1000 + 120_000,
  );
});
