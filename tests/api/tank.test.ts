// Tank, pricing, reservations and draws through the real routes (real PostgreSQL, real `next start`).
// Every route: no session 401, wrong role 403, other co-op 404, bad input 4xx with field and
// reason and nothing written, success. Money follows lib/money: integer cents, each line rounded
// half away from zero. 1 US gal = 3.785411784 L (NIST Handbook 44); volumes are stored in mL.
import { beforeAll, describe, expect, it } from 'vitest';
import { api, countRows, makeCoop, makeCoopWithRoles, makeUser, signIn, sql } from '../support/api';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;
const P = (slug: string) => `/api/coops/${slug}`;

/** Tank totals straight from the database. */
async function tankRow(id: number) {
  const [r] = await sql<{
    on_hand_liters: string;
    reserved_liters: string;
    value_cents: string;
    active: boolean;
    name: string;
  }>('SELECT on_hand_liters, reserved_liters, value_cents, active, name FROM tanks WHERE id = $1', [id]);
  return r!;
}

/** Counts of everything a tank write could touch, to prove "nothing written". */
async function snapshot(coopId: number) {
  const tables = ['tanks', 'tank_movements', 'reservations', 'draws', 'price_policies', 'dip_readings', 'audit_events'];
  const counts = await Promise.all(tables.map((t) => countRows(t, 'coop_id = $1', [coopId])));
  const totals = await sql(
    'SELECT id, on_hand_liters, reserved_liters, value_cents, name, active, capacity_liters FROM tanks WHERE coop_id = $1 ORDER BY id',
    [coopId],
  );
  return { counts, totals };
}

/** A co-op with a 500 gal tank holding 100 gal at $3.10/gal and a cost + 40 ¢ policy with 10 ¢ surcharge and 24.4 ¢ road tax. */
async function stockedCoop() {
  const ctx = await makeCoopWithRoles();
  const slug = ctx.coop.slug;
  const tank = (
    await ctx.agents.brewer
      .post(`${P(slug)}/tanks`)
      .send({ name: 'Main tank', capacity: '500' })
      .expect(201)
  ).body;
  // 100 gal = 378 541 mL; valued at 310 ¢ × 99.99995 gal = 30 999.98 → 31 000 ¢
  await ctx.agents.brewer
    .post(`${P(slug)}/tanks/${tank.id}/dips`)
    .send({ measured: '100', reason: 'Opening balance', unitCost: '3.10' })
    .expect(201);
  await ctx.agents.treasurer
    .post(`${P(slug)}/pricing`)
    .send({ kind: 'cost-plus-amount', margin: '0.40', surchargeCents: '10', roadTaxCents: '24.4' })
    .expect(201);
  return { ...ctx, slug, tankId: tank.id as number };
}

describe('tanks', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });

  it('a brewer creates a tank; capacity is entered in the co-op unit and stored in litres', async () => {
    const res = await ctx.agents.brewer
      .post(`${P(ctx.coop.slug)}/tanks`)
      .send({ name: 'Shed tank', capacity: '275' })
      .expect(201);
    expect(res.body).toMatchObject({ name: 'Shed tank', capacity: 275, onHand: 0, available: 0, active: true });
    const [row] = await sql<{ capacity_liters: string }>('SELECT capacity_liters FROM tanks WHERE id = $1', [
      res.body.id,
    ]);
    expect(row!.capacity_liters).toBe('1040.988'); // 275 × 3.785411784 = 1040.98824 L
    const audit = await countRows('audit_events', "coop_id = $1 AND action = 'tank.create'", [ctx.coop.id]);
    expect(audit).toBe(1);
  });

  it('refuses bad tank input with field reasons and writes nothing', async () => {
    const before = await snapshot(ctx.coop.id);
    const r1 = await ctx.agents.admin
      .post(`${P(ctx.coop.slug)}/tanks`)
      .send({ name: '', capacity: '0' })
      .expect(422);
    expect(r1.body.fields.name[0]).toMatch(/name/i);
    expect(r1.body.fields.capacity[0]).toMatch(/greater than zero/);
    const r2 = await ctx.agents.admin
      .post(`${P(ctx.coop.slug)}/tanks`)
      .send({ name: 'Shed tank', capacity: '100' })
      .expect(422);
    expect(r2.body.fields.name[0]).toMatch(/already has that name/);
    const r3 = await ctx.agents.admin
      .post(`${P(ctx.coop.slug)}/tanks`)
      .send({ name: 'X', capacity: '10', coopId: ctx.other.id })
      .expect(422);
    expect(r3.body.fields.coopId[0]).toMatch(/not accepted/);
    expect(await snapshot(ctx.coop.id)).toEqual(before);
  });

  it('members read tanks but cannot create them; another co-op gets 404; no session 401', async () => {
    const list = await ctx.agents.member.get(`${P(ctx.coop.slug)}/tanks`).expect(200);
    expect(list.body.tanks.map((t: { name: string }) => t.name)).toContain('Shed tank');
    await ctx.agents.member
      .post(`${P(ctx.coop.slug)}/tanks`)
      .send({ name: 'Mine', capacity: '5' })
      .expect(403);
    await ctx.agents.treasurer
      .post(`${P(ctx.coop.slug)}/tanks`)
      .send({ name: 'Mine', capacity: '5' })
      .expect(403);
    await ctx.agents.outsider.get(`${P(ctx.coop.slug)}/tanks`).expect(404);
    await api()
      .get(`${P(ctx.coop.slug)}/tanks`)
      .expect(401);
  });

  it('renames, refuses a capacity below what is on hand, and goes out of service only when empty', async () => {
    const s = await stockedCoop();
    const url = `${P(s.slug)}/tanks/${s.tankId}`;
    expect((await s.agents.brewer.patch(url).send({ name: 'North' }).expect(200)).body.name).toBe('North');
    const small = await s.agents.brewer.patch(url).send({ capacity: '50' }).expect(422);
    expect(small.body.fields.capacity[0]).toMatch(/already holds 100.0 gal/);
    const busy = await s.agents.admin.patch(url).send({ active: false }).expect(409);
    expect(busy.body.error).toMatch(/still holds/);
    expect((await tankRow(s.tankId)).active).toBe(true);
    await s.agents.member.patch(url).send({ name: 'Mine' }).expect(403);
    await s.agents.outsider.patch(url).send({ name: 'Mine' }).expect(404);
    // A tank of another co-op is a 404 by id, not a rename.
    const foreign = await s.agents.brewer
      .patch(`${P(s.slug)}/tanks/${s.tankId}`.replace(String(s.tankId), String(s.tankId + 100000)))
      .send({ name: 'x' });
    expect(foreign.status).toBe(404);
    const empty = (
      await s.agents.brewer
        .post(`${P(s.slug)}/tanks`)
        .send({ name: 'Spare', capacity: '10' })
        .expect(201)
    ).body;
    expect(
      (
        await s.agents.brewer
          .patch(`${P(s.slug)}/tanks/${empty.id}`)
          .send({ active: 'false' })
          .expect(200)
      ).body.active,
    ).toBe(false);
  });
});

describe('dip readings and transfers', () => {
  it('a dip difference becomes one gain/loss ledger row with its reason; a matching dip writes a reading only', async () => {
    const s = await stockedCoop();
    const url = `${P(s.slug)}/tanks/${s.tankId}/dips`;
    // Loss: 100 → 98 gal. 2 gal = 7570.82 → book 378 541 − measured 370 970 = −7 571 mL, valued at average cost:
    // round(31 000 × 7 571 / 378 541) = round(620.00) = 620 ¢.
    const loss = await s.agents.brewer
      .post(url)
      .send({ measured: '98', reason: 'Evaporation over summer' })
      .expect(201);
    expect(loss.body.differenceLiters).toBe(-7.571);
    const [m] = await sql<{ kind: string; quantity_liters: string; value_cents: string; reason: string }>(
      'SELECT kind, quantity_liters, value_cents, reason FROM tank_movements WHERE tank_id = $1 ORDER BY id DESC LIMIT 1',
      [s.tankId],
    );
    expect(m).toEqual({
      kind: 'dip-adjustment',
      quantity_liters: '-7.571',
      value_cents: '-620',
      reason: 'Evaporation over summer',
    });
    const movements = await countRows('tank_movements', 'tank_id = $1', [s.tankId]);
    const same = await s.agents.brewer.post(url).send({ measured: '98' }).expect(201);
    expect(same.body.movementId).toBeNull();
    expect(await countRows('tank_movements', 'tank_id = $1', [s.tankId])).toBe(movements);
    expect(await countRows('dip_readings', 'tank_id = $1', [s.tankId])).toBe(3);
  });

  it('refuses a difference without a reason, a reading above capacity, and a reading below what is reserved (409)', async () => {
    const s = await stockedCoop();
    const url = `${P(s.slug)}/tanks/${s.tankId}/dips`;
    await s.agents.member
      .post(`${P(s.slug)}/reservations`)
      .send({ tankId: s.tankId, quantity: '60', windowStart: today(), windowEnd: inDays(3) })
      .expect(201);
    const before = await snapshot(s.coop.id);
    const noReason = await s.agents.brewer.post(url).send({ measured: '90' }).expect(422);
    expect(noReason.body.fields.reason[0]).toMatch(/Say why/);
    const over = await s.agents.brewer.post(url).send({ measured: '600', reason: 'x' }).expect(422);
    expect(over.body.fields.measured[0]).toMatch(/at most 500.0 gal/);
    const below = await s.agents.brewer.post(url).send({ measured: '50', reason: 'Leak' }).expect(409);
    expect(below.body.error).toMatch(/below what members have reserved \(60.0 gal\)/);
    expect(below.body.reserved).toBe(60);
    const neg = await s.agents.brewer.post(url).send({ measured: '-1', reason: 'x' }).expect(422);
    expect(neg.body.fields.measured[0]).toMatch(/zero or more/);
    await s.agents.member.post(url).send({ measured: '90', reason: 'x' }).expect(403);
    await s.agents.outsider.post(url).send({ measured: '90', reason: 'x' }).expect(404);
    await api().post(url).send({ measured: '90', reason: 'x' }).expect(401);
    expect(await snapshot(s.coop.id)).toEqual(before);
  });

  it('a transfer writes two rows in one go and moves value at average cost; reserved fuel stays put', async () => {
    const s = await stockedCoop();
    const tote = (
      await s.agents.brewer
        .post(`${P(s.slug)}/tanks`)
        .send({ name: 'Tote', capacity: '12' })
        .expect(201)
    ).body;
    await s.agents.member
      .post(`${P(s.slug)}/reservations`)
      .send({ tankId: s.tankId, quantity: '80', windowStart: today(), windowEnd: inDays(2) })
      .expect(201);
    const url = `${P(s.slug)}/tanks/transfers`;
    const before = await snapshot(s.coop.id);
    const tooMuch = await s.agents.brewer
      .post(url)
      .send({ fromTankId: s.tankId, toTankId: tote.id, quantity: '25' })
      .expect(409);
    expect(tooMuch.body.error).toMatch(/only 20.0 gal available to move/);
    expect(tooMuch.body.available).toBe(20);
    const same = await s.agents.brewer
      .post(url)
      .send({ fromTankId: s.tankId, toTankId: s.tankId, quantity: '1' })
      .expect(422);
    expect(same.body.fields.toTankId[0]).toMatch(/two different tanks/);
    const other = await makeCoop();
    const [foreign] = await sql<{ id: number }>(
      "INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Theirs', 100) RETURNING id",
      [other.id],
    );
    const cross = await s.agents.brewer
      .post(url)
      .send({ fromTankId: s.tankId, toTankId: foreign!.id, quantity: '1' })
      .expect(422);
    expect(cross.body.fields.toTankId[0]).toMatch(/No such tank/);
    expect(await snapshot(s.coop.id)).toEqual(before);
    // 10 gal = 37 854 mL (37 854.118); value out = round(31 000 × 37 854 / 378 541) = round(3 099.99) = 3 100 ¢.
    await s.agents.brewer
      .post(url)
      .send({ fromTankId: s.tankId, toTankId: tote.id, quantity: '10', reason: 'Fill the tote' })
      .expect(201);
    const rows = await sql<{
      tank_id: number;
      kind: string;
      quantity_liters: string;
      value_cents: string;
      transfer_tank_id: number;
    }>(
      "SELECT tank_id, kind, quantity_liters, value_cents, transfer_tank_id FROM tank_movements WHERE kind LIKE 'transfer%' AND coop_id = $1 ORDER BY id",
      [s.coop.id],
    );
    expect(rows).toEqual([
      {
        tank_id: s.tankId,
        kind: 'transfer-out',
        quantity_liters: '-37.854',
        value_cents: '-3100',
        transfer_tank_id: tote.id,
      },
      {
        tank_id: tote.id,
        kind: 'transfer-in',
        quantity_liters: '37.854',
        value_cents: '3100',
        transfer_tank_id: s.tankId,
      },
    ]);
    expect((await tankRow(tote.id)).value_cents).toBe('3100');
    // The tote (12 gal = 45 425 mL) now holds 37 854 mL: room for 7 571 mL = 2.0 gal.
    const full = await s.agents.brewer
      .post(url)
      .send({ fromTankId: s.tankId, toTankId: tote.id, quantity: '5' })
      .expect(409);
    expect(full.body.error).toMatch(/Tote has room for only 2.0 gal/);
    await s.agents.treasurer.post(url).send({ fromTankId: s.tankId, toTankId: tote.id, quantity: '1' }).expect(403);
  });

  it('the ledger pages and sorts on the server, for staff only', async () => {
    const s = await stockedCoop();
    for (const g of ['99', '98.5', '97'])
      await s.agents.brewer
        .post(`${P(s.slug)}/tanks/${s.tankId}/dips`)
        .send({ measured: g, reason: 'Settling' })
        .expect(201);
    const url = `${P(s.slug)}/tanks/${s.tankId}/movements`;
    const page1 = await s.agents.treasurer.get(`${url}?pageSize=2&page=1`).expect(200);
    expect(page1.body.total).toBe(4);
    expect(page1.body.items).toHaveLength(2);
    expect(page1.body.items[0].onHandAfter).toBe(97); // newest first
    const asc = await s.agents.brewer.get(`${url}?sort=quantity&dir=asc&pageSize=10`).expect(200);
    const q = asc.body.items.map((i: { quantityLiters: number }) => i.quantityLiters);
    expect(q).toEqual([...q].sort((a: number, b: number) => a - b));
    const bad = await s.agents.brewer.get(`${url}?sort=nonsense`).expect(422);
    expect(bad.body.fields.sort[0]).toMatch(/Sort by one of/);
    await s.agents.member.get(url).expect(403);
    await s.agents.outsider.get(url).expect(404);
  });
});

describe('pricing policies', () => {
  it('treasurers set insert-only policies; members read the price in force; others are refused', async () => {
    const ctx = await makeCoopWithRoles();
    const url = `${P(ctx.coop.slug)}/pricing`;
    await ctx.agents.treasurer.post(url).send({ kind: 'fixed', price: '4.25' }).expect(201);
    await ctx.agents.admin
      .post(url)
      .send({ kind: 'cost-plus-percent', marginPct: '15', roadTaxCents: '24.4' })
      .expect(201);
    const got = await ctx.agents.member.get(url).expect(200);
    expect(got.body.current.description).toBe('Average cost + 15% · road tax 24.4¢/gal (road use only)');
    expect(got.body.policies.map((p: { status: string }) => p.status)).toEqual(['in-force', 'past']);
    const rows = await sql<{
      kind: string;
      price_cents_per_gallon: string | null;
      margin_pct: string | null;
      road_tax_cents_per_gallon: string;
    }>(
      'SELECT kind, price_cents_per_gallon, margin_pct, road_tax_cents_per_gallon FROM price_policies WHERE coop_id = $1 ORDER BY id',
      [ctx.coop.id],
    );
    expect(rows).toEqual([
      { kind: 'fixed', price_cents_per_gallon: '425.000', margin_pct: null, road_tax_cents_per_gallon: '0.000' },
      {
        kind: 'cost-plus-percent',
        price_cents_per_gallon: null,
        margin_pct: '15.00',
        road_tax_cents_per_gallon: '24.400',
      },
    ]);
    await ctx.agents.member.post(url).send({ kind: 'fixed', price: '1' }).expect(403);
    await ctx.agents.brewer.post(url).send({ kind: 'fixed', price: '1' }).expect(403);
    await ctx.agents.outsider.post(url).send({ kind: 'fixed', price: '1' }).expect(404);
    await api().get(url).expect(401);
  });

  it('refuses incomplete or malformed policies by field, writing nothing', async () => {
    const ctx = await makeCoopWithRoles();
    const url = `${P(ctx.coop.slug)}/pricing`;
    const before = await snapshot(ctx.coop.id);
    const cases: [object, string, RegExp][] = [
      [{ kind: 'fixed' }, 'price', /Enter the price/],
      [{ kind: 'cost-plus-amount', margin: '0.405' }, 'margin', /at most 2 decimals/],
      [{ kind: 'cost-plus-percent' }, 'marginPct', /percentage/],
      [{ kind: 'markup' }, 'kind', /how the price is set/],
      [{ kind: 'fixed', price: '4', roadTaxCents: '-1' }, 'roadTaxCents', /zero or more/],
      [{ kind: 'fixed', price: '4', effectiveFrom: '2020-01-01T00:00:00Z' }, 'effectiveFrom', /in the past/],
    ];
    for (const [body, field, reason] of cases) {
      const res = await ctx.agents.treasurer.post(url).send(body).expect(422);
      expect(res.body.fields[field]?.[0], JSON.stringify(body)).toMatch(reason);
    }
    expect(await snapshot(ctx.coop.id)).toEqual(before);
  });

  it('a co-op in litres sets and sees its price per litre', async () => {
    const coop = await makeCoop({ units: 'metric' });
    const t = await makeUser({ coopId: coop.id, role: 'treasurer' });
    const agent = await signIn(t.email);
    const res = await agent
      .post(`/api/coops/${coop.slug}/pricing`)
      .send({ kind: 'fixed', price: '1.45', surchargeCents: '2.5' })
      .expect(201);
    expect(res.body.description).toBe('Fixed $1.45/L · reserve surcharge 2.5¢/L');
    // stored per US gallon: 145 × 3.785411784 = 548.885; 2.5 × 3.785411784 = 9.464
    expect(res.body.stored).toMatchObject({ priceCentsPerGallon: 548.885, surchargeCentsPerGallon: 9.464 });
  });
});

describe('reservations', () => {
  let s: Awaited<ReturnType<typeof stockedCoop>>;
  beforeAll(async () => {
    s = await stockedCoop();
  });

  it('a member reserves for themself; reserved and available move in the database', async () => {
    const res = await s.agents.member
      .post(`${P(s.slug)}/reservations`)
      .send({ tankId: s.tankId, quantity: '12.5', windowStart: today(), windowEnd: inDays(3) })
      .expect(201);
    expect(res.body).toMatchObject({
      status: 'open',
      quantity: 12.5,
      quantityLiters: 47.318,
      membershipId: s.users.member.membershipId,
    });
    expect((await tankRow(s.tankId)).reserved_liters).toBe('47.318');
    const tanks = await s.agents.member.get(`${P(s.slug)}/tanks`).expect(200);
    expect(tanks.body.tanks[0]).toMatchObject({ onHand: 100, reserved: 12.5, available: 87.5 });
  });

  it('bad input → 422 with field and reason, nothing written', async () => {
    const url = `${P(s.slug)}/reservations`;
    const before = await snapshot(s.coop.id);
    const base = { tankId: s.tankId, quantity: '5', windowStart: today(), windowEnd: inDays(2) };
    const cases: [object, string, RegExp][] = [
      [{ ...base, quantity: '0' }, 'quantity', /greater than zero/],
      [{ ...base, quantity: '-4' }, 'quantity', /greater than zero/],
      [{ ...base, quantity: 'lots' }, 'quantity', /as a number/],
      [{ ...base, windowStart: inDays(3), windowEnd: inDays(1) }, 'windowEnd', /end after it starts/],
      [{ ...base, windowStart: '2020-01-01', windowEnd: '2020-01-02' }, 'windowEnd', /already ended/],
      [{ ...base, membershipId: s.users.brewer.membershipId }, 'membershipId', /only for yourself/],
      [{ ...base, tankId: 999999 }, 'tankId', /tanks that is in service/],
    ];
    for (const [body, field, reason] of cases) {
      const r = await s.agents.member.post(url).send(body).expect(422);
      expect(r.body.fields[field]?.[0], JSON.stringify(body)).toMatch(reason);
    }
    // Another co-op's tank is not a tank of this co-op.
    const other = await makeCoop();
    const [foreign] = await sql<{ id: number }>(
      "WITH t AS (INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters) VALUES ($1, 'Theirs', 100, 50) RETURNING id, coop_id), " +
        'l AS (INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, 50 FROM t) SELECT id FROM t',
      [other.id],
    );
    await s.agents.member
      .post(url)
      .send({ ...base, tankId: foreign!.id })
      .expect(422);
    expect((await tankRow(foreign!.id)).reserved_liters).toBe('0.000');
    await api().post(url).send(base).expect(401);
    await s.agents.outsider.post(url).send(base).expect(404);
    expect(await snapshot(s.coop.id)).toEqual(before);
  });

  it('more than is available → 409 with the available amount in litres and co-op units, nothing kept', async () => {
    const before = await snapshot(s.coop.id);
    const r = await s.agents.member
      .post(`${P(s.slug)}/reservations`)
      .send({ tankId: s.tankId, quantity: '90', windowStart: today(), windowEnd: inDays(2) })
      .expect(409);
    expect(r.body.available).toBe(87.5);
    expect(r.body.availableLiters).toBe(331.223); // 378.541 − 47.318
    expect(r.body.error).toMatch(/has only 87.500 gal available/);
    expect(r.body.fields.quantity[0]).toMatch(/At most 87.500 gal/);
    expect(await snapshot(s.coop.id)).toEqual(before);
  });

  it('members list and cancel only their own; brewers may cancel anyone’s; cancelling twice is a 409', async () => {
    const other = await makeUser({ coopId: s.coop.id, role: 'member' });
    const otherAgent = await signIn(other.email);
    const mine = (
      await s.agents.member
        .post(`${P(s.slug)}/reservations`)
        .send({ tankId: s.tankId, quantity: '2', windowStart: today(), windowEnd: inDays(1) })
        .expect(201)
    ).body;
    const theirs = (
      await otherAgent
        .post(`${P(s.slug)}/reservations`)
        .send({ tankId: s.tankId, quantity: '3', windowStart: today(), windowEnd: inDays(1) })
        .expect(201)
    ).body;
    const list = await s.agents.member.get(`${P(s.slug)}/reservations`).expect(200);
    expect(list.body.items.every((r: { membershipId: number }) => r.membershipId === s.users.member.membershipId)).toBe(
      true,
    );
    const all = await s.agents.treasurer
      .get(`${P(s.slug)}/reservations?membershipId=${other.membershipId}`)
      .expect(200);
    expect(all.body.items.map((r: { id: number }) => r.id)).toEqual([theirs.id]);
    await s.agents.member.post(`${P(s.slug)}/reservations/${theirs.id}/cancel`).expect(404);
    await s.agents.outsider.post(`${P(s.slug)}/reservations/${mine.id}/cancel`).expect(404);
    const reservedBefore = (await tankRow(s.tankId)).reserved_liters;
    const c = await s.agents.member.post(`${P(s.slug)}/reservations/${mine.id}/cancel`).expect(200);
    expect(c.body.status).toBe('cancelled');
    // 2 gal = 7.571 L released
    expect(Number((await tankRow(s.tankId)).reserved_liters)).toBeCloseTo(Number(reservedBefore) - 7.571, 3);
    await s.agents.member.post(`${P(s.slug)}/reservations/${mine.id}/cancel`).expect(409);
    await s.agents.brewer.post(`${P(s.slug)}/reservations/${theirs.id}/cancel`).expect(200);
  });

  it('a lapsed window stops counting at once, yet reads write nothing; the next write marks it expired, once', async () => {
    const [r] = await sql<{ id: number }>(
      `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end)
       VALUES ($1, $2, $3, 10, now() - interval '3 days', now() - interval '1 day') RETURNING id`,
      [s.coop.id, s.tankId, s.users.member.membershipId],
    );
    await sql('UPDATE tanks SET reserved_liters = reserved_liters + 10 WHERE id = $1', [s.tankId]);
    const before = await snapshot(s.coop.id);
    const storedReserved = Number((await tankRow(s.tankId)).reserved_liters);
    // Reads: the tank list and the reservation list count it as expired, and change nothing.
    const [a, b, mine] = await Promise.all([
      s.agents.member.get(`${P(s.slug)}/tanks`),
      s.agents.brewer.get(`${P(s.slug)}/tanks`),
      s.agents.member.get(`${P(s.slug)}/reservations?pageSize=100`),
    ]);
    expect([a.status, b.status, mine.status]).toEqual([200, 200, 200]);
    expect(a.body.tanks[0].reservedLiters).toBeCloseTo(storedReserved - 10, 3);
    expect(b.body.tanks[0].availableLiters).toBeCloseTo(
      Number((await tankRow(s.tankId)).on_hand_liters) - (storedReserved - 10),
      3,
    );
    expect(mine.body.items.find((x: { id: number }) => x.id === r!.id)).toMatchObject({ status: 'expired' });
    const open = await s.agents.member.get(`${P(s.slug)}/reservations?status=open&pageSize=100`).expect(200);
    expect(open.body.items.map((x: { id: number }) => x.id)).not.toContain(r!.id);
    expect(await snapshot(s.coop.id)).toEqual(before);
    // Cancelling it: already expired (409), and nothing is written.
    const late = await s.agents.member.post(`${P(s.slug)}/reservations/${r!.id}/cancel`).expect(409);
    expect(late.body).toMatchObject({ status: 'expired' });
    expect(await snapshot(s.coop.id)).toEqual(before);
    // Two writes at once: the lapsed reservation is marked expired and released exactly once.
    const [w1, w2] = await Promise.all([
      s.agents.member
        .post(`${P(s.slug)}/reservations`)
        .send({ tankId: s.tankId, quantity: '1', windowStart: today(), windowEnd: inDays(1) }),
      s.agents.brewer
        .post(`${P(s.slug)}/reservations`)
        .send({ tankId: s.tankId, quantity: '1', windowStart: today(), windowEnd: inDays(1) }),
    ]);
    expect([w1.status, w2.status]).toEqual([201, 201]);
    // 2 × 1 gal = 2 × 3.785 L reserved; the 10 L released.
    expect(Number((await tankRow(s.tankId)).reserved_liters)).toBeCloseTo(storedReserved - 10 + 2 * 3.785, 3);
    const [row] = await sql<{ status: string }>('SELECT status FROM reservations WHERE id = $1', [r!.id]);
    expect(row!.status).toBe('expired');
    expect(
      await countRows(
        'audit_events',
        "entity_type = 'reservation' AND entity_id = $1 AND action = 'reservation.expire'",
        [String(r!.id)],
      ),
    ).toBe(1);
  });
});

describe('draws', () => {
  it('against a reservation: closes it, releases it, records the outflow at the locked price (hand-computed)', async () => {
    const s = await stockedCoop();
    const res = (
      await s.agents.member
        .post(`${P(s.slug)}/reservations`)
        .send({ tankId: s.tankId, quantity: '15', windowStart: today(), windowEnd: inDays(2) })
        .expect(201)
    ).body;
    // Meter 1204.2 → 1216.7 = 12.5 gal (less than the 15 reserved: fine).
    const d = await s.agents.brewer
      .post(`${P(s.slug)}/draws`)
      .send({
        membershipId: s.users.member.membershipId,
        tankId: s.tankId,
        reservationId: res.id,
        meterBefore: '1204.2',
        meterAfter: '1216.7',
        declaredUse: 'road',
        vehicle: 'Pickup',
      })
      .expect(201);
    // Average cost 31 000 ¢ / 99.99995 gal = 310.00015 → 310 ¢; + 40 ¢ margin = 350 ¢/gal.
    // fuel 350 × 12.5 = 4375; reserve 10 × 12.5 = 125; road tax 24.4 × 12.5 = 305; total 4805.
    expect(d.body).toMatchObject({
      fuelCents: 4375,
      surchargeCents: 125,
      taxCents: 305,
      totalCents: 4805,
      unitPriceCentsPerGallon: 350,
      roadTaxCentsPerGallon: 24.4,
      quantity: 12.5,
      status: 'recorded',
      reservationId: res.id,
    });
    // Value out at average cost: meters 4558.371 − 4605.689 L → 47.318 L; round(31 000 × 47 318 / 378 541) = round(3875.03) = 3875 ¢.
    expect(d.body.costValueCents).toBe(3875);
    const [r] = await sql<{ status: string }>('SELECT status FROM reservations WHERE id = $1', [res.id]);
    expect(r!.status).toBe('drawn');
    const t = await tankRow(s.tankId);
    expect(t).toMatchObject({ on_hand_liters: '331.223', reserved_liters: '0.000', value_cents: '27125' });
    const [m] = await sql<{ kind: string; quantity_liters: string; value_cents: string; draw_id: number }>(
      'SELECT kind, quantity_liters, value_cents, draw_id FROM tank_movements WHERE tank_id = $1 ORDER BY id DESC LIMIT 1',
      [s.tankId],
    );
    expect(m).toEqual({ kind: 'draw', quantity_liters: '-47.318', value_cents: '-3875', draw_id: d.body.id });
    // Off-road, walk-up, 3 gal: fuel 350 × 3 = 1050 + reserve 30 + no road tax = 1080.
    const off = await s.agents.admin
      .post(`${P(s.slug)}/draws`)
      .send({ membershipId: s.users.brewer.membershipId, tankId: s.tankId, quantity: '3', declaredUse: 'off-road' })
      .expect(201);
    expect(off.body).toMatchObject({ fuelCents: 1050, surchargeCents: 30, taxCents: 0, totalCents: 1080 });
    // The member sees their own draw, not the brewer's.
    const mine = await s.agents.member.get(`${P(s.slug)}/draws`).expect(200);
    expect(mine.body.items.map((x: { id: number }) => x.id)).toEqual([d.body.id]);
  });

  it('a new price applies only to later draws; recorded draws keep theirs', async () => {
    const s = await stockedCoop();
    const first = (
      await s.agents.brewer
        .post(`${P(s.slug)}/draws`)
        .send({ membershipId: s.users.member.membershipId, tankId: s.tankId, quantity: '2', declaredUse: 'heating' })
        .expect(201)
    ).body;
    await s.agents.treasurer
      .post(`${P(s.slug)}/pricing`)
      .send({ kind: 'fixed', price: '4.25', roadTaxCents: '18.4' })
      .expect(201);
    // fixed 425 × 7.3 = 3102.5 → 3103; road tax 18.4 × 7.3 = 134.32 → 134; total 3237
    const second = (
      await s.agents.brewer
        .post(`${P(s.slug)}/draws`)
        .send({ membershipId: s.users.member.membershipId, tankId: s.tankId, quantity: '7.3', declaredUse: 'road' })
        .expect(201)
    ).body;
    expect(second).toMatchObject({
      fuelCents: 3103,
      taxCents: 134,
      surchargeCents: 0,
      totalCents: 3237,
      unitPriceCentsPerGallon: 425,
    });
    const again = (await s.agents.member.get(`${P(s.slug)}/draws`).expect(200)).body.items.find(
      (x: { id: number }) => x.id === first.id,
    );
    // 2 gal heating at cost + 40: 350 × 2 = 700 + reserve 20 = 720, unchanged by the new policy
    expect(again).toMatchObject({ totalCents: 720, unitPriceCentsPerGallon: 350 });
  });

  it('cost plus a percentage: 310.00015 × 1.15 = 356.5002 → 357 ¢/gal', async () => {
    const s = await stockedCoop();
    await s.agents.treasurer
      .post(`${P(s.slug)}/pricing`)
      .send({ kind: 'cost-plus-percent', marginPct: '15' })
      .expect(201);
    const d = (
      await s.agents.brewer
        .post(`${P(s.slug)}/draws`)
        .send({ membershipId: s.users.member.membershipId, tankId: s.tankId, quantity: '2', declaredUse: 'road' })
        .expect(201)
    ).body;
    expect(d).toMatchObject({ unitPriceCentsPerGallon: 357, fuelCents: 714, taxCents: 0, totalCents: 714 });
  });

  it('bad input → 4xx with field and reason, nothing written', async () => {
    const s = await stockedCoop();
    const url = `${P(s.slug)}/draws`;
    const other = await makeCoopWithRoles();
    const res = (
      await s.agents.member
        .post(`${P(s.slug)}/reservations`)
        .send({ tankId: s.tankId, quantity: '10', windowStart: today(), windowEnd: inDays(2) })
        .expect(201)
    ).body;
    const before = await snapshot(s.coop.id);
    const base = { membershipId: s.users.member.membershipId, tankId: s.tankId, declaredUse: 'road' };
    const cases: [object, number, string, RegExp][] = [
      [{ ...base, meterBefore: '100', meterAfter: '95' }, 422, 'meterAfter', /cannot go backwards/],
      [{ ...base, meterBefore: '100', meterAfter: '100' }, 422, 'meterAfter', /nothing was drawn/],
      [{ ...base, meterBefore: '100' }, 422, 'meterAfter', /both meter readings/],
      [{ ...base, quantity: '0' }, 422, 'quantity', /greater than zero/],
      [{ ...base, quantity: '-2' }, 422, 'quantity', /greater than zero/],
      [{ ...base }, 422, 'quantity', /quantity drawn/],
      [{ ...base, quantity: '1', declaredUse: 'boat' }, 422, 'declaredUse', /road, off-road or heating/],
      [{ ...base, quantity: '1', membershipId: undefined }, 422, 'membershipId', /Choose the member/],
      [
        { ...base, quantity: '1', membershipId: other.users.member.membershipId },
        422,
        'membershipId',
        /No such member/,
      ],
      [
        { ...base, quantity: '1', membershipId: s.users.brewer.membershipId, reservationId: res.id },
        422,
        'reservationId',
        /another member/,
      ],
      [{ ...base, quantity: '1', occurredAt: '2099-01-01T00:00:00Z' }, 422, 'occurredAt', /future/],
      [{ ...base, quantity: '95' }, 409, 'quantity', /More than is available/],
    ];
    for (const [body, status, field, reason] of cases) {
      const r = await s.agents.brewer.post(url).send(body);
      expect(r.status, JSON.stringify(body)).toBe(status);
      expect(r.body.fields?.[field]?.[0], JSON.stringify(body)).toMatch(reason);
    }
    // A walk-up of 95 gal when 90 are free (10 reserved) says how much is available.
    const walk = await s.agents.brewer
      .post(url)
      .send({ ...base, quantity: '95' })
      .expect(409);
    expect(walk.body.available).toBe(90);
    expect(await snapshot(s.coop.id)).toEqual(before);
    // Drawing more than reserved needs the extra to be available: 10 reserved + 90 free = 100 → fine up to 100.
    await s.agents.brewer
      .post(url)
      .send({ ...base, reservationId: res.id, quantity: '100.001' })
      .expect(409);
    expect(await snapshot(s.coop.id)).toEqual(before);
  });

  it('members may not record draws unless the co-op runs a self-serve pump, and then only their own', async () => {
    const s = await stockedCoop();
    await s.agents.member
      .post(`${P(s.slug)}/draws`)
      .send({ tankId: s.tankId, quantity: '1', declaredUse: 'road' })
      .expect(403);
    await sql(`UPDATE coops SET settings = settings || '{"selfServeDraws": true}'::jsonb WHERE id = $1`, [s.coop.id]);
    const own = await s.agents.member
      .post(`${P(s.slug)}/draws`)
      .send({ tankId: s.tankId, quantity: '1', declaredUse: 'heating' })
      .expect(201);
    expect(own.body.membershipId).toBe(s.users.member.membershipId);
    const before = await snapshot(s.coop.id);
    const smuggled = await s.agents.member
      .post(`${P(s.slug)}/draws`)
      .send({ tankId: s.tankId, quantity: '1', declaredUse: 'road', membershipId: s.users.brewer.membershipId })
      .expect(422);
    expect(smuggled.body.fields.membershipId[0]).toMatch(/only your own/);
    expect(await snapshot(s.coop.id)).toEqual(before);
    await s.agents.member
      .post(`${P(s.slug)}/draws/${own.body.id}/reverse`)
      .send({ reason: 'oops' })
      .expect(403);
  });

  it('a draw is corrected only by one reversing entry that puts the fuel and its value back', async () => {
    const s = await stockedCoop();
    const d = (
      await s.agents.brewer
        .post(`${P(s.slug)}/draws`)
        .send({ membershipId: s.users.member.membershipId, tankId: s.tankId, quantity: '12.5', declaredUse: 'road' })
        .expect(201)
    ).body;
    const url = `${P(s.slug)}/draws/${d.id}/reverse`;
    const before = await snapshot(s.coop.id);
    const noReason = await s.agents.brewer.post(url).send({}).expect(422);
    expect(noReason.body.fields.reason[0]).toMatch(/reason/i);
    await s.agents.member.post(url).send({ reason: 'Wrong member' }).expect(403);
    await s.agents.treasurer.post(url).send({ reason: 'Wrong member' }).expect(403);
    await s.agents.outsider.post(url).send({ reason: 'Wrong member' }).expect(404);
    await api().post(url).send({ reason: 'Wrong member' }).expect(401);
    expect(await snapshot(s.coop.id)).toEqual(before);
    const [a, b] = await Promise.all([
      s.agents.brewer.post(url).send({ reason: 'Recorded against the wrong member' }),
      s.agents.admin.post(url).send({ reason: 'Recorded against the wrong member' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const rev = a.status === 201 ? a.body : b.body;
    expect(rev).toMatchObject({
      reversesDrawId: d.id,
      quantity: -12.5,
      fuelCents: -4375,
      surchargeCents: -125,
      taxCents: -305,
      totalCents: -4805,
      costValueCents: -3875,
      status: 'reversal',
    });
    expect(await tankRow(s.tankId)).toMatchObject({ on_hand_liters: '378.541', value_cents: '31000' });
    const [m] = await sql<{ kind: string; value_cents: string; reason: string }>(
      'SELECT kind, value_cents, reason FROM tank_movements WHERE draw_id = $1',
      [rev.id],
    );
    expect(m).toEqual({ kind: 'draw-reversal', value_cents: '3875', reason: 'Recorded against the wrong member' });
    await s.agents.brewer
      .post(`${P(s.slug)}/draws/${rev.id}/reverse`)
      .send({ reason: 'again' })
      .expect(409);
    const original = (await s.agents.treasurer.get(`${P(s.slug)}/draws?status=reversed`).expect(200)).body;
    expect(original.items.map((x: { id: number }) => x.id)).toEqual([d.id]);
    expect(original.totals.totalCents).toBe(4805);
    const net = (await s.agents.treasurer.get(`${P(s.slug)}/draws`).expect(200)).body.totals;
    expect(net).toMatchObject({ totalCents: 0, quantity: 0 });
  });

  it('the database refuses edits to a recorded draw and to the ledger', async () => {
    const s = await stockedCoop();
    const d = (
      await s.agents.brewer
        .post(`${P(s.slug)}/draws`)
        .send({ membershipId: s.users.member.membershipId, tankId: s.tankId, quantity: '1', declaredUse: 'road' })
        .expect(201)
    ).body;
    await expect(
      sql('UPDATE draws SET total_cents = 1, fuel_cents = 1, surcharge_cents = 0, tax_cents = 0 WHERE id = $1', [d.id]),
    ).rejects.toThrow(/cannot be edited/);
    await expect(sql('UPDATE tank_movements SET reason = $2 WHERE draw_id = $1', [d.id, 'x'])).rejects.toThrow(
      /append-only/,
    );
    await expect(
      sql('UPDATE tanks SET reserved_liters = on_hand_liters + 1 WHERE id = $1', [s.tankId]),
    ).rejects.toThrow(/tanks_reserved_within_on_hand/);
  });
});

function today() {
  return new Date().toISOString().slice(0, 10);
}
function inDays(n: number) {
  return new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
}
