// A card payment whose answer was lost and whose webhook never comes is settled by the worker's
// settling job: it looks the charge up at the provider by the attempt id in the charge's metadata
// and records it through the one place a charge becomes a payment; an attempt the provider has
// no charge for is marked failed (nothing was charged). The job's function runs here in-process
// (the worker runs it every minute for attempts older than three minutes).
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { countRows, signIn, sql } from '../support/api';
import {
  clearHeld,
  fakeCharges,
  holdWebhooks,
  invoicesOf,
  issueMonth,
  makeBillingCoop,
  monthsAgo,
  runMonth,
  setOutage,
} from '../support/billing';

describe('settling card payments with an unknown outcome', () => {
  let card: typeof import('@/lib/billing/card');
  let db: typeof import('@/lib/db');
  beforeAll(async () => {
    const payments = new URL(inject('paymentsUrl'));
    process.env.DATABASE_URL = inject('databaseUrl');
    process.env.STRIPE_SECRET_KEY = 'sk_test_tallyvat_local';
    process.env.STRIPE_API_HOST = payments.hostname;
    process.env.STRIPE_API_PORT = payments.port;
    process.env.STRIPE_API_PROTOCOL = 'http';
    process.env.PAYMENT_SETTLE_AFTER_SECONDS = '0';
    card = await import('@/lib/billing/card');
    db = await import('@/lib/db');
  });
  afterAll(async () => {
    await setOutage(false);
    await clearHeld();
    await holdWebhooks(false);
    await db?.sequelize.close();
  });

  it('answer lost, no webhook: the job finds the charge and records the payment once; no charge at all: the attempt fails', async () => {
    const c = await makeBillingCoop({ dues: 2500, members: ['Lola Lost', 'Nico Nothing'] });
    const P = monthsAgo(1);
    await runMonth(c.treasurerAgent, c.coop.slug, P);
    await issueMonth(c.treasurerAgent, c.coop.slug, P);
    const rows = await invoicesOf(c.coop.id, P);
    const invOf = (name: string) => rows.find((r) => r.membership_id === c.members[name]!.membershipId)!.id;
    const pay = async (name: string) =>
      (await signIn(c.members[name]!.email))
        .post(`/api/coops/${c.coop.slug}/invoices/${invOf(name)}/pay`)
        .send({ card: 'test-approved' });

    await holdWebhooks(true);
    await setOutage(true, 'lose-response'); // charged, answer lost
    expect((await pay('Lola Lost')).status).toBe(503);
    await setOutage(true, '503'); // never reaches the provider
    expect((await pay('Nico Nothing')).status).toBe(503);
    await setOutage(false);
    expect((await fakeCharges()).filter((ch) => ch.metadata?.invoice_id === String(invOf('Lola Lost')))).toHaveLength(
      1,
    );
    expect(
      (await fakeCharges()).filter((ch) => ch.metadata?.invoice_id === String(invOf('Nico Nothing'))),
    ).toHaveLength(0);
    const status = async (name: string) =>
      (await sql<{ status: string }>('SELECT status FROM payment_attempts WHERE invoice_id = $1', [invOf(name)]))[0]!
        .status;
    expect(await status('Lola Lost')).toBe('pending');
    expect(await status('Nico Nothing')).toBe('pending');

    expect(await card.settleUnknownAttempts()).toBeGreaterThanOrEqual(2);
    expect(await status('Lola Lost')).toBe('succeeded');
    expect(await status('Nico Nothing')).toBe('failed');
    expect(await countRows('payments', 'invoice_id = $1', [invOf('Lola Lost')])).toBe(1);
    const [lola] = await sql<{ status: string; paid_cents: string }>(
      'SELECT status, paid_cents FROM invoices WHERE id = $1',
      [invOf('Lola Lost')],
    );
    expect(lola).toMatchObject({ status: 'paid', paid_cents: '2500' });
    expect(await countRows('payments', 'invoice_id = $1', [invOf('Nico Nothing')])).toBe(0);

    // Running it again changes nothing; the late webhook would find it recorded.
    await card.settleUnknownAttempts();
    expect(await countRows('payments', 'invoice_id = $1', [invOf('Lola Lost')])).toBe(1);
  });
});
