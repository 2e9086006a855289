// Monthly invoicing: hand-computed totals and numbering, idempotent re-runs (also after a
// simulated crash), the PDF's text, e-mail with the PDF attached, voiding by credit note, CSV.
import { PDFParse } from 'pdf-parse';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { binary, caughtMail, countRows, signIn, sql, waitForMail } from '../support/api';
import { mailSettled } from '../support/worker';
import { dayIn, insertDraw, invoicesOf, issueMonth, makeBillingCoop, monthsAgo, runMonth } from '../support/billing';

const P = monthsAgo(3); // a past month, so the run accepts it
const NEXT = monthsAgo(2);

async function pdfText(bytes: Buffer): Promise<string> {
  const parser = new PDFParse({ data: bytes });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

describe('monthly invoicing', () => {
  afterAll(async () => {
    // The housekeeping check's own pg-boss and database pool, if it ran.
    await (await globalThis.__tallyvatBoss?.catch(() => undefined))?.stop({ graceful: false, close: true });
    if (process.env.DATABASE_URL) await (await import('@/lib/db')).sequelize.close();
  });
  let c: Awaited<ReturnType<typeof makeBillingCoop>>;
  let slug: string;
  const ids: Record<string, number> = {};

  beforeAll(async () => {
    // Dues $15.00 a month. Prices as locked on each draw: 389 ¢/gal, surcharge 10 ¢/gal, road tax 24.4 ¢/gal.
    c = await makeBillingCoop({ dues: 1500, members: ['Ada Archer', 'Ben Brook', 'Cy Cole', 'Di Dune'] });
    slug = c.coop.slug;
    const m = (n: string) => c.members[n]!.membershipId;
    await sql(`UPDATE memberships SET status = 'suspended' WHERE id = $1`, [m('Di Dune')]); // suspended, nothing drawn → no invoice
    const base = { coopId: c.coop.id, tankId: c.tankId, unitPrice: 389, surchargeRate: 10 };
    // Ada, 10 gal for the road: 37.854 L. fuel 389 × 10 = 3890; surcharge 10 × 10 = 100; tax 24.4 × 10 = 244.
    await insertDraw({
      ...base,
      membershipId: m('Ada Archer'),
      liters: '37.854',
      occurredAt: dayIn(P, 3),
      use: 'road',
      taxRate: 24.4,
      fuelCents: 3890,
      surchargeCents: 100,
      taxCents: 244,
    });
    // Ada, 5.5 gal off-road: 20.820 L. fuel 389 × 5.5 = 2139.5 → 2140 (half away from zero); surcharge 55; no road tax.
    await insertDraw({
      ...base,
      membershipId: m('Ada Archer'),
      liters: '20.820',
      occurredAt: dayIn(P, 9),
      use: 'off-road',
      fuelCents: 2140,
      surchargeCents: 55,
    });
    // Cy, 8 gal road: 30.283 L. fuel 3112; surcharge 80; tax 24.4 × 8 = 195.2 → 195 … then reversed the next day.
    const cyRoad = await insertDraw({
      ...base,
      membershipId: m('Cy Cole'),
      liters: '30.283',
      occurredAt: dayIn(P, 5),
      taxRate: 24.4,
      fuelCents: 3112,
      surchargeCents: 80,
      taxCents: 195,
    });
    await insertDraw({
      ...base,
      membershipId: m('Cy Cole'),
      liters: '-30.283',
      occurredAt: dayIn(P, 6),
      taxRate: 24.4,
      fuelCents: -3112,
      surchargeCents: -80,
      taxCents: -195,
      reverses: cyRoad,
    });
    // Cy, 2 gal for heating: 7.571 L. fuel 778; surcharge 20.
    await insertDraw({
      ...base,
      membershipId: m('Cy Cole'),
      liters: '7.571',
      occurredAt: dayIn(P, 8),
      use: 'heating',
      fuelCents: 778,
      surchargeCents: 20,
    });
    // A draw of next month must not appear on this month's invoice.
    await insertDraw({
      ...base,
      membershipId: m('Ada Archer'),
      liters: '3.785',
      occurredAt: dayIn(NEXT, 2),
      fuelCents: 389,
      surchargeCents: 10,
    });
    // Cy paid $10.00 cash in advance earlier; the treasurer holds it as credit.
    const pay = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments`)
      .send({ memberId: m('Cy Cole'), method: 'cash', amount: '10.00', receivedOn: `${monthsAgo(4)}-20` });
    expect(pay.status, JSON.stringify(pay.body)).toBe(201);
    await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${pay.body.id}/match`)
      .send({ invoiceId: null })
      .expect(200);
  });

  it('builds one draft per member with draws or dues, with lines and totals as computed by hand', async () => {
    const run = await runMonth(c.treasurerAgent, slug, P);
    expect(run.drafts).toBe(4); // Ada, Ben, Cy, Zed (the treasurer pays dues too); not the suspended Di
    const list = await c.treasurerAgent
      .get(`/api/coops/${slug}/billing/invoices?period=${P}&sort=member&dir=asc`)
      .expect(200);
    const byName = Object.fromEntries(list.body.rows.map((r: { memberName: string }) => [r.memberName, r]));
    expect(Object.keys(byName).sort()).toEqual(['Ada Archer', 'Ben Brook', 'Cy Cole', 'Zed Treasurer']);
    // Ada: fuel 3890 + 2140 = 6030, dues 1500, surcharge 100 + 55 = 155, road tax 244 → 6030 + 1500 + 155 + 244 = 7929.
    expect(byName['Ada Archer'].totalCents).toBe(7929);
    // Ben: dues only → 1500.
    expect(byName['Ben Brook'].totalCents).toBe(1500);
    // Cy: fuel 3112 − 3112 + 778 = 778, dues 1500, surcharge 80 − 80 + 20 = 20, tax 195 − 195 = 0 (no line);
    // subtotal 2298, credit −1000 → 1298.
    expect(byName['Cy Cole'].totalCents).toBe(1298);
    expect(byName['Zed Treasurer'].totalCents).toBe(1500);
    for (const r of list.body.rows) {
      expect(r.status).toBe('draft');
      expect(r.number).toBeNull();
      ids[r.memberName] = r.id;
    }
    // Every sort the list offers works on the server (a production build minifies the model's alias).
    for (const sort of ['number', 'member', 'total', 'outstanding', 'status', 'period']) {
      const sorted = await c.treasurerAgent.get(
        `/api/coops/${slug}/billing/invoices?period=${P}&sort=${sort}&dir=desc`,
      );
      expect(sorted.status, `sort=${sort}`).toBe(200);
      expect(sorted.body.rows).toHaveLength(4);
    }
    const byTotal = await c.treasurerAgent
      .get(`/api/coops/${slug}/billing/invoices?period=${P}&sort=total&dir=desc`)
      .expect(200);
    expect(byTotal.body.rows.map((r: { totalCents: number }) => r.totalCents)).toEqual([7929, 1500, 1500, 1298]);

    const ada = await c.treasurerAgent.get(`/api/coops/${slug}/billing/invoices/${ids['Ada Archer']}`).expect(200);
    expect(ada.body.lines.map((l: { kind: string; amountCents: number }) => [l.kind, l.amountCents])).toEqual([
      ['draw', 3890],
      ['draw', 2140],
      ['dues', 1500],
      ['surcharge', 155],
      ['road-tax', 244],
    ]);
    expect(ada.body.lines[0].quantityLiters).toBe(37.854);
    expect(ada.body.lines.reduce((s: number, l: { amountCents: number }) => s + l.amountCents, 0)).toBe(
      ada.body.totalCents,
    );
    const cy = await c.treasurerAgent.get(`/api/coops/${slug}/billing/invoices/${ids['Cy Cole']}`).expect(200);
    expect(cy.body.lines.map((l: { kind: string; amountCents: number }) => [l.kind, l.amountCents])).toEqual([
      ['draw', 3112],
      ['draw-reversal', -3112],
      ['draw', 778],
      ['dues', 1500],
      ['surcharge', 20],
      ['credit', -1000],
    ]);
    expect(cy.body.lines[1].quantityLiters).toBe(-30.283);
  });

  it('running the month again rebuilds the drafts without duplicating anything', async () => {
    const linesBefore = await countRows('invoice_lines', 'coop_id = $1', [c.coop.id]);
    const run = await runMonth(c.treasurerAgent, slug, P);
    expect(run.drafts).toBe(4);
    const rows = await invoicesOf(c.coop.id, P);
    expect(rows).toHaveLength(4);
    expect(await countRows('invoice_lines', 'coop_id = $1', [c.coop.id])).toBe(linesBefore);
    const dup = await sql(
      `SELECT draw_id FROM invoice_lines WHERE coop_id = $1 AND draw_id IS NOT NULL GROUP BY draw_id HAVING count(*) > 1`,
      [c.coop.id],
    );
    expect(dup).toEqual([]);
    ids['Ada Archer'] = rows.find((r) => r.membership_id === c.members['Ada Archer']!.membershipId)!.id;
    ids['Ben Brook'] = rows.find((r) => r.membership_id === c.members['Ben Brook']!.membershipId)!.id;
  });

  it('issuing numbers the invoices 1…4 by member name with no gaps, applies the credit and mails each PDF', async () => {
    const out = await issueMonth(c.treasurerAgent, slug, P);
    expect(out).toEqual({ issued: 4, firstNumber: 'INV-000001', lastNumber: 'INV-000004' });
    const rows = await invoicesOf(c.coop.id, P);
    expect(rows.map((r) => [r.number, r.status])).toEqual([
      [1, 'issued'],
      [2, 'issued'],
      [3, 'issued'],
      [4, 'issued'],
    ]);
    expect(rows[0]!.membership_id).toBe(c.members['Ada Archer']!.membershipId);
    // Cy's credit was used: the ledger sums to 0 (+1000 overpayment, −1000 applied).
    const [credit] = await sql<{ s: string }>(
      `SELECT COALESCE(SUM(amount_cents), 0) AS s FROM member_credits WHERE membership_id = $1`,
      [c.members['Cy Cole']!.membershipId],
    );
    expect(Number(credit!.s)).toBe(0);
    // Issuing again finds nothing to issue.
    const again = await c.treasurerAgent.post(`/api/coops/${slug}/billing/periods/${P}/issue`).send({});
    expect(again.status).toBe(409);

    const mail = await waitForMail(c.members['Ada Archer']!.email, (m) => m.subject.includes('INV-000001'));
    expect(mail.attachments).toEqual([
      expect.objectContaining({ filename: `${slug}-INV-000001.pdf`, contentType: 'application/pdf' }),
    ]);
    expect(mail.text).toContain('$79.29');
    for (let i = 0; i < 50; i++) {
      const [s] = await sql<{ n: string }>(
        `SELECT count(*) AS n FROM invoices WHERE coop_id = $1 AND email_status = 'sent'`,
        [c.coop.id],
      );
      if (Number(s!.n) === 4) break;
      await new Promise((r) => setTimeout(r, 200));
    }
    expect(await countRows('invoices', `coop_id = $1 AND email_status = 'sent'`, [c.coop.id])).toBe(4);
  });

  it('a re-run after issue creates nothing; a late draw goes on the next month', async () => {
    const run = await runMonth(c.treasurerAgent, slug, P);
    expect(run.totalMembers).toBe(0);
    expect(await invoicesOf(c.coop.id, P)).toHaveLength(4);
    // Recorded late: Ben drew 1 gal on the 28th of the already-invoiced month (3.785 L, fuel 389, surcharge 10).
    await insertDraw({
      coopId: c.coop.id,
      tankId: c.tankId,
      membershipId: c.members['Ben Brook']!.membershipId,
      liters: '3.785',
      occurredAt: dayIn(P, 28),
      unitPrice: 389,
      surchargeRate: 10,
      fuelCents: 389,
      surchargeCents: 10,
    });
    await runMonth(c.treasurerAgent, slug, NEXT);
    const next = await c.treasurerAgent
      .get(`/api/coops/${slug}/billing/invoices?period=${NEXT}&sort=member&dir=asc`)
      .expect(200);
    const ben = next.body.rows.find((r: { memberName: string }) => r.memberName === 'Ben Brook');
    // Ben next month: late draw 389 + surcharge 10 + dues 1500 = 1899.
    expect(ben.totalCents).toBe(1899);
    const ada = next.body.rows.find((r: { memberName: string }) => r.memberName === 'Ada Archer');
    // Ada next month: the 1-gal draw of that month 389 + surcharge 10 + dues 1500 = 1899.
    expect(ada.totalCents).toBe(1899);
    // A line can never be filed under another co-op than its invoice's (database check).
    const [stranger] = await sql<{ id: number }>(`SELECT id FROM coops WHERE id <> $1 LIMIT 1`, [c.coop.id]);
    await expect(
      sql(
        `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, amount_cents) VALUES ($1, $2, 1, 'adjustment', 'x', 1)`,
        [stranger!.id, ada.id],
      ),
    ).rejects.toThrow(/its invoice's co-op/);
  });

  it('the PDF names the member, the lines and the total; members download only their own', async () => {
    const res = await c.treasurerAgent
      .get(`/api/coops/${slug}/billing/invoices/${ids['Ada Archer']}/pdf`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="${slug}-INV-000001.pdf"`);
    const text = await pdfText(res.body as Buffer);
    for (const s of [
      'Ada Archer',
      'INV-000001',
      'Membership dues',
      'Fuel drawn, road use',
      'Fuel drawn, off-road use',
      'Road-fuel tax',
      '10.00 gal',
      '5.50 gal',
      '$38.90',
      '$21.40',
      '$2.44',
      '$79.29',
      'How to pay',
    ]) {
      expect(text).toContain(s);
    }
    const ada = await signIn(c.members['Ada Archer']!.email);
    const own = await ada
      .get(`/api/coops/${slug}/invoices/${ids['Ada Archer']}/pdf`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    expect((own.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    await ada.get(`/api/coops/${slug}/invoices/${ids['Ben Brook']}/pdf`).expect(404);
    await ada.get(`/api/coops/${slug}/invoices/${ids['Ben Brook']}`).expect(404);
  });

  it('"send again" queues the invoice’s mail job (202 queued); the worker delivers it exactly once as the next send', async () => {
    const id = ids['Ben Brook']!;
    const ben = c.members['Ben Brook']!.email;
    await mailSettled();
    const before = (await caughtMail(ben)).length;
    const jobs = () => countRows('pgboss.job', `name = 'mail-invoice' AND singleton_key = $1`, [`invoice.${id}`]);
    const jobsBefore = await jobs();
    const res = await c.treasurerAgent.post(`/api/coops/${slug}/billing/invoices/${id}/send`).send({}).expect(202);
    expect(res.body).toEqual({ emailStatus: 'queued' });
    // Nothing is sent inside the request: one job is queued under the invoice's key.
    expect(await jobs()).toBe(jobsBefore + 1);
    await mailSettled();
    const detail = await c.treasurerAgent.get(`/api/coops/${slug}/billing/invoices/${id}`).expect(200);
    expect(detail.body).toMatchObject({ emailStatus: 'sent', emailAttempts: 2 });
    // Exactly one more message, carrying the ledger's Message-ID of the invoice's second send.
    const mails = await caughtMail(ben);
    expect(mails).toHaveLength(before + 1);
    const ledger = await sql<{ generation: number; state: string; message_id: string }>(
      `SELECT generation, state, message_id FROM mail_sends WHERE subject = $1 ORDER BY generation`,
      [`invoice.${id}`],
    );
    expect(ledger.map((r) => [r.generation, r.state])).toEqual([
      [1, 'sent'],
      [2, 'sent'],
    ]);
    expect(mails[0]!.messageId).toBe(ledger[1]!.message_id);
    const audited = await sql<{ after: { emailStatus: string } }>(
      `SELECT after FROM audit_events WHERE coop_id = $1 AND action = 'invoice.email' AND entity_id = $2`,
      [c.coop.id, String(id)],
    );
    expect(audited.map((a) => a.after.emailStatus)).toEqual(['queued']);
    // A draft is not e-mailed; another co-op's invoice is not found.
    const draft = await sql<{ id: number }>(`SELECT id FROM invoices WHERE coop_id = $1 AND status = 'draft' LIMIT 1`, [
      c.coop.id,
    ]);
    if (draft[0])
      await c.treasurerAgent.post(`/api/coops/${slug}/billing/invoices/${draft[0].id}/send`).send({}).expect(404);
  });

  it('housekeeping queues a stale "queued" invoice once, and never a second job beside a live one', async () => {
    // The timed job's function runs here, in-process (the test stack leaves it unscheduled).
    process.env.DATABASE_URL = inject('databaseUrl');
    const { housekeeping } = await import('@/lib/jobs/worker');
    const { enqueue } = await import('@/lib/jobs');
    const [a, b] = [ids['Ada Archer']!, ids['Ben Brook']!];
    await mailSettled();
    const jobs = (id: number) =>
      countRows(
        'pgboss.job',
        `name = 'mail-invoice' AND singleton_key = $1 AND state IN ('created', 'retry', 'active')`,
        [`invoice.${id}`],
      );
    const everJobs = (id: number) =>
      countRows('pgboss.job', `name = 'mail-invoice' AND singleton_key = $1`, [`invoice.${id}`]);
    const benBefore = await everJobs(b);
    // Both left "queued" for 5 minutes (a web process died, or a large send is still on its way);
    // Ada's still has a live job (held back an hour, so the test worker leaves it waiting).
    await sql(
      `UPDATE invoices SET email_status = 'queued', updated_at = now() - interval '5 minutes' WHERE id = ANY($1::int[])`,
      [[a, b]],
    );
    await enqueue(
      'mail-invoice',
      { coopId: c.coop.id, invoiceId: a },
      { singletonKey: `invoice.${a}`, startAfter: 3600 },
    );
    try {
      expect(await housekeeping()).toBeGreaterThanOrEqual(1); // Ben's (other files' stale invoices may count too)
      expect(await jobs(a)).toBe(1);
      // Ben's had none: queued once, and a second round (his job maybe still live) adds nothing.
      await housekeeping();
      expect(await jobs(a)).toBe(1);
      expect(await everJobs(b)).toBe(benBefore + 1);
    } finally {
      await sql(`DELETE FROM pgboss.job WHERE name = 'mail-invoice' AND singleton_key = $1 AND state = 'created'`, [
        `invoice.${a}`,
      ]);
      await sql(`UPDATE invoices SET email_status = 'sent' WHERE id = $1`, [a]);
    }
    await mailSettled();
    expect(
      (await sql<{ email_status: string }>(`SELECT email_status FROM invoices WHERE id = $1`, [b]))[0]!.email_status,
    ).toBe('sent');
  });

  it('voids by credit note with the next number; the member can be invoiced again without gaps', async () => {
    const bad = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/invoices/${ids['Ben Brook']}/void`)
      .send({ reason: '' });
    expect(bad.status).toBe(422);
    expect(bad.body.fields.reason).toBeDefined();
    expect(await countRows('invoices', `coop_id = $1 AND kind = 'credit-note'`, [c.coop.id])).toBe(0);

    // NEXT's four invoices are still drafts, so the counter stands at 4: the credit note is CN-000005.
    const res = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/invoices/${ids['Ben Brook']}/void`)
      .send({ reason: 'Dues were waived for this month' })
      .expect(200);
    expect(res.body.creditNoteLabel).toBe('CN-000005');
    const cn = await c.treasurerAgent.get(`/api/coops/${slug}/billing/invoices/${res.body.creditNoteId}`).expect(200);
    expect(cn.body.totalCents).toBe(-1500);
    expect(cn.body.lines.map((l: { amountCents: number }) => l.amountCents)).toEqual([-1500]);
    const again = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/invoices/${ids['Ben Brook']}/void`)
      .send({ reason: 'twice' });
    expect(again.status).toBe(409);
    // Issued invoices are never deleted: the database refuses it outright.
    await expect(sql(`DELETE FROM invoices WHERE id = $1`, [ids['Ada Archer']])).rejects.toThrow(
      /never deleted|cannot change/,
    );
    await expect(
      sql(`UPDATE invoice_lines SET amount_cents = 1 WHERE invoice_id = $1`, [ids['Ada Archer']]),
    ).rejects.toThrow(/cannot change/);
    await expect(sql(`UPDATE invoices SET total_cents = 1 WHERE id = $1`, [ids['Ada Archer']])).rejects.toThrow(
      /cannot be edited/,
    );

    await runMonth(c.treasurerAgent, slug, P, [c.members['Ben Brook']!.membershipId]);
    const out = await issueMonth(c.treasurerAgent, slug, P);
    expect(out.firstNumber).toBe('INV-000006');
    const numbers = (
      await sql<{ number: number }>(
        `SELECT number FROM invoices WHERE coop_id = $1 AND number IS NOT NULL ORDER BY number`,
        [c.coop.id],
      )
    ).map((r) => r.number);
    expect(numbers).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('exports the month as CSV for the accountant', async () => {
    const res = await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${P}/export?kind=invoices`).expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="${slug}-${P}-invoices.csv"`);
    const lines = res.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\r\n');
    expect(lines[0]).toBe(
      'number,type,month,member,email,status,issued_on,due_on,total,paid,outstanding,cancels,email_status',
    );
    expect(lines.find((l) => l.startsWith('INV-000001,'))).toContain(',79.29,0.00,79.29,');
    expect(lines.find((l) => l.startsWith('CN-000005,'))).toContain(',-15.00,');
    expect(lines).toHaveLength(1 + 6); // 5 invoices (one void) + 1 credit note
    const bal = await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${P}/export?kind=balances`).expect(200);
    expect(bal.text).toContain('member,email,membership,invoiced_this_month');
    const pay = await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${P}/export?kind=payments`).expect(200);
    expect(pay.text.split('\r\n')[0]).toContain('payment_id,received_on,member,method');
    const bad = await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${P}/export?kind=everything`);
    expect(bad.status).toBe(422);
    expect(bad.body.fields.kind).toBeDefined();
  });
});

describe('invoicing runs: bad input, concurrency and a crash in the middle', () => {
  it('refuses bad input with field errors and writes nothing', async () => {
    const c = await makeBillingCoop({ dues: 1000, members: ['Eve East'] });
    const before = await countRows('billing_runs', 'coop_id = $1', [c.coop.id]);
    const cases: [unknown, string][] = [
      [{ period: '2026-13' }, 'period'],
      [{}, 'period'],
      [{ period: '2999-01' }, 'period'],
      [{ period: monthsAgo(1), coopId: 1 }, 'coopId'],
      [{ period: monthsAgo(1), memberIds: [999999999] }, 'memberIds'],
    ];
    for (const [body, field] of cases) {
      const res = await c.treasurerAgent.post(`/api/coops/${c.coop.slug}/billing/runs`).send(body as object);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(Object.keys(res.body.fields ?? {}), JSON.stringify(res.body)).toContain(field);
    }
    expect(await countRows('billing_runs', 'coop_id = $1', [c.coop.id])).toBe(before);
    expect(await countRows('invoices', 'coop_id = $1', [c.coop.id])).toBe(0);
  });

  it('a re-run after a crash mid-month leaves no duplicates and no gaps', async () => {
    const names = ['Fay One', 'Gus Two', 'Hal Three', 'Ivy Four', 'Jo Five'];
    const c = await makeBillingCoop({ dues: 1000, members: names });
    const slug = c.coop.slug;
    const month = monthsAgo(2);
    const mid = (n: string) => c.members[n]!.membershipId;
    // First, part of the month: two members invoiced and issued (numbers 1 and 2) …
    await runMonth(c.treasurerAgent, slug, month, [mid('Fay One'), mid('Gus Two')]);
    expect((await issueMonth(c.treasurerAgent, slug, month)).lastNumber).toBe('INV-000002');
    // … a third member's draft built …
    await runMonth(c.treasurerAgent, slug, month, [mid('Hal Three')]);
    // … then the server died during a full run: its row still says running, heartbeat long gone.
    await sql(
      `INSERT INTO billing_runs (coop_id, period, status, total_members, done_members, heartbeat_at) VALUES ($1, $2::date, 'running', 6, 3, now() - interval '10 minutes')`,
      [c.coop.id, `${month}-01`],
    );
    // Issuing is refused while a run looks alive … (the stale one counts until replaced)
    expect((await c.treasurerAgent.post(`/api/coops/${slug}/billing/periods/${month}/issue`).send({})).status).toBe(
      409,
    );
    // … and starting the run again replaces the dead one and finishes the month.
    const run = await runMonth(c.treasurerAgent, slug, month);
    expect(run.drafts).toBe(4); // Hal (rebuilt, not duplicated), Ivy, Jo, Zed
    expect(await countRows('billing_runs', `coop_id = $1 AND status = 'abandoned'`, [c.coop.id])).toBe(1);
    expect((await issueMonth(c.treasurerAgent, slug, month)).lastNumber).toBe('INV-000006');
    const rows = await invoicesOf(c.coop.id, month);
    expect(rows.map((r) => r.number)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(new Set(rows.map((r) => r.membership_id)).size).toBe(6);
  });

  it('a second start while a run is alive joins it instead of starting another', async () => {
    const c = await makeBillingCoop({ dues: 1000, members: ['Kit Solo'] });
    const month = monthsAgo(1);
    const [live] = await sql<{ id: number }>(
      `INSERT INTO billing_runs (coop_id, period, status, total_members) VALUES ($1, $2::date, 'running', 2) RETURNING id`,
      [c.coop.id, `${month}-01`],
    );
    const res = await c.treasurerAgent
      .post(`/api/coops/${c.coop.slug}/billing/runs`)
      .send({ period: month })
      .expect(200);
    expect(res.body).toMatchObject({ started: false, run: { id: live!.id, status: 'running' } });
    expect(await countRows('billing_runs', 'coop_id = $1', [c.coop.id])).toBe(1);
  });
});
