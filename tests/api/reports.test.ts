import { PDFParse } from 'pdf-parse';
import { beforeAll, describe, expect, it } from 'vitest';
import { binary, makeCoopWithRoles, sql } from '../support/api';
import { insertBatch } from '../support/batches';

// A hand-computed quarter (2026 Q3) in a co-op on America/Chicago time (UTC−5 in summer).
// 1 US gal = 3.785411784 L (NIST Handbook 44), so 40 gal = 151.416 L, 50 gal = 189.271 L,
// 10 gal = 37.854 L, 5 gal = 18.927 L, 20 gal = 75.708 L (each rounded to the millilitre).
//
// releases: Jul 10 40 gal; Aug 15 50 gal                        → released Q3 = 90 gal
// draws:    Jun 30 22:00 local (Jul 1 03:00 UTC) road 10 gal   → NOT in Q3 (June, local time)
//           Jul 12 road 10 gal, tax 244 ¢ (24.4 ¢/gal)         → July road 10 gal
//           Aug 20 off-road 5 gal                               → August off-road 5 gal
//           Sep 30 23:30 local (Oct 1 04:30 UTC) heating 20 gal → September heating 20 gal
//           Sep 5 road 10 gal, tax 244 ¢, and its reversal      → September road 0, tax 0
// batches (produced = volume of batches released in the month, by release time):
//           #1 released Jul 10 40 gal; #2 released Aug 15 50 gal; #3 rejected Aug 20 (no fuel);
//           #4 released Sep 30 23:00 local (Oct 1 04:00 UTC) 10 gal, no tank movement here;
//           #5 released Jun 30 22:00 local (Jul 1 03:00 UTC) 10 gal   → NOT in Q3
//                                                                → produced Q3 = 100 gal = 378.541 L
// totals: road 10 gal (37.854 L), off-road 5 gal, heating 20 gal, drawn 35 gal (132.489 L);
//         road tax 244 ¢; draws counted: 5 − 1 reversal − 1 outside = 3 in Q3.
describe('quarterly fuel-volume report', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let url: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    await sql(`UPDATE coops SET timezone = 'America/Chicago' WHERE id = $1`, [ctx.coop.id]);
    const [tank] = await sql<{ id: number }>(
      `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Report tank', 4000) RETURNING id`,
      [ctx.coop.id],
    );
    const t = tank!.id;
    const move = (q: string, at: string) =>
      sql(
        `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, occurred_at)
           VALUES ($1, $2, 'release', $3, 0, 0, 0, $4)`,
        [ctx.coop.id, t, q, at],
      );
    await move('151.416', '2026-07-10T15:00:00Z');
    await move('189.271', '2026-08-15T15:00:00Z');
    const costs = { methanol: 4000, catalyst: 600, energy: 500, feedstock: 1000, other: 0 };
    await insertBatch(ctx.coop.id, {
      number: 1,
      released: { at: '2026-07-10T15:00:00Z', tankId: t, liters: '151.416', costs },
    });
    await insertBatch(ctx.coop.id, {
      number: 2,
      released: { at: '2026-08-15T15:00:00Z', tankId: t, liters: '189.271', costs },
    });
    await insertBatch(ctx.coop.id, {
      number: 3,
      rejected: { at: '2026-08-20T15:00:00Z', reason: 'Failed the wash test' },
    });
    await insertBatch(ctx.coop.id, {
      number: 4,
      released: { at: '2026-10-01T04:00:00Z', tankId: t, liters: '37.854', costs },
    });
    await insertBatch(ctx.coop.id, {
      number: 5,
      released: { at: '2026-07-01T03:00:00Z', tankId: t, liters: '37.854', costs },
    });
    const m = ctx.users.member.membershipId;
    const draw = async (q: string, use: string, tax: number, at: string, reverses: number | null = null) => {
      const [d] = await sql<{ id: number }>(
        `INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, unit_price_cents_per_gallon,
           road_tax_cents_per_gallon, fuel_cents, tax_cents, total_cents, occurred_at, reverses_draw_id)
         VALUES ($1, $2, $3, $4, $5, 300, 24.4, 0, $6, $6, $7, $8) RETURNING id`,
        [ctx.coop.id, t, m, q, use, tax, at, reverses],
      );
      return d!.id;
    };
    await draw('37.854', 'road', 244, '2026-07-01T03:00:00Z');
    await draw('37.854', 'road', 244, '2026-07-12T15:00:00Z');
    await draw('18.927', 'off-road', 0, '2026-08-20T15:00:00Z');
    await draw('75.708', 'heating', 0, '2026-10-01T04:30:00Z');
    const sep = await draw('37.854', 'road', 244, '2026-09-05T15:00:00Z');
    await draw('-37.854', 'road', -244, '2026-09-06T15:00:00Z', sep);
    await sql(
      `INSERT INTO price_policies (coop_id, kind, margin_cents_per_gallon, road_tax_cents_per_gallon) VALUES ($1, 'cost-plus-amount', 40, 24.4)`,
      [ctx.coop.id],
    );
    url = `/api/coops/${ctx.coop.slug}/reports/quarterly?year=2026&quarter=3`;
  });

  it('per month and quarter, by declared use, against the hand computation', async () => {
    const res = await ctx.agents.treasurer.get(url).expect(200);
    expect(res.body.months.map((m: { period: string }) => m.period)).toEqual(['2026-07', '2026-08', '2026-09']);
    expect(res.body.months[0]).toMatchObject({
      producedLiters: '151.416',
      releasedLiters: '151.416',
      drawnRoadLiters: '37.854',
      roadTaxCents: 244,
      draws: 1,
    });
    expect(res.body.months[1]).toMatchObject({
      producedLiters: '189.271',
      releasedLiters: '189.271',
      drawnOffRoadLiters: '18.927',
      draws: 1,
    });
    expect(res.body.months[2]).toMatchObject({
      producedLiters: '37.854',
      releasedLiters: '0.000',
      drawnRoadLiters: '0.000',
      drawnHeatingLiters: '75.708',
      roadTaxCents: 0,
      draws: 1,
    });
    expect(res.body.total).toMatchObject({
      period: '2026 Q3',
      producedLiters: '378.541',
      releasedLiters: '340.687',
      drawnRoadLiters: '37.854',
      drawnOffRoadLiters: '18.927',
      drawnHeatingLiters: '75.708',
      drawnTotalLiters: '132.489',
      roadTaxCents: 244,
      draws: 3,
    });
    expect(res.body.roadTaxCentsPerGallon).toBe('24.400');
    expect(res.body.disclaimer).toMatch(/rules vary/);
  });

  it('CSV: columns in US gallons and a total row that matches', async () => {
    const res = await ctx.agents.admin.get(`${url}&format=csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename=".*-2026-q3\.csv"/);
    const lines = res.text.trim().split('\r\n');
    expect(lines[0]).toBe(
      'period,produced_us_gal,released_us_gal,drawn_road_us_gal,drawn_off_road_us_gal,drawn_heating_us_gal,drawn_total_us_gal,road_tax_collected,draws',
    );
    expect(lines).toHaveLength(5);
    // 378.541 L / 3.785411784 = 100.000 gal; 340.687 L = 90.000 gal; 132.489 L = 35.000 gal
    expect(lines[4]).toBe('2026 Q3,100.000,90.000,10.000,5.000,20.000,35.000,2.44,3');
  });

  it('PDF: text names the quarter, the totals and the filing caution', async () => {
    const res = await ctx.agents.admin.get(`${url}&format=pdf`).buffer(true).parse(binary).expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const { text } = await new PDFParse({ data: new Uint8Array(res.body as Buffer) }).getText();
    expect(text).toContain('2026 Q3');
    expect(text).toContain('35.0 gal');
    expect(text).toContain('$2.44');
    expect(text).toMatch(/rules vary/);
  });

  it('metric co-ops see litres; what is stored does not change', async () => {
    await sql(`UPDATE coops SET units = 'metric' WHERE id = $1`, [ctx.coop.id]);
    const res = await ctx.agents.admin.get(`${url}&format=csv`).expect(200);
    expect(res.text.split('\r\n')[4]).toBe('2026 Q3,378.541,340.687,37.854,18.927,75.708,132.489,2.44,3');
    const [row] = await sql<{ s: string }>(
      `SELECT sum(quantity_liters)::text AS s FROM tank_movements WHERE coop_id = $1`,
      [ctx.coop.id],
    );
    expect(row!.s).toBe('340.687');
    await sql(`UPDATE coops SET units = 'us' WHERE id = $1`, [ctx.coop.id]);
  });

  it('bad quarter → 422 naming the field; members may not read it', async () => {
    const bad = await ctx.agents.admin
      .get(`/api/coops/${ctx.coop.slug}/reports/quarterly?year=2026&quarter=5`)
      .expect(422);
    expect(bad.body.fields.quarter).toBeDefined();
    await ctx.agents.member.get(url).expect(403);
    await ctx.agents.outsider.get(url).expect(404);
  });
});
