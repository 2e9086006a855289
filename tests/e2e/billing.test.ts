// The whole month in headless Chromium: the treasurer prepares and issues the month, a member
// pays by card, the treasurer sees it reconciled and closes the month. Screenshots at phone
// and desktop widths; axe checks on every screen.
import { describe, expect, it } from 'vitest';
import { baseUrl, sql, TEST_PASSWORD } from '../support/api';
import { dayIn, insertDraw, makeBillingCoop, monthsAgo } from '../support/billing';
import { checkA11y, expectAnnounced, shootBothWidths, signInUi, withBrowser, live } from '../support/browser';

describe('billing a month in the browser', () => {
  it('treasurer issues the month, a member pays by card, the treasurer sees it reconciled and closes the month', async () => {
    const month = monthsAgo(1);
    const c = await makeBillingCoop({ dues: 1500, members: ['Nell Norris'] });
    const slug = c.coop.slug;
    const nell = c.members['Nell Norris']!;
    // Nell drew 12 gal (45.425 L) for the road: fuel 389 × 12 = 4668, surcharge 10 × 12 = 120, tax 24.4 × 12 = 292.8 → 293.
    await insertDraw({
      coopId: c.coop.id,
      tankId: c.tankId,
      membershipId: nell.membershipId,
      liters: '45.425',
      occurredAt: dayIn(month, 11),
      unitPrice: 389,
      surchargeRate: 10,
      taxRate: 24.4,
      fuelCents: 4668,
      surchargeCents: 120,
      taxCents: 293,
    });
    // Nell's invoice: 4668 + 1500 dues + 120 + 293 = 6581 → $65.81.

    await withBrowser(async (page) => {
      page.setDefaultTimeout(20_000);
      await signInUi(page, c.treasurer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/billing`);
      await page.getByRole('heading', { level: 1, name: 'Billing' }).waitFor();
      await shootBothWidths(page, 'billing-overview');
      await page.getByLabel('Month to invoice').fill(month);
      await page.getByRole('button', { name: 'Prepare draft invoices' }).click();
      await page.waitForURL(new RegExp(`/billing/${month}$`));
      const issue = page.getByRole('button', { name: 'Issue 2 invoices and e-mail them' });
      await issue.waitFor({ timeout: 30_000 });
      await page.getByRole('cell', { name: '$65.81' }).first().waitFor();
      await shootBothWidths(page, 'billing-drafts');
      await issue.click();
      await page.getByText(/Issued 2 invoice\(s\), INV-000001 to INV-000002/).waitFor();
      await page.getByRole('link', { name: 'INV-000001' }).waitFor();
      await shootBothWidths(page, 'billing-issued');
    });

    await withBrowser(async (page) => {
      page.setDefaultTimeout(20_000);
      await signInUi(page, nell.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/invoices`);
      await page.getByText('$65.81').first().waitFor();
      await shootBothWidths(page, 'billing-member-invoices');
      await page.getByRole('link', { name: 'INV-000001' }).click();
      await page.waitForURL(/\/invoices\/\d+$/);
      await page.getByText(/test cards only/i).waitFor();
      await shootBothWidths(page, 'billing-member-pay');
      await page.getByLabel('Card').selectOption('test-approved');
      await page.getByRole('button', { name: 'Pay $65.81 by card' }).click();
      await page.getByText('This invoice is paid in full. Thank you!').waitFor({ timeout: 20_000 });
      await shootBothWidths(page, 'billing-member-paid');
    });
    const [paid] = await sql<{ status: string; paid_cents: string }>(
      `SELECT status, paid_cents FROM invoices WHERE coop_id = $1 AND number = 1`,
      [c.coop.id],
    );
    expect(paid).toEqual({ status: 'paid', paid_cents: '6581' });

    await withBrowser(async (page) => {
      page.setDefaultTimeout(20_000);
      await signInUi(page, c.treasurer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/billing/${month}`);
      const nellRow = page.getByRole('row', { name: /INV-000001/ });
      await nellRow.getByText('Paid', { exact: true }).waitFor();
      await page
        .getByText('✓ Paid on these invoices = payments applied to them: $65.81 = $65.81', { exact: false })
        .waitFor();
      await page.getByText('Every payment received this month is matched.').waitFor();
      await shootBothWidths(page, 'billing-reconciled');
      // Closing is confirmed in a dialog that says what it locks; the result is announced and focused.
      const monthName = new Intl.DateTimeFormat('en-US', { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(
        new Date(`${month}-15T00:00:00Z`),
      );
      await (await live(page.getByRole('button', { name: `Close ${monthName}…` }))).click();
      const dialog = page.getByRole('dialog', { name: `Close ${monthName}?` });
      await dialog.getByText(/locks .* draws, invoices and payments for good/).waitFor();
      await checkA11y(page);
      await dialog.getByRole('button', { name: `Close and lock ${monthName}` }).click();
      await page.getByText('This month is closed').first().waitFor();
      await expectAnnounced(page, `${monthName} is closed`);
      await page.getByText('Closed', { exact: true }).first().waitFor();
      await shootBothWidths(page, 'billing-closed');
    });
    const [period] = await sql<{ status: string }>(`SELECT status FROM billing_periods WHERE coop_id = $1`, [
      c.coop.id,
    ]);
    expect(period!.status).toBe('closed');
  }, 240_000);
});
