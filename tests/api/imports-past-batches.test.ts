// Past batches imported in summary: every bad row named with its field, nothing written before the
// confirm, a failed confirm writes nothing; imported batches are read-only batches with no tank
// movement that count in the cost chart, the quarterly report's produced volume and the planner's
// yield median; the import can be undone until a batch is numbered after it; co-ops stay apart.
// (Every answer is checked against the declared contract by the signIn() agents.)
import { beforeAll, describe, expect, it } from 'vitest';
import { countRows, makeCoopWithRoles, sql } from '../support/api';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;
type PreviewRow = { line: number; errors: { field: string; message: string }[] };

const HEAD =
  'Batch number,Date,Oil in (gallons),Fuel out (gallons),Cost per gallon,Oil cost,Methanol cost,Catalyst cost,Energy cost,Other cost,Quality,Notes';
const GOOD = [
  HEAD,
  '10,01/15/2026,40,38,1.90,,,,,,pass,Clear after three washes',
  ',02/10/2026,50,45,,20.00,25.00,5.00,4.00,1.00,fail,"Cloudy, soap high"',
  '12,2026-03-05,100,90,,,,,,,,',
].join('\n');

describe('past batches imported in summary', () => {
  let ctx: Ctx;
  const base = () => `/api/coops/${ctx.coop.slug}/imports/past-batches`;
  const footprint = async () => ({
    batches: await countRows('batches', 'coop_id = $1', [ctx.coop.id]),
    movements: await countRows('tank_movements', 'coop_id = $1', [ctx.coop.id]),
    imports: await countRows('imports', 'coop_id = $1', [ctx.coop.id]),
    audit: await countRows('audit_events', 'coop_id = $1', [ctx.coop.id]),
  });
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    // Batch 1 exists already (planned in Tallyvat).
    await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/batches`)
      .send({ oilVolume: 5, titrationTrials: [3] })
      .expect(201);
  });

  it('only admins of the co-op: others are refused and nothing is written', async () => {
    const before = await footprint();
    await ctx.agents.brewer.post(`${base()}/preview`).send({ fileName: 'h.csv', csv: GOOD }).expect(403);
    await ctx.agents.member.post(base()).send({ fileName: 'h.csv', csv: GOOD }).expect(403);
    await ctx.agents.outsider.post(base()).send({ fileName: 'h.csv', csv: GOOD }).expect(404);
    expect(await footprint()).toEqual(before);
  });

  it('names the row and field of every bad row; preview and a failed confirm write nothing', async () => {
    const csv = [
      HEAD,
      '2,13/45/2025,40,36,1.90,,,,,,pass,',
      '3,03/01/2025,40,-5,,,,,,,,',
      '4,03/02/2025,40,50,,,,,,,,',
      '5,03/03/2025,40,36,,,,,,,,',
      '5,03/04/2025,40,36,,,,,,,,',
      '1,03/05/2025,40,36,,,,,,,,',
      '9,03/06/2025,40,36,2.00,,5.00,,,,maybe,',
      'x,03/07/2025,0,36,,,,,,,,',
      '8,12/31/2099,40,36,,,,,,,,',
    ].join('\n');
    const before = await footprint();
    const res = await ctx.agents.admin.post(`${base()}/preview`).send({ fileName: 'history.csv', csv }).expect(200);
    expect(res.body.rows.map((r: PreviewRow) => [r.line, r.errors.map((e) => e.field)])).toEqual([
      [2, ['date']],
      [3, ['fuel']],
      [4, ['fuel']],
      [5, []],
      [6, ['number']],
      [7, ['number']],
      [8, ['costPerUnit', 'verdict']],
      [9, ['number', 'oil']],
      [10, ['date']],
    ]);
    const msg = (line: number) =>
      res.body.rows
        .find((r: PreviewRow) => r.line === line)
        .errors.map((e: { message: string }) => e.message)
        .join(' ');
    expect(msg(3)).toMatch(/negative/);
    expect(msg(4)).toMatch(/1\.1 × the oil in/);
    expect(msg(6)).toMatch(/row 5/);
    expect(msg(7)).toMatch(/already has a batch 1/);
    expect(res.body.counts).toEqual({ ready: 1, errors: 8 });
    expect(await footprint()).toEqual(before);

    const refused = await ctx.agents.admin.post(base()).send({ fileName: 'history.csv', csv }).expect(422);
    expect(refused.body.error).toMatch(/nothing was imported/);
    expect(refused.body.fields['row 4: fuel']).toEqual([expect.stringMatching(/1\.1 ×/)]);
    expect(await footprint()).toEqual(before);
  });

  it('imports read-only batches that count in the cost chart, the quarterly report and the yield median', async () => {
    const first = await ctx.agents.admin.post(base()).send({ fileName: 'history.csv', csv: GOOD }).expect(201);
    expect(first.body).toEqual({ importId: expect.any(Number), imported: 3 });
    const rows = await sql(
      `SELECT number, status, batch_date::text AS date, oil_liters, released_liters, tank_id, total_cost_cents, cost_per_gallon_cents, cost_feedstock_cents, quality_verdict, notes
         FROM batches WHERE coop_id = $1 AND status = 'imported' ORDER BY number`,
      [ctx.coop.id],
    );
    // Gallons → litres by NIST's 3.785411784 L/gal, to the millilitre. Costs hand-computed:
    // 190 ¢ × 38.00009 gal (143.846 L) = 7220 ¢; inputs 2000 + 2500 + 500 + 400 + 100 = 5500 ¢ over 45.00013 gal = 122 ¢/gal.
    expect(rows).toEqual([
      {
        number: 10,
        status: 'imported',
        date: '2026-01-15',
        oil_liters: '151.416',
        released_liters: '143.846',
        tank_id: null,
        total_cost_cents: '7220',
        cost_per_gallon_cents: '190',
        cost_feedstock_cents: '0',
        quality_verdict: 'pass',
        notes: 'Clear after three washes',
      },
      {
        number: 12,
        status: 'imported',
        date: '2026-03-05',
        oil_liters: '378.541',
        released_liters: '340.687',
        tank_id: null,
        total_cost_cents: null,
        cost_per_gallon_cents: null,
        cost_feedstock_cents: null,
        quality_verdict: 'incomplete',
        notes: null,
      },
      // The row without a number is numbered after the highest (the co-op's 1, the file's 12).
      {
        number: 13,
        status: 'imported',
        date: '2026-02-10',
        oil_liters: '189.271',
        released_liters: '170.344',
        tank_id: null,
        total_cost_cents: '5500',
        cost_per_gallon_cents: '122',
        cost_feedstock_cents: '2000',
        quality_verdict: 'fail',
        notes: 'Cloudy, soap high',
      },
    ]);
    // No fuel moved: no ledger rows, no layers; the import is audited.
    expect(await countRows('tank_movements', 'coop_id = $1', [ctx.coop.id])).toBe(0);
    expect(await countRows('tank_layers', 'coop_id = $1', [ctx.coop.id])).toBe(0);
    expect(
      await countRows('audit_events', "coop_id = $1 AND action = 'import.create' AND entity_id = $2", [
        ctx.coop.id,
        String(first.body.importId),
      ]),
    ).toBe(1);
    await ctx.agents.admin.post(base()).send({ fileName: 'history again.csv', csv: GOOD }).expect(409);

    // The batch page: a read-only summary for every role (members too); its record cannot be changed.
    const [{ id }] = (await sql<{ id: number }>(`SELECT id FROM batches WHERE coop_id = $1 AND number = 10`, [
      ctx.coop.id,
    ])) as [{ id: number }];
    const page = await ctx.agents.brewer.get(`/api/coops/${ctx.coop.slug}/batches/${id}`).expect(200);
    expect(page.body).toMatchObject({
      view: 'summary',
      status: 'imported',
      number: 10,
      qualityVerdict: 'pass',
      imported: { notes: 'Clear after three washes' },
      costPerGallonCents: 190,
    });
    await ctx.agents.member.get(`/api/coops/${ctx.coop.slug}/batches/${id}`).expect(200);
    await ctx.agents.brewer.patch(`/api/coops/${ctx.coop.slug}/batches/${id}`).send({ notes: 'changed' }).expect(409);
    await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/batches/${id}/advance`)
      .send({ to: 'testing' })
      .expect(409);
    // Rejecting works from the recipe's chemicals: an imported batch has none, so it is refused and stays as it was.
    const rejected = await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/batches/${id}/reject`)
      .send({ reason: 'test' })
      .expect(409);
    expect(rejected.body.error).toMatch(/imported from past records/);
    expect((await sql('SELECT status FROM batches WHERE id = $1', [id]))[0]).toEqual({ status: 'imported' });
    const list = await ctx.agents.member.get(`/api/coops/${ctx.coop.slug}/batches`).expect(200);
    expect(list.body.rows.map((r: { number: number; status: string }) => [r.number, r.status])).toEqual([
      [13, 'imported'],
      [12, 'imported'],
      [10, 'imported'],
    ]);

    // Quarterly report, 2026 Q1: produced in the month of each batch's date; nothing released into a tank.
    const q = await ctx.agents.treasurer
      .get(`/api/coops/${ctx.coop.slug}/reports/quarterly?year=2026&quarter=1`)
      .expect(200);
    expect(
      q.body.months.map((m: { producedLiters: string; releasedLiters: string }) => [
        m.producedLiters,
        m.releasedLiters,
      ]),
    ).toEqual([
      ['143.846', '0.000'],
      ['170.344', '0.000'],
      ['340.687', '0.000'],
    ]);
    // Cost per gallon by batch: the two with recorded costs, oldest number first (total ¢ × 3.785411784 / litres).
    const overview = await ctx.agents.brewer.get(`/api/coops/${ctx.coop.slug}/overview`).expect(200);
    expect(
      overview.body.batchCosts.map((b: { number: number; totalCentsPerGallon: number }) => [
        b.number,
        b.totalCentsPerGallon,
      ]),
    ).toEqual([
      [10, 190],
      [13, 122.22],
    ]);
    // Yield median of fuel out ÷ oil in: 0.95, 0.90, 0.90 → 0.90 (median, hand-computed).
    const plan = await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/planner`)
      .send({ oilVolume: 30, titrationTrials: [2], catalyst: 'KOH', methanolPct: 20 })
      .expect(200);
    expect(plan.body.plan.yieldProjection).toMatchObject({ source: 'history', batches: 3 });
    expect(plan.body.plan.yieldProjection.ratio).toBeCloseTo(0.9, 4);

    // Another co-op sees none of it.
    const theirs = await ctx.agents.outsider.get(`/api/coops/${ctx.coop.slug}/batches/${id}`);
    expect(theirs.status).toBe(404);
    await ctx.agents.outsider
      .post(`/api/coops/${ctx.coop.slug}/imports/past-batches/${first.body.importId}/undo`)
      .send({})
      .expect(404);
    expect(await countRows('batches', "coop_id = $1 AND status = 'imported'", [ctx.other.id])).toBe(0);
  });

  it('undo removes them until a batch is numbered after them', async () => {
    const [done] = await sql<{ id: number }>(
      `SELECT id FROM imports WHERE coop_id = $1 AND kind = 'past-batches' AND status = 'done'`,
      [ctx.coop.id],
    );
    await ctx.agents.admin.post(`${base()}/${done!.id}/undo`).send({}).expect(200);
    expect(await countRows('batches', "coop_id = $1 AND status = 'imported'", [ctx.coop.id])).toBe(0);
    expect(
      await countRows('audit_events', "coop_id = $1 AND action = 'import.undo' AND entity_id = $2", [
        ctx.coop.id,
        String(done!.id),
      ]),
    ).toBe(1);

    // Imported again; then a new batch is numbered 14, after them: undo is refused and changes nothing.
    const again = await ctx.agents.admin.post(base()).send({ fileName: 'history.csv', csv: GOOD }).expect(201);
    const created = await ctx.agents.brewer
      .post(`/api/coops/${ctx.coop.slug}/batches`)
      .send({ oilVolume: 5, titrationTrials: [3] })
      .expect(201);
    expect(created.body.number).toBe(14);
    const before = await footprint();
    const refused = await ctx.agents.admin.post(`${base()}/${again.body.importId}/undo`).send({}).expect(409);
    expect(refused.body.error).toMatch(/can no longer be undone/);
    expect(await footprint()).toEqual(before);
    const template = await ctx.agents.admin.get(`${base()}/template`).expect(200);
    expect(template.text.split('\r\n')[0]).toBe(
      'Batch number,Date,Oil in (gallons),Fuel out (gallons),Cost per gallon,Oil cost,Methanol cost,Catalyst cost,Energy cost,Other cost,Quality,Notes',
    );
  });
});
