// Nobody can reserve more than is available, even when everyone reserves at once: 200
// reservation requests of mixed sizes, all in flight together from several signed-in members,
// against a tank with exactly 100 gal available. The guard is a single conditional UPDATE in
// the database (lib/tank/reservations), so the accepted total can never exceed 100 gal.
import { beforeAll, describe, expect, it } from 'vitest';
import { makeCoopWithRoles, makeUser, signIn, sql } from '../support/api';
import { prng } from '../support/prng';

const GAL_ML = 3785.411784; // 1 US gal in mL (NIST Handbook 44)
const galToMl = (milliGal: number) => Math.floor(milliGal * (GAL_ML / 1000) + 0.5);

describe('200 simultaneous reservations against 100 gal', () => {
  let slug: string;
  let coopId: number;
  let tankId: number;
  let agents: Awaited<ReturnType<typeof signIn>>[];

  beforeAll(async () => {
    const ctx = await makeCoopWithRoles();
    slug = ctx.coop.slug;
    coopId = ctx.coop.id;
    tankId = (
      await ctx.agents.brewer.post(`/api/coops/${slug}/tanks`).send({ name: 'Busy tank', capacity: '300' }).expect(201)
    ).body.id;
    await ctx.agents.brewer
      .post(`/api/coops/${slug}/tanks/${tankId}/dips`)
      .send({ measured: '100', reason: 'Opening balance', unitCost: '3.00' })
      .expect(201);
    agents = [ctx.agents.member, ctx.agents.brewer, ctx.agents.treasurer, ctx.agents.admin];
    for (let i = 0; i < 6; i++) agents.push(await signIn((await makeUser({ coopId, role: 'member' })).email));
  });

  it('accepts at most 100 gal, answers every refusal with 409 and the amount available, and keeps the totals consistent', async () => {
    const rnd = prng(20261201);
    const sizes = ['0.5', '1', '1.25', '2.5', '3', '4.75', '5', '7.5'];
    const today = new Date().toISOString().slice(0, 10);
    const until = new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10);
    const requests = Array.from({ length: 200 }, (_, i) => {
      const quantity = sizes[Math.floor(rnd() * sizes.length)]!;
      const agent = agents[i % agents.length]!;
      return {
        quantity,
        send: () =>
          agent
            .post(`/api/coops/${slug}/reservations`)
            .send({ tankId, quantity, windowStart: today, windowEnd: until }),
      };
    });
    const responses = await Promise.all(requests.map((r) => r.send()));

    const statuses = responses.map((r) => r.status);
    expect(
      statuses.filter((s) => s >= 500),
      'no 5xx',
    ).toEqual([]);
    expect(
      statuses.every((s) => s === 201 || s === 409),
      `only 201 or 409: ${[...new Set(statuses)].join(', ')}`,
    ).toBe(true);

    const acceptedMilliGal = responses.reduce(
      (sum, r, i) => (r.status === 201 ? sum + Math.round(Number(requests[i]!.quantity) * 1000) : sum),
      0,
    );
    const accepted = statuses.filter((s) => s === 201).length;
    expect(accepted).toBeGreaterThan(10);
    expect(accepted).toBeLessThan(200);
    expect(acceptedMilliGal).toBeLessThanOrEqual(100_000);

    for (const [i, r] of responses.entries()) {
      if (r.status !== 409) continue;
      expect(r.body.error).toMatch(/available/);
      expect(typeof r.body.available).toBe('number');
      expect(typeof r.body.availableLiters).toBe('number');
      // Refused because what was available at that moment could not cover the request.
      expect(Math.round(r.body.availableLiters * 1000)).toBeLessThan(
        galToMl(Math.round(Number(requests[i]!.quantity) * 1000)),
      );
    }

    // Ledger and totals: on hand = sum of the ledger; reserved = sum of open reservations ≤ on hand.
    const [t] = await sql<{
      on_hand: string;
      reserved: string;
      value: string;
      ledger_q: string;
      ledger_v: string;
      open_q: string;
      open_n: string;
    }>(
      `SELECT t.on_hand_liters AS on_hand, t.reserved_liters AS reserved, t.value_cents AS value,
              (SELECT sum(quantity_liters) FROM tank_movements m WHERE m.tank_id = t.id) AS ledger_q,
              (SELECT sum(value_cents) FROM tank_movements m WHERE m.tank_id = t.id) AS ledger_v,
              (SELECT coalesce(sum(quantity_liters), 0) FROM reservations r WHERE r.tank_id = t.id AND r.status = 'open') AS open_q,
              (SELECT count(*) FROM reservations r WHERE r.tank_id = t.id) AS open_n
       FROM tanks t WHERE t.id = $1`,
      [tankId],
    );
    expect(t!.on_hand).toBe('378.541');
    expect(t!.ledger_q).toBe(t!.on_hand);
    expect(t!.ledger_v).toBe(t!.value);
    expect(t!.reserved).toBe(t!.open_q);
    expect(Number(t!.open_n)).toBe(accepted);
    expect(Number(t!.reserved)).toBeLessThanOrEqual(Number(t!.on_hand));
    // Each accepted request left exactly one reservation of its size (in mL); only the one that
    // took the very last of the tank may be trimmed, by at most the 3 mL rounding crumb.
    const answered = responses
      .filter((r) => r.status === 201)
      .map((r) => ({ id: r.body.id as number, ml: Math.round(r.body.quantityLiters * 1000) }));
    const rows = await sql<{ id: number; q: string }>(
      'SELECT id, quantity_liters AS q FROM reservations WHERE tank_id = $1',
      [tankId],
    );
    expect(rows.map((r) => ({ id: r.id, ml: Math.round(Number(r.q) * 1000) })).sort((a, b) => a.id - b.id)).toEqual(
      answered.sort((a, b) => a.id - b.id),
    );
    const trimmed = responses
      .flatMap((r, i) =>
        r.status === 201
          ? [galToMl(Math.round(Number(requests[i]!.quantity) * 1000)) - Math.round(r.body.quantityLiters * 1000)]
          : [],
      )
      .filter((d) => d !== 0);
    expect(trimmed.length).toBeLessThanOrEqual(1);
    for (const d of trimmed) expect(d).toBeLessThanOrEqual(3);
  });
});
