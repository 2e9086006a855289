import { beforeAll, describe, expect, it } from 'vitest';
import { countRows, makeCoopWithRoles, sql } from '../support/api';

const valid = {
  name: 'Riverbend Fuel Circle',
  units: 'metric',
  timezone: 'America/Denver',
  monthlyDues: '12.50',
  selfServeDraws: true,
  catalyst: 'KOH',
  baseGramsPerLiter: 4.91,
  purityPct: 90,
  methanolPct: 20,
  qualityStandard: 'EN 14214',
};

describe('co-op settings API', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let url: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    url = `/api/coops/${ctx.coop.slug}/settings`;
  });

  it('an admin reads defaults and saves new settings; dues are kept in cents; the change is audited', async () => {
    const before = await ctx.agents.admin.get(url).expect(200);
    expect(before.body).toMatchObject({
      units: 'us',
      monthlyDuesCents: 0,
      catalyst: 'NaOH',
      baseGramsPerLiter: 3.5,
      qualityStandard: 'ASTM D6751',
    });
    const res = await ctx.agents.admin.put(url).send(valid).expect(200);
    expect(res.body).toMatchObject({
      name: 'Riverbend Fuel Circle',
      units: 'metric',
      monthlyDuesCents: 1250,
      selfServeDraws: true,
      catalyst: 'KOH',
      purityPct: 90,
    });
    const [row] = await sql<{ settings: { monthlyDuesCents: number; recipe: { catalyst: string } } }>(
      `SELECT settings FROM coops WHERE id = $1`,
      [ctx.coop.id],
    );
    expect(row!.settings.monthlyDuesCents).toBe(1250);
    expect(row!.settings.recipe.catalyst).toBe('KOH');
    const [ev] = await sql<{ before: { units: string }; after: { units: string } }>(
      `SELECT before, after FROM audit_events WHERE coop_id = $1 AND action = 'coop.settings' ORDER BY id DESC LIMIT 1`,
      [ctx.coop.id],
    );
    expect(ev).toMatchObject({ before: { units: 'us' }, after: { units: 'metric' } });
  });

  it('the brewing site elevation is typed in the co-op units and kept in metres (1 ft = 0.3048 m, NIST SP 811)', async () => {
    const metric = await ctx.agents.admin
      .put(url)
      .send({ ...valid, elevation: '1600' })
      .expect(200);
    expect(metric.body.elevationM).toBe(1600);
    const us = await ctx.agents.admin
      .put(url)
      .send({ ...valid, units: 'us', elevation: '5000' })
      .expect(200);
    expect(us.body.elevationM).toBeCloseTo(1524, 6);
    // Blank leaves it as it was; out of range (metric 6000 m) → 422 naming the field.
    const blank = await ctx.agents.admin
      .put(url)
      .send({ ...valid, elevation: '' })
      .expect(200);
    expect(blank.body.elevationM).toBeCloseTo(1524, 6);
    const high = await ctx.agents.admin
      .put(url)
      .send({ ...valid, elevation: '6000' })
      .expect(422);
    expect(Object.keys(high.body.fields)).toEqual(['elevation']);
  });

  it('bad input → 422 with each field and reason, nothing written', async () => {
    const events = await countRows('audit_events', 'coop_id = $1', [ctx.coop.id]);
    const res = await ctx.agents.admin
      .put(url)
      .send({
        ...valid,
        units: 'imperial',
        timezone: 'Mars/Olympus',
        monthlyDues: '12.345',
        purityPct: 0,
        methanolPct: 'lots',
      })
      .expect(422);
    expect(Object.keys(res.body.fields).sort()).toEqual([
      'methanolPct',
      'monthlyDues',
      'purityPct',
      'timezone',
      'units',
    ]);
    expect(await countRows('audit_events', 'coop_id = $1', [ctx.coop.id])).toBe(events);
  });

  it('a co-op id smuggled in the body is refused', async () => {
    const res = await ctx.agents.admin
      .put(url)
      .send({ ...valid, coopId: ctx.other.id })
      .expect(422);
    expect(res.body.fields.coopId).toEqual(['This field is not accepted here.']);
  });
});
