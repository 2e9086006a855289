// Ledger invariants after a long random sequence (seeded, so a failure replays) of everything
// that moves fuel or claims it, all through the real routes: valued inflows (dip gains),
// losses, reservations, cancellations, draws (walk-up and against reservations), reversals and
// transfers. Afterwards, for every tank: on hand = sum of the ledger; value = sum of the ledger;
// each row's running totals follow from the one before; reserved = open reservations; and the
// moving-average cost matches an independent replay with lib/costing recomputeMovingAverage.
import { beforeAll, describe, expect, it } from 'vitest';
import { averageCostCentsPerLiter, recomputeMovingAverage, type TankMovement } from '@/lib/costing';
import { LITERS_PER_US_GALLON } from '@/lib/units';
import { makeCoopWithRoles, makeUser, signIn, sql } from '../support/api';
import { prng } from '../support/prng';

const STEPS = 300;

describe('tank ledger after a long random sequence', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let members: { membershipId: number; agent: Awaited<ReturnType<typeof signIn>> }[];
  let tanks: number[];
  const P = () => `/api/coops/${ctx.coop.slug}`;

  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    tanks = [];
    for (const [name, cap] of [
      ['East', '400'],
      ['West', '250'],
    ] as const) {
      tanks.push((await ctx.agents.brewer.post(`${P()}/tanks`).send({ name, capacity: cap }).expect(201)).body.id);
    }
    await ctx.agents.treasurer
      .post(`${P()}/pricing`)
      .send({ kind: 'cost-plus-percent', marginPct: '12.5', surchargeCents: '7.5', roadTaxCents: '24.4' })
      .expect(201);
    members = [{ membershipId: ctx.users.member.membershipId!, agent: ctx.agents.member }];
    for (let i = 0; i < 2; i++) {
      const u = await makeUser({ coopId: ctx.coop.id, role: 'member' });
      members.push({ membershipId: u.membershipId!, agent: await signIn(u.email) });
    }
  });

  it('keeps on hand, value, reserved and the average cost consistent with the ledger', async () => {
    const rnd = prng(5150);
    const pick = <T>(xs: T[]) => xs[Math.floor(rnd() * xs.length)]!;
    const qty = (lo: number, hi: number) => (lo + rnd() * (hi - lo)).toFixed(3);
    const tally: Record<string, Record<number, number>> = {};
    const seen = (op: string, status: number) => {
      tally[op] ??= {};
      tally[op][status] = (tally[op][status] ?? 0) + 1;
    };
    const book = async (tankId: number) =>
      (await ctx.agents.brewer.get(`${P()}/tanks/${tankId}`).expect(200)).body as {
        onHand: number;
        reserved: number;
        capacity: number;
      };

    for (let step = 0; step < STEPS; step++) {
      const op = pick([
        'inflow',
        'inflow',
        'loss',
        'reserve',
        'reserve',
        'reserve',
        'cancel',
        'draw',
        'draw',
        'draw-res',
        'reverse',
        'transfer',
      ]);
      const tankId = pick(tanks);
      let res: { status: number; body: Record<string, unknown> };
      switch (op) {
        case 'inflow': {
          const b = await book(tankId);
          const measured = Math.min(b.capacity, b.onHand + Number(qty(5, 60)));
          res = await ctx.agents.brewer
            .post(`${P()}/tanks/${tankId}/dips`)
            .send({ measured: measured.toFixed(3), reason: 'Batch top-up', unitCost: (2.5 + rnd() * 1.5).toFixed(2) });
          break;
        }
        case 'loss': {
          const b = await book(tankId);
          // A reading can't exceed the tank (a reversal may have put the book over it).
          const measured = Math.min(b.capacity, Math.max(0, b.onHand - Number(qty(0.1, 8))));
          res = await ctx.agents.brewer
            .post(`${P()}/tanks/${tankId}/dips`)
            .send({ measured: measured.toFixed(3), reason: 'Evaporation' });
          break;
        }
        case 'reserve': {
          const m = pick(members);
          res = await m.agent
            .post(`${P()}/reservations`)
            .send({ tankId, quantity: qty(0.5, 25), windowStart: day(0), windowEnd: day(2) });
          break;
        }
        case 'cancel': {
          const open = await sql<{ id: number; membership_id: number }>(
            "SELECT id, membership_id FROM reservations WHERE coop_id = $1 AND status = 'open'",
            [ctx.coop.id],
          );
          if (open.length === 0) continue;
          const r = pick(open);
          const owner = members.find((m) => m.membershipId === r.membership_id)!;
          res = await owner.agent.post(`${P()}/reservations/${r.id}/cancel`);
          break;
        }
        case 'draw': {
          res = await ctx.agents.brewer.post(`${P()}/draws`).send({
            membershipId: pick(members).membershipId,
            tankId,
            quantity: qty(0.2, 20),
            declaredUse: pick(['road', 'off-road', 'heating']),
          });
          break;
        }
        case 'draw-res': {
          const open = await sql<{ id: number; membership_id: number; tank_id: number; quantity_liters: string }>(
            "SELECT id, membership_id, tank_id, quantity_liters FROM reservations WHERE coop_id = $1 AND status = 'open'",
            [ctx.coop.id],
          );
          if (open.length === 0) continue;
          const r = pick(open);
          // Sometimes less than reserved, sometimes more (then the extra must be available).
          const gal = (Number(r.quantity_liters) / LITERS_PER_US_GALLON) * (0.5 + rnd() * 0.8);
          const before = 1000 + rnd() * 5000;
          res = await ctx.agents.admin.post(`${P()}/draws`).send({
            membershipId: r.membership_id,
            tankId: r.tank_id,
            reservationId: r.id,
            meterBefore: before.toFixed(3),
            meterAfter: (before + Math.max(0.01, gal)).toFixed(3),
            declaredUse: 'road',
          });
          break;
        }
        case 'reverse': {
          const ds = await sql<{ id: number }>(
            'SELECT d.id FROM draws d WHERE d.coop_id = $1 AND d.reverses_draw_id IS NULL AND NOT EXISTS (SELECT 1 FROM draws x WHERE x.reverses_draw_id = d.id)',
            [ctx.coop.id],
          );
          if (ds.length === 0) continue;
          res = await ctx.agents.brewer.post(`${P()}/draws/${pick(ds).id}/reverse`).send({ reason: 'Meter misread' });
          break;
        }
        case 'transfer': {
          const [from, to] = rnd() < 0.5 ? [tanks[0]!, tanks[1]!] : [tanks[1]!, tanks[0]!];
          res = await ctx.agents.brewer
            .post(`${P()}/tanks/transfers`)
            .send({ fromTankId: from, toTankId: to, quantity: qty(0.5, 30) });
          break;
        }
        default:
          continue;
      }
      seen(op, res.status);
      expect(res.status, `step ${step} ${op}: ${JSON.stringify(res.body)}`).toBeLessThan(500);
      expect([200, 201, 409], `step ${step} ${op}: ${JSON.stringify(res.body)}`).toContain(res.status);
    }
    // The sequence really exercised every operation, successfully.
    for (const op of ['inflow', 'loss', 'reserve', 'cancel', 'draw', 'draw-res', 'reverse', 'transfer']) {
      expect((tally[op]?.[200] ?? 0) + (tally[op]?.[201] ?? 0), `${op}: ${JSON.stringify(tally[op])}`).toBeGreaterThan(
        0,
      );
    }

    for (const tankId of tanks) {
      const [t] = await sql<{ on_hand_liters: string; reserved_liters: string; value_cents: string }>(
        'SELECT on_hand_liters, reserved_liters, value_cents FROM tanks WHERE id = $1',
        [tankId],
      );
      const rows = await sql<{
        kind: string;
        quantity_liters: string;
        value_cents: string;
        on_hand_after_liters: string;
        value_after_cents: string;
      }>(
        'SELECT kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents FROM tank_movements WHERE tank_id = $1 ORDER BY id',
        [tankId],
      );
      const ml = (s: string) => Math.round(Number(s) * 1000);
      // Running totals, row by row, in whole millilitres and cents.
      let onHand = 0;
      let value = 0;
      for (const r of rows) {
        onHand += ml(r.quantity_liters);
        value += Number(r.value_cents);
        expect(ml(r.on_hand_after_liters)).toBe(onHand);
        expect(Number(r.value_after_cents)).toBe(value);
        expect(onHand).toBeGreaterThanOrEqual(0);
      }
      expect(ml(t!.on_hand_liters)).toBe(onHand);
      expect(Number(t!.value_cents)).toBe(value);
      const [open] = await sql<{ q: string }>(
        "SELECT coalesce(sum(quantity_liters), 0) AS q FROM reservations WHERE tank_id = $1 AND status = 'open'",
        [tankId],
      );
      expect(ml(t!.reserved_liters)).toBe(ml(open!.q));
      expect(ml(t!.reserved_liters)).toBeLessThanOrEqual(onHand);

      // Independent replay: inflows bring the value on their row; outflows leave at the
      // moving-average cost computed by lib/costing (its own rounding, lib/money's rule).
      const movements: TankMovement[] = rows.map((r) =>
        ml(r.quantity_liters) > 0
          ? { kind: 'in', liters: Number(r.quantity_liters), valueCents: Number(r.value_cents) }
          : { kind: 'out', liters: -Number(r.quantity_liters) },
      );
      const replay = recomputeMovingAverage(movements);
      replay.steps.forEach((s, i) => {
        if (s.movement.kind === 'out')
          expect(-Number(rows[i]!.value_cents), `row ${i} ${rows[i]!.kind}`).toBe(s.valueCents);
      });
      expect(replay.state.totalValueCents).toBe(value);
      expect(Math.round(replay.state.qtyLiters * 1000)).toBe(onHand);
      const api = (await ctx.agents.treasurer.get(`${P()}/tanks/${tankId}`).expect(200)).body as {
        avgCostCentsPerGallon: number | null;
      };
      const perLiter = averageCostCentsPerLiter(replay.state);
      if (perLiter === null) expect(api.avgCostCentsPerGallon).toBeNull();
      else expect(api.avgCostCentsPerGallon!).toBeCloseTo(perLiter * LITERS_PER_US_GALLON, 2);
    }

    // Every reversal nets its draw to zero; every draw's cost value is its ledger row's value.
    const pairs = await sql<{ q: string; total: string }>(
      `SELECT sum(d.quantity_liters)::text AS q, sum(d.total_cents)::text AS total FROM draws d WHERE d.coop_id = $1 AND (d.reverses_draw_id IS NOT NULL OR EXISTS (SELECT 1 FROM draws x WHERE x.reverses_draw_id = d.id))`,
      [ctx.coop.id],
    );
    expect(Number(pairs[0]!.q ?? 0)).toBe(0);
    expect(Number(pairs[0]!.total ?? 0)).toBe(0);
    const mismatched = await sql(
      `SELECT d.id FROM draws d JOIN tank_movements m ON m.draw_id = d.id WHERE d.coop_id = $1 AND d.cost_value_cents <> -m.value_cents`,
      [ctx.coop.id],
    );
    expect(mismatched).toEqual([]);
    const unpaired = await sql(
      `SELECT d.id FROM draws d WHERE d.coop_id = $1 AND NOT EXISTS (SELECT 1 FROM tank_movements m WHERE m.draw_id = d.id)`,
      [ctx.coop.id],
    );
    expect(unpaired).toEqual([]);

    // Lineage after every kind of entry: each tank's batch layers sum to its on hand, every ledger
    // row's batch shares sum to the row, and a reversal returns exactly its draw's shares.
    const layerGaps = await sql(
      `SELECT t.id FROM tanks t WHERE t.coop_id = $1 AND t.on_hand_liters <> coalesce((SELECT sum(l.quantity_liters) FROM tank_layers l WHERE l.tank_id = t.id), 0)`,
      [ctx.coop.id],
    );
    expect(layerGaps).toEqual([]);
    const shareGaps = await sql(
      `SELECT m.id FROM tank_movements m WHERE m.coop_id = $1 AND m.quantity_liters <> coalesce((SELECT sum(s.quantity_liters) FROM movement_batch_shares s WHERE s.movement_id = m.id), 0)`,
      [ctx.coop.id],
    );
    expect(shareGaps).toEqual([]);
    const reversalGaps = await sql(
      `SELECT d.id FROM draws d JOIN movement_batch_shares s ON s.draw_id = d.id WHERE d.coop_id = $1 AND d.reverses_draw_id IS NOT NULL
         AND s.quantity_liters <> -(SELECT coalesce(sum(o.quantity_liters), 0) FROM movement_batch_shares o WHERE o.draw_id = d.reverses_draw_id AND o.batch_id IS NOT DISTINCT FROM s.batch_id)`,
      [ctx.coop.id],
    );
    expect(reversalGaps).toEqual([]);
  }, 240_000);
});

function day(n: number) {
  return new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
}
