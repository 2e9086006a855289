// Opening records from CSV files: members' opening balances (carried by the next invoice) and
// opening tank stock (an `opening` ledger row that prices the next draws). Every bad row is named
// with its field, nothing is written before the confirm, a failed confirm writes nothing, and an
// import can be undone as a whole until something is built on it.
import { beforeAll, describe, expect, it } from 'vitest';
import { countRows, makeCoopWithRoles, sql } from '../support/api';
import { runMonth } from '../support/billing';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;

async function footprint(coopId: number) {
  return {
    adjustments: await countRows('billing_adjustments', 'coop_id = $1', [coopId]),
    movements: await countRows('tank_movements', 'coop_id = $1', [coopId]),
    imports: await countRows('imports', 'coop_id = $1', [coopId]),
    audit: await countRows('audit_events', 'coop_id = $1', [coopId]),
  };
}

describe('opening balances', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });
  const base = () => `/api/coops/${ctx.coop.slug}/imports/opening-balances`;

  it('names the row and field of every bad row; preview and a failed confirm write nothing', async () => {
    const csv = [
      'E-mail;Balance;As of',
      `nobody-here@example.org;10.00;11/30/2026`,
      `${ctx.users.member.email};abc;11/30/2026`,
      `${ctx.users.brewer.email};12.345;11/30/2026`,
      `${ctx.users.treasurer.email};0;11/30/2026`,
      `${ctx.users.admin.email};"1,000.00";12/31/2099`,
      `${ctx.users.admin.email};5.00;13/45/2026`,
      `not-an-email;5.00;11/30/2026`,
    ].join('\n');
    const before = await footprint(ctx.coop.id);
    const res = await ctx.agents.admin.post(`${base()}/preview`).send({ fileName: 'balances.csv', csv }).expect(200);
    const problems = res.body.rows.map((r: { line: number; errors: { field: string }[] }) => [
      r.line,
      r.errors.map((e) => e.field),
    ]);
    expect(problems).toEqual([
      [2, ['email']],
      [3, ['balance']],
      [4, ['balance']],
      [5, ['balance']],
      [6, ['asOf']],
      [7, ['email', 'asOf']],
      [8, ['email']],
    ]);
    expect(res.body.rows[0].errors[0].message).toMatch(/not a member of this co-op yet/);
    expect(res.body.rows[2].errors[0].message).toMatch(/more than two decimals/);
    expect(res.body.rows[5].errors[0].message).toMatch(/row 6/);
    expect(res.body.counts).toEqual({ ready: 0, errors: 7 });
    expect(await footprint(ctx.coop.id)).toEqual(before);

    // All or nothing: one bad row among good ones stops the whole import.
    const mixed = `email,balance,as of\n${ctx.users.member.email},42.50,11/30/2026\n${ctx.users.brewer.email},x,11/30/2026\n`;
    const refused = await ctx.agents.admin.post(base()).send({ fileName: 'mixed.csv', csv: mixed }).expect(422);
    expect(refused.body.fields).toEqual({ 'row 3: balance': [expect.stringMatching(/not a number/)] });
    expect(refused.body.error).toMatch(/nothing was imported/);
    expect(await footprint(ctx.coop.id)).toEqual(before);
  });

  it('are carried by the next invoice; undo works until an invoice is built on them; the same file is refused while it stands', async () => {
    // US co-op: thousands separators and MM/DD/YYYY; a negative balance is a credit.
    const csv = `Email,Balance,As of\n${ctx.users.member.email},"1,042.50",11/30/2026\n${ctx.users.brewer.email},-15.00,2026-11-30\n`;
    const first = await ctx.agents.admin.post(base()).send({ fileName: 'balances.csv', csv }).expect(201);
    expect(first.body).toEqual({ importId: expect.any(Number), imported: 2 });
    const rows = await sql<{ membership_id: number; amount_cents: string; description: string; period: string }>(
      `SELECT membership_id, amount_cents, description, to_char(period, 'YYYY-MM') AS period FROM billing_adjustments WHERE coop_id = $1 ORDER BY amount_cents DESC`,
      [ctx.coop.id],
    );
    expect(rows.map((r) => [r.membership_id, r.amount_cents, r.description])).toEqual([
      [ctx.users.member.membershipId, '104250', 'Opening balance as of Nov 30, 2026'],
      [ctx.users.brewer.membershipId, '-1500', 'Opening balance as of Nov 30, 2026'],
    ]);
    await ctx.agents.admin.post(base()).send({ fileName: 'balances again.csv', csv }).expect(409);

    // Undo before anything is billed: the adjustments go, the import is marked undone (audited).
    await ctx.agents.admin.post(`${base()}/${first.body.importId}/undo`).send({}).expect(200);
    expect(await countRows('billing_adjustments', 'coop_id = $1', [ctx.coop.id])).toBe(0);
    expect(
      await countRows('audit_events', "coop_id = $1 AND action = 'import.undo' AND entity_id = $2", [
        ctx.coop.id,
        String(first.body.importId),
      ]),
    ).toBe(1);
    await ctx.agents.admin.post(`${base()}/${first.body.importId}/undo`).send({}).expect(409);

    // Imported again (allowed once the first is undone), then the month's run puts them on the invoices.
    const second = await ctx.agents.admin.post(base()).send({ fileName: 'balances.csv', csv }).expect(201);
    await runMonth(ctx.agents.treasurer, ctx.coop.slug, rows[0]!.period);
    const lines = await sql<{ membership_id: number; kind: string; amount_cents: string; description: string }>(
      `SELECT i.membership_id, l.kind, l.amount_cents, l.description FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id
        WHERE l.coop_id = $1 AND l.adjustment_id IS NOT NULL ORDER BY l.amount_cents DESC`,
      [ctx.coop.id],
    );
    expect(lines).toEqual([
      {
        membership_id: ctx.users.member.membershipId,
        kind: 'adjustment',
        amount_cents: '104250',
        description: 'Opening balance as of Nov 30, 2026',
      },
      {
        membership_id: ctx.users.brewer.membershipId,
        kind: 'adjustment',
        amount_cents: '-1500',
        description: 'Opening balance as of Nov 30, 2026',
      },
    ]);
    // An invoice is built on them now: undo is refused and changes nothing.
    const before = await footprint(ctx.coop.id);
    const refused = await ctx.agents.admin.post(`${base()}/${second.body.importId}/undo`).send({}).expect(409);
    expect(refused.body.error).toMatch(/already on an invoice/);
    expect(await footprint(ctx.coop.id)).toEqual(before);
    // The import's result lists both rows.
    const detail = await ctx.agents.admin.get(`${base()}/${second.body.importId}`).expect(200);
    expect(detail.body.import).toMatchObject({
      kind: 'opening-balances',
      fileName: 'balances.csv',
      rowsImported: 2,
      status: 'done',
    });
    const result = await ctx.agents.admin.get(`${base()}/${second.body.importId}/result`).expect(200);
    expect(result.text.split('\r\n')[0]).toBe('Row,E-mail,Balance,As of,Result,Note');
  });
});

describe('opening tank stock', () => {
  let ctx: Ctx;
  let mainId: number;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    mainId = (
      await ctx.agents.admin
        .post(`/api/coops/${ctx.coop.slug}/tanks`)
        .send({ name: 'Main tank', capacity: '500' })
        .expect(201)
    ).body.id;
    await ctx.agents.admin
      .post(`/api/coops/${ctx.coop.slug}/tanks`)
      .send({ name: 'Spare drum', capacity: '50' })
      .expect(201);
  });
  const base = () => `/api/coops/${ctx.coop.slug}/imports/opening-tank`;

  it('names bad rows; a failed confirm writes nothing', async () => {
    const csv =
      'Tank,Gallons,Cost per gallon\nNowhere,10,2.00\nSpare drum,60,2.00\nMain tank,100,abc\nmain TANK,5,1.00\n';
    const before = await footprint(ctx.coop.id);
    const res = await ctx.agents.admin.post(`${base()}/preview`).send({ fileName: 'tank.csv', csv }).expect(200);
    expect(
      res.body.rows.map((r: { line: number; errors: { field: string }[] }) => [r.line, r.errors.map((e) => e.field)]),
    ).toEqual([
      [2, ['tank']],
      [3, ['quantity']],
      [4, ['cost']],
      [5, ['tank']],
    ]);
    expect(res.body.rows[0].errors[0].message).toMatch(/Main tank, Spare drum/);
    await ctx.agents.admin.post(base()).send({ fileName: 'tank.csv', csv }).expect(422);
    expect(await footprint(ctx.coop.id)).toEqual(before);
  });

  it('is one opening ledger row that prices the next draws; undo is refused once fuel was drawn from it', async () => {
    // Spare drum: imported, then undone before anything builds on it (a reversing opening row).
    const spare = await ctx.agents.admin
      .post(base())
      .send({ fileName: 'spare.csv', csv: 'Tank,Gallons,Cost per gallon\nSpare drum,20,2.00\n' })
      .expect(201);
    await ctx.agents.admin.post(`${base()}/${spare.body.importId}/undo`).send({}).expect(200);
    const spareRows = await sql<{ kind: string; quantity_liters: string; value_cents: string }>(
      `SELECT m.kind, m.quantity_liters, m.value_cents FROM tank_movements m JOIN tanks t ON t.id = m.tank_id WHERE t.coop_id = $1 AND t.name = 'Spare drum' ORDER BY m.id`,
      [ctx.coop.id],
    );
    // 20 gal = 75.708 L (NIST: 1 US gal = 3.785411784 L); 20 × 200 ¢ = 4000 ¢.
    expect(spareRows).toEqual([
      { kind: 'opening', quantity_liters: '75.708', value_cents: '4000' },
      { kind: 'opening', quantity_liters: '-75.708', value_cents: '-4000' },
    ]);

    const done = await ctx.agents.admin
      .post(base())
      .send({ fileName: 'main.csv', csv: 'Tank,Gallons,Cost per gallon\nMain tank,100,3.10\n' })
      .expect(201);
    const [m] = await sql<{ kind: string; quantity_liters: string; value_cents: string }>(
      `SELECT kind, quantity_liters, value_cents FROM tank_movements WHERE tank_id = $1`,
      [mainId],
    );
    // 100 gal = 378.541 L; value round(310 ¢ × 99.99995 gal) = 31 000 ¢ (hand-computed).
    expect(m).toEqual({ kind: 'opening', quantity_liters: '378.541', value_cents: '31000' });
    const tank = (await ctx.agents.member.get(`/api/coops/${ctx.coop.slug}/tanks/${mainId}`).expect(200)).body;
    expect(tank.onHandLiters).toBeCloseTo(378.541, 3);

    // Cost plus 40 ¢: average cost 31 000 ¢ / 99.99995 gal = 310.00015 → 310 ¢, + 40 = 350 ¢/gal (hand-computed).
    await ctx.agents.treasurer
      .post(`/api/coops/${ctx.coop.slug}/pricing`)
      .send({ kind: 'cost-plus-amount', margin: '0.40' })
      .expect(201);
    const draw = await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/draws`)
      .send({ membershipId: ctx.users.member.membershipId, tankId: mainId, quantity: '10', declaredUse: 'off-road' })
      .expect(201);
    expect(draw.body).toMatchObject({ unitPriceCentsPerGallon: 350, fuelCents: 3500 });

    const before = await footprint(ctx.coop.id);
    const refused = await ctx.agents.admin.post(`${base()}/${done.body.importId}/undo`).send({}).expect(409);
    expect(refused.body.error).toMatch(/can no longer be undone/);
    expect(await footprint(ctx.coop.id)).toEqual(before);
    // A tank in use cannot take a second opening entry.
    const again = await ctx.agents.admin
      .post(`${base()}/preview`)
      .send({ fileName: 'main-2.csv', csv: 'Tank,Gallons,Cost per gallon\nMain tank,5,3.10\n' })
      .expect(200);
    expect(again.body.rows[0].errors[0]).toMatchObject({
      field: 'tank',
      message: expect.stringMatching(/dip reading/),
    });
  });
});

describe('opening chemical and oil stock', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });
  const base = () => `/api/coops/${ctx.coop.slug}/imports/opening-supplies`;
  const lots = async () => ({
    chemicals: await countRows('chemical_lots', 'coop_id = $1', [ctx.coop.id]),
    oil: await countRows('oil_lots', 'coop_id = $1', [ctx.coop.id]),
    imports: await countRows('imports', 'coop_id = $1', [ctx.coop.id]),
  });

  it('names bad rows; a failed confirm writes nothing', async () => {
    const csv =
      'Kind,Quantity,Unit,Total cost,Purity %\nlye,1,kg,5.00,\nmethanol,10,kg,5.00,\nKOH,2,kg,8.00,\nNaOH,-1,kg,8.00,98\noil,50,gal,free,\nmethanol,5,gal,20.00,99\n';
    const before = await lots();
    const res = await ctx.agents.admin.post(`${base()}/preview`).send({ fileName: 'shelf.csv', csv }).expect(200);
    expect(
      res.body.rows.map((r: { line: number; errors: { field: string }[] }) => [r.line, r.errors.map((e) => e.field)]),
    ).toEqual([
      [2, ['kind']],
      [3, ['unit']],
      [4, ['purityPct']],
      [5, ['quantity']],
      [6, ['totalCost']],
      [7, ['purityPct']],
    ]);
    await ctx.agents.admin.post(base()).send({ fileName: 'shelf.csv', csv }).expect(422);
    expect(await lots()).toEqual(before);
  });

  it('become opening lots that cost the next batch; undo takes them back while no batch has used them', async () => {
    const csv =
      'Kind,Quantity,Unit,Total cost,Purity %,As of\nmethanol,55,gal,190.00,,11/15/2026\nKOH,10,lb,42.00,90 %,11/15/2026\noil,120,gal,0,,\n';
    const first = await ctx.agents.admin.post(base()).send({ fileName: 'shelf.csv', csv }).expect(201);
    expect(first.body.imported).toBe(3);
    // 55 gal × 3.785411784 = 208.198 L; 10 lb × 453.59237 g = 4535.924 g; 120 gal = 454.249 L (NIST SP 811).
    expect(
      await sql(
        `SELECT kind, quantity, remaining_quantity, total_cost_cents, purity_pct, supplier, received_on::text FROM chemical_lots WHERE coop_id = $1 ORDER BY id`,
        [ctx.coop.id],
      ),
    ).toEqual([
      {
        kind: 'methanol',
        quantity: '208.198',
        remaining_quantity: '208.198',
        total_cost_cents: '19000',
        purity_pct: null,
        supplier: 'Opening stock',
        received_on: '2026-11-15',
      },
      {
        kind: 'KOH',
        quantity: '4535.924',
        remaining_quantity: '4535.924',
        total_cost_cents: '4200',
        purity_pct: '90.00',
        supplier: 'Opening stock',
        received_on: '2026-11-15',
      },
    ]);
    expect(await sql(`SELECT collected_from, volume_liters FROM oil_lots WHERE coop_id = $1`, [ctx.coop.id])).toEqual([
      { collected_from: 'Opening stock', volume_liters: '454.249' },
    ]);

    // The planner costs the next batch from them: 30 gal of oil at 20 % → 6 gal = 22.712 L of methanol;
    // 19 000 ¢ × 22.712 / 208.198 ≈ 2073 ¢ (hand-computed, first in first out from the one lot).
    const plan = await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/planner`)
      .send({ oilVolume: 30, titrationTrials: [2], catalyst: 'KOH', methanolPct: 20 })
      .expect(200);
    const methanol = plan.body.coverage.find((c: { kind: string }) => c.kind === 'methanol');
    expect(methanol).toMatchObject({ covered: true });
    expect(methanol.projectedCents).toBeGreaterThanOrEqual(2070);
    expect(methanol.projectedCents).toBeLessThanOrEqual(2076);

    await ctx.agents.admin.post(`${base()}/${first.body.importId}/undo`).send({}).expect(200);
    expect(await lots()).toMatchObject({ chemicals: 0, oil: 0 });
  });
});
