// Batch lineage in the tank ledger and a recall, end to end against the real server, PostgreSQL,
// job worker and SMTP catcher. The layer and share figures are hand-computed (in whole
// millilitres) for both mixing models; the mixing models themselves are the usual assumptions
// for a shared tank (common practice): stirred → well mixed, unstirred and drawn from the bottom
// → first in, first out.
import { beforeAll, describe, expect, it } from 'vitest';
import { binary, caughtMail, countRows, makeCoopWithRoles, makeUser, signIn, sql, waitForMail } from '../support/api';
import { insertBatch } from '../support/batches';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;

describe('batch lineage and recall', () => {
  let ctx: Ctx;
  let P: string;
  let tankA: number; // well mixed
  let tankB: number; // first in, first out
  const batch: Record<number, number> = {};
  let member2: { email: string; membershipId: number; agent: Awaited<ReturnType<typeof signIn>> };
  let bystander: { email: string; agent: Awaited<ReturnType<typeof signIn>> };
  const draws: Record<string, number> = {};

  const layers = async (tankId: number) =>
    (
      await sql<{ batch_id: number | null; q: string }>(
        'SELECT batch_id, quantity_liters::text AS q FROM tank_layers WHERE tank_id = $1 ORDER BY id',
        [tankId],
      )
    ).map((l) => [l.batch_id, l.q]);
  const drawShares = async (drawId: number) =>
    (
      await sql<{ batch_id: number; q: string }>(
        'SELECT batch_id, quantity_liters::text AS q FROM movement_batch_shares WHERE draw_id = $1 ORDER BY id',
        [drawId],
      )
    ).map((s) => [s.batch_id, s.q]);
  /** Every tank's layers sum to its on hand; every ledger row's shares sum to the row. */
  const invariants = async () => {
    const tanks = await sql<{ id: number; on_hand: string; layered: string }>(
      `SELECT t.id, t.on_hand_liters::text AS on_hand, coalesce((SELECT sum(quantity_liters) FROM tank_layers l WHERE l.tank_id = t.id), 0)::numeric(14,3)::text AS layered FROM tanks t WHERE t.coop_id = $1`,
      [ctx.coop.id],
    );
    for (const t of tanks) expect(t.layered, `tank ${t.id}`).toBe(t.on_hand);
    const rows = await sql<{ id: string; q: string; shared: string }>(
      `SELECT m.id, m.quantity_liters::text AS q, coalesce((SELECT sum(s.quantity_liters) FROM movement_batch_shares s WHERE s.movement_id = m.id), 0)::numeric(14,3)::text AS shared
         FROM tank_movements m WHERE m.coop_id = $1`,
      [ctx.coop.id],
    );
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect(r.shared, `ledger row ${r.id}`).toBe(r.q);
  };
  const release = async (number: number, tankId: number, volume: string) => {
    const id = await insertBatch(ctx.coop.id, { number, status: 'testing', methanolLiters: 2, catalystGrams: 50 });
    await ctx.agents.brewer
      .post(`${P}/batches/${id}/release`)
      .send({ tankId, volume, reason: 'Lab results to follow' })
      .expect(200);
    batch[number] = id;
    return id;
  };
  const draw = async (membershipId: number, tankId: number, quantity: string) =>
    (
      await ctx.agents.brewer
        .post(`${P}/draws`)
        .send({ membershipId, tankId, quantity, declaredUse: 'road' })
        .expect(201)
    ).body.id as number;

  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    await sql(`UPDATE coops SET units = 'metric' WHERE id = $1`, [ctx.coop.id]);
    P = `/api/coops/${ctx.coop.slug}`;
    tankA = (await ctx.agents.brewer.post(`${P}/tanks`).send({ name: 'Stirred tank', capacity: '1000' }).expect(201))
      .body.id;
    tankB = (await ctx.agents.brewer.post(`${P}/tanks`).send({ name: 'Tote', capacity: '1000' }).expect(201)).body.id;
    const b = await ctx.agents.brewer.patch(`${P}/tanks/${tankB}`).send({ mixing: 'fifo' }).expect(200);
    expect(b.body.mixing).toBe('fifo');
    await ctx.agents.treasurer
      .post(`${P}/pricing`)
      .send({ kind: 'cost-plus-percent', marginPct: '10', surchargeCents: '0', roadTaxCents: '0' })
      .expect(201);
    await ctx.agents.brewer
      .post(`${P}/supplies/chemicals`)
      .send({
        kind: 'methanol',
        supplier: 'Valley Chem Supply',
        receivedOn: '2026-10-01',
        quantity: 100,
        unit: 'L',
        totalCost: '150.00',
      })
      .expect(201);
    await ctx.agents.brewer
      .post(`${P}/supplies/chemicals`)
      .send({
        kind: 'KOH',
        supplier: 'Lakeside Lab Goods',
        receivedOn: '2026-10-01',
        quantity: 5,
        unit: 'kg',
        totalCost: '40.00',
        purityPct: 90,
      })
      .expect(201);
    const u2 = await makeUser({ coopId: ctx.coop.id, role: 'member' });
    member2 = { email: u2.email, membershipId: u2.membershipId!, agent: await signIn(u2.email) };
    const u3 = await makeUser({ coopId: ctx.coop.id, role: 'member' });
    bystander = { email: u3.email, agent: await signIn(u3.email) };
  });

  it('well-mixed tank: releases add layers, draws take every batch in proportion (hand-computed)', async () => {
    await release(1, tankA, '100');
    await release(2, tankA, '300');
    expect(await layers(tankA)).toEqual([
      [batch[1], '100.000'],
      [batch[2], '300.000'],
    ]);
    // 40 L of 400 L: 40 × 100/400 = 10 L of batch 1, 40 × 300/400 = 30 L of batch 2
    draws.d1 = await draw(ctx.users.member.membershipId!, tankA, '40');
    expect(await drawShares(draws.d1)).toEqual([
      [batch[1], '-10.000'],
      [batch[2], '-30.000'],
    ]);
    // 10.001 L of 360 L (90 + 270): 10 001 × 90 000/360 000 = 2 500.25 → 2 500 mL; 10 001 × 270 000/360 000 = 7 500.75 → 7 500 mL;
    // the last millilitre to the larger remainder (.75, batch 2): 2.500 + 7.501 = 10.001 L
    draws.d2 = await draw(member2.membershipId, tankA, '10.001');
    expect(await drawShares(draws.d2)).toEqual([
      [batch[1], '-2.500'],
      [batch[2], '-7.501'],
    ]);
    expect(await layers(tankA)).toEqual([
      [batch[1], '87.500'],
      [batch[2], '262.499'],
    ]);
    // The member sees which batches their draw came from.
    const mine = await ctx.agents.member.get(`${P}/draws`).expect(200);
    expect(
      mine.body.items[0].batches.map((x: { batchNumber: number; quantity: number }) => [x.batchNumber, x.quantity]),
    ).toEqual([
      [1, 10],
      [2, 30],
    ]);
    await invariants();
  });

  it('transfers carry their batches into a FIFO tank, whose draws take the oldest fuel first; reversals put it back', async () => {
    // 36 L of 349.999 L: 36 000 × 87 500/349 999 = 9 000.03 → 9 000 mL; 36 000 × 262 499/349 999 = 26 999.97 → 26 999, +1 (larger remainder) → 27 000
    await ctx.agents.brewer
      .post(`${P}/tanks/transfers`)
      .send({ fromTankId: tankA, toTankId: tankB, quantity: '36' })
      .expect(201);
    expect(await layers(tankB)).toEqual([
      [batch[1], '9.000'],
      [batch[2], '27.000'],
    ]);
    await release(3, tankB, '50');
    // FIFO: 20 L = all 9 L of batch 1 (oldest), then 11 L of batch 2
    draws.d3 = await draw(ctx.users.member.membershipId!, tankB, '20');
    expect(await drawShares(draws.d3)).toEqual([
      [batch[1], '-9.000'],
      [batch[2], '-11.000'],
    ]);
    expect(await layers(tankB)).toEqual([
      [batch[2], '16.000'],
      [batch[3], '50.000'],
    ]);
    const rev = await ctx.agents.brewer
      .post(`${P}/draws/${draws.d3}/reverse`)
      .send({ reason: 'Meter misread' })
      .expect(201);
    // The reversal returns exactly the draw's batches, stacked on top (newest) in a FIFO tank.
    expect(await drawShares(rev.body.id)).toEqual([
      [batch[1], '9.000'],
      [batch[2], '11.000'],
    ]);
    expect(await layers(tankB)).toEqual([
      [batch[2], '16.000'],
      [batch[3], '50.000'],
      [batch[1], '9.000'],
      [batch[2], '11.000'],
    ]);
    await invariants();
  });

  it('a dip difference is spread over the layers in proportion (hand-computed); the database refuses layers that do not add up', async () => {
    // Tank A: 78.5 L (batch 1) + 235.499 L (batch 2) = 313.999 L; reading 313 L → −999 mL:
    // 999 × 78 500/313 999 = 249.75 → 249 (+1, the larger remainder) = 250 mL; 999 × 235 499/313 999 = 749.25 → 749 mL
    expect(await layers(tankA)).toEqual([
      [batch[1], '78.500'],
      [batch[2], '235.499'],
    ]);
    await ctx.agents.brewer
      .post(`${P}/tanks/${tankA}/dips`)
      .send({ measured: '313', reason: 'Evaporation' })
      .expect(201);
    expect(await layers(tankA)).toEqual([
      [batch[1], '78.250'],
      [batch[2], '234.750'],
    ]);
    await invariants();
    await expect(
      sql('UPDATE tank_layers SET quantity_liters = quantity_liters + 1 WHERE tank_id = $1', [tankA]),
    ).rejects.toThrow(/layers hold/);
    await expect(sql('UPDATE tanks SET on_hand_liters = on_hand_liters - 1 WHERE id = $1', [tankA])).rejects.toThrow(
      /layers hold/,
    );
  });

  it('a failing late lab result puts the batch under review: fuel held, exactly its members e-mailed, the notice on their overview', async () => {
    // An open reservation at tank A before the result arrives: its holder is told it is on hold.
    await bystander.agent
      .post(`${P}/reservations`)
      .send({ tankId: tankA, quantity: '5', windowStart: day(0), windowEnd: day(2) })
      .expect(201);
    const r = await ctx.agents.brewer
      .post(`${P}/batches/${batch[2]}/lab-results`)
      .send({
        labResults: {
          acidNumber: { value: 0.9, method: 'ASTM D664', laboratory: 'Riverbend Fuel Lab', date: '2026-11-30' },
        },
      })
      .expect(200);
    expect(r.body.review).toMatchObject({ status: 'open', cause: 'lab-result' });
    expect(r.body.review.finding).toMatch(/Acid number/);
    // Held: tank A is well mixed, so all of it; tank B's oldest layer is batch 2, so everything above it too.
    const a = (await ctx.agents.member.get(`${P}/tanks/${tankA}`).expect(200)).body;
    expect(a).toMatchObject({ heldLiters: 313, reservedLiters: 5, availableLiters: 0 });
    const b = (await ctx.agents.member.get(`${P}/tanks/${tankB}`).expect(200)).body;
    expect(b).toMatchObject({ heldLiters: 86, availableLiters: 0 });
    // Not reservable, not drawable, not movable.
    await ctx.agents.member
      .post(`${P}/reservations`)
      .send({ tankId: tankA, quantity: '5', windowStart: day(0), windowEnd: day(2) })
      .expect(409);
    const refused = await ctx.agents.brewer
      .post(`${P}/draws`)
      .send({ membershipId: member2.membershipId, tankId: tankA, quantity: '1', declaredUse: 'road' })
      .expect(409);
    expect(refused.body.error).toMatch(/under review/);
    // Tank A's reservation sits on held fuel: on hand − reserved − held is below zero, and what is
    // available is said as zero, never a negative amount.
    expect(refused.body).toMatchObject({ availableLiters: 0 });
    await ctx.agents.brewer
      .post(`${P}/tanks/transfers`)
      .send({ fromTankId: tankB, toTankId: tankA, quantity: '1' })
      .expect(409);
    const unmoved = await ctx.agents.brewer
      .post(`${P}/tanks/transfers`)
      .send({ fromTankId: tankA, toTankId: tankB, quantity: '1' })
      .expect(409);
    expect(unmoved.body).toMatchObject({ availableLiters: 0, available: 0 });
    expect(await countRows('reservations', 'coop_id = $1', [ctx.coop.id])).toBe(1);
    const held = await waitForMail(
      bystander.email,
      (m) => /reservation at Stirred tank is on hold/.test(m.subject),
      30_000,
    );
    expect(held.text).toMatch(/batch 2 is under review/);

    // Exactly the two members who drew batch 2 are e-mailed, with the finding, cautions and their volume.
    const m1 = await waitForMail(ctx.users.member.email, (m) => /batch 2 is under review/.test(m.subject), 30_000);
    const m2 = await waitForMail(member2.email, (m) => /batch 2 is under review/.test(m.subject), 30_000);
    expect(m1.text).toMatch(/Stop using this fuel in road vehicles/);
    expect(m1.text).toMatch(/qualified diesel mechanic/);
    expect(m1.text).toMatch(/Acid number/);
    expect(m1.text).toMatch(/about 30(\.0+)? L/); // 30 L from the first draw; the FIFO draw's 11 L was reversed
    expect(m2.text).toMatch(/about 7\.50/); // 7.501 L
    await new Promise((res) => setTimeout(res, 1500));
    const recipients = (await caughtMail())
      .filter((m) => /batch 2 is under review/.test(m.subject))
      .map((m) => m.to.toLowerCase())
      .sort();
    expect(
      recipients.filter((to) =>
        [ctx.users.member.email, member2.email, bystander.email, ctx.users.brewer.email].some((e) =>
          to.includes(e.toLowerCase()),
        ),
      ),
    ).toHaveLength(2);
    expect(recipients.some((to) => to.includes(bystander.email.toLowerCase()))).toBe(false);

    // Overview notice for the member who drew it, none for the one who did not.
    const page = await ctx.agents.member.get(`/c/${ctx.coop.slug}`).expect(200);
    expect(page.text).toMatch(/Fuel you drew from batch 2 is under review/);
    const other = await bystander.agent.get(`/c/${ctx.coop.slug}`).expect(200);
    expect(other.text).not.toMatch(/Fuel you drew/);
    // Everyone's tank card names the held fuel (all 399 L: reserved fuel on held layers included).
    expect(other.text).toMatch(/399 L<!-- --> held: a batch is under review/);
    expect(await countRows('audit_events', `coop_id = $1 AND action = 'batch.review.open'`, [ctx.coop.id])).toBe(1);
  });

  it('where the fuel went: brewers, treasurers and admins; the treasurer sees the drawn value; report as CSV and PDF', async () => {
    const l = (await ctx.agents.treasurer.get(`${P}/batches/${batch[2]}/lineage`).expect(200)).body;
    expect(l.members.map((m: { name: string; batchMl: number }) => m.batchMl).sort()).toEqual([30_000, 7_501]);
    expect(l.members.every((m: { valueCents: number }) => m.valueCents > 0)).toBe(true);
    expect(l.inTanks.map((t: { tankId: number; ml: number }) => [t.tankId, t.ml])).toEqual([
      [tankA, 234_750],
      [tankB, 27_000],
    ]);
    await ctx.agents.member.get(`${P}/batches/${batch[2]}/lineage`).expect(403);
    await ctx.agents.outsider.get(`${P}/batches/${batch[2]}/lineage`).expect(404);
    const csv = await ctx.agents.brewer.get(`${P}/batches/${batch[2]}/recall-report?format=csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text).toMatch(/review,2,/);
    const pdf = await ctx.agents.admin
      .get(`${P}/batches/${batch[2]}/recall-report?format=pdf`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    await ctx.agents.brewer.get(`${P}/batches/${batch[2]}/recall-report?format=xml`).expect(422);
  });

  it('disposal needs a method and a receipt; closing removes the held fuel, audits and e-mails the follow-up', async () => {
    const before = await countRows('tank_movements', 'coop_id = $1', [ctx.coop.id]);
    const bad = await ctx.agents.brewer
      .post(`${P}/batches/${batch[2]}/review/close`)
      .send({ outcome: 'disposed', notes: 'Acid number confirmed by re-test' })
      .expect(422);
    expect(Object.keys(bad.body.fields).sort()).toEqual(['disposalMethod', 'receiptFileId']);
    await ctx.agents.member
      .post(`${P}/batches/${batch[2]}/review/close`)
      .send({ outcome: 'cleared', notes: 'nothing' })
      .expect(403);
    expect(await countRows('tank_movements', 'coop_id = $1', [ctx.coop.id])).toBe(before);
    const up = await ctx.agents.brewer
      .post(`${P}/batches/${batch[2]}/files`)
      .field('purpose', 'receipt')
      .attach('file', Buffer.from('%PDF-1.4\n% disposal receipt\n%%EOF\n'), {
        filename: 'receipt.pdf',
        contentType: 'application/pdf',
      })
      .expect(201);
    const closed = await ctx.agents.brewer
      .post(`${P}/batches/${batch[2]}/review/close`)
      .send({
        outcome: 'disposed',
        notes: 'Acid number confirmed by re-test',
        disposalMethod: 'Collected by a licensed waste-oil hauler',
        receiptFileId: up.body.id,
      })
      .expect(200);
    expect(closed.body).toMatchObject({ status: 'closed', outcome: 'disposed', receiptFileId: up.body.id });
    expect(await layers(tankA)).toEqual([[batch[1], '78.250']]);
    expect(await layers(tankB)).toEqual([
      [batch[3], '50.000'],
      [batch[1], '9.000'],
    ]);
    expect((await ctx.agents.member.get(`${P}/tanks/${tankA}`).expect(200)).body).toMatchObject({
      heldLiters: 0,
      availableLiters: 73.25,
    });
    expect(await countRows('tank_movements', `coop_id = $1 AND kind = 'disposal'`, [ctx.coop.id])).toBe(2);
    expect(await countRows('audit_events', `coop_id = $1 AND action = 'batch.review.close'`, [ctx.coop.id])).toBe(1);
    const f = await waitForMail(member2.email, (m) => /review of batch 2 closed/.test(m.subject), 30_000);
    expect(f.text).toMatch(/disposed of/);
    await invariants();
  });

  it('a flag with no draws e-mails no one; cleared and re-treated outcomes close it, each audited', async () => {
    const mailsBefore = (await caughtMail()).length;
    await ctx.agents.brewer
      .post(`${P}/batches/${batch[3]}/review`)
      .send({ finding: 'Retained sample turned cloudy overnight' })
      .expect(201);
    await ctx.agents.brewer.post(`${P}/batches/${batch[3]}/review`).send({ finding: 'Again' }).expect(409);
    // FIFO tank B: batch 3 is now its oldest layer, so all 59 L are held.
    expect((await ctx.agents.member.get(`${P}/tanks/${tankB}`).expect(200)).body).toMatchObject({
      heldLiters: 59,
      availableLiters: 0,
    });
    await ctx.agents.brewer
      .post(`${P}/batches/${batch[3]}/review/close`)
      .send({ outcome: 'cleared', notes: 'Cleared after it warmed up: wax, not water' })
      .expect(200);
    expect((await ctx.agents.member.get(`${P}/tanks/${tankB}`).expect(200)).body).toMatchObject({
      heldLiters: 0,
      availableLiters: 59,
    });
    await ctx.agents.brewer
      .post(`${P}/batches/${batch[3]}/review`)
      .send({ finding: 'Water found at the bottom of the tote' })
      .expect(201);
    const next = await insertBatch(ctx.coop.id, { number: 9 });
    await ctx.agents.brewer
      .post(`${P}/batches/${batch[3]}/review/close`)
      .send({ outcome: 'retreated', notes: 'Re-washed and dried', retreatBatchId: batch[1] })
      .expect(422);
    await ctx.agents.brewer
      .post(`${P}/batches/${batch[3]}/review/close`)
      .send({ outcome: 'retreated', notes: 'Re-washed and dried', retreatBatchId: next })
      .expect(200);
    expect(await layers(tankB)).toEqual([[batch[1], '9.000']]);
    expect(await countRows('audit_events', `coop_id = $1 AND action = 'batch.review.close'`, [ctx.coop.id])).toBe(3);
    expect(await countRows('batch_reviews', `coop_id = $1 AND status = 'open'`, [ctx.coop.id])).toBe(0);
    await new Promise((res) => setTimeout(res, 1000));
    expect((await caughtMail()).filter((m) => /batch 3/.test(m.subject))).toHaveLength(0);
    expect((await caughtMail()).length).toBeGreaterThanOrEqual(mailsBefore);
    await invariants();
  });
});

function day(offset: number): string {
  const d = new Date(Date.now() + offset * 86_400_000);
  return d.toISOString().slice(0, 10);
}
