// In headless Chromium: a member reserves fuel on their own page, a brewer records the draw
// against that reservation, and the member then sees the draw with its amount. Every screen on
// the way is checked with axe-core and saved at phone and desktop widths.
import { beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, makeCoopWithRoles, sql, TEST_PASSWORD } from '../support/api';
import { checkA11y, shootBothWidths, signInUi, withBrowser } from '../support/browser';

describe('reserve → draw → see it', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let slug: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    slug = ctx.coop.slug;
    await sql("UPDATE users SET name = 'Rosa Quill' WHERE id = $1", [ctx.users.member.id]);
    const tank = (
      await ctx.agents.brewer.post(`/api/coops/${slug}/tanks`).send({ name: 'Yard tank', capacity: '500' }).expect(201)
    ).body;
    await ctx.agents.brewer
      .post(`/api/coops/${slug}/tanks/${tank.id}/dips`)
      .send({ measured: '120', reason: 'Opening balance', unitCost: '3.20' })
      .expect(201);
    await ctx.agents.treasurer
      .post(`/api/coops/${slug}/pricing`)
      .send({ kind: 'fixed', price: '4.50', roadTaxCents: '24.4' })
      .expect(201);
  });

  it('works end to end, accessibly, at 360 and 1280 px', { timeout: 240_000 }, async () => {
    // 1. The member reserves 10 gal, after being told clearly that 500 gal is more than there is.
    await withBrowser(async (page) => {
      await signInUi(page, ctx.users.member.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/me`);
      await expect(page.getByTestId('reserve-available').textContent()).resolves.toBe('120.0 gal');
      // The form checks with the route's own schema first: the reason shows beside the field and nothing is sent.
      const posts: string[] = [];
      page.on('request', (r) => {
        if (r.method() === 'POST' && r.url().includes('/reservations')) posts.push(r.url());
      });
      await page.getByLabel('Quantity (gallons)').fill('10.12345');
      await page.getByRole('button', { name: 'Reserve fuel' }).click();
      await page.locator('#res-quantity-error').getByText('Use at most 3 decimals.').waitFor();
      await expect(page.getByLabel('Quantity (gallons)').getAttribute('aria-invalid')).resolves.toBe('true');
      expect(posts).toEqual([]);
      await page.getByLabel('Quantity (gallons)').fill('500');
      await page.getByRole('button', { name: 'Reserve fuel' }).click();
      await page.getByText('At most 120.000 gal is available.').waitFor();
      await checkA11y(page);
      await page.getByLabel('Quantity (gallons)').fill('10');
      await page.getByRole('button', { name: 'Reserve fuel' }).click();
      await page.getByText(/^Reserved\./).waitFor();
      const row = page.getByRole('table', { name: 'Reservations' }).getByRole('row').filter({ hasText: '10.0 gal' });
      await row.getByText('open').waitFor();
      await expect(page.getByTestId('reserve-available').textContent()).resolves.toBe('110.0 gal');
      await shootBothWidths(page, 'tank-me-reserved');
    });

    // 2. A brewer records the draw against it from the meter readings.
    await withBrowser(async (page) => {
      await signInUi(page, ctx.users.brewer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/tank`);
      await page
        .getByRole('img', { name: /Yard tank: 120.0 gal on hand .* 10.0 gal reserved; 110.0 gal available/ })
        .waitFor();
      await shootBothWidths(page, 'tank-page-brewer');
      await page.goto(`${baseUrl()}/c/${slug}/draws`);
      const form = page.getByRole('form', { name: 'Record a draw' });
      await form.getByLabel('Member').selectOption({ label: 'Rosa Quill' });
      await form.getByLabel('Reservation').selectOption({ index: 1 });
      await form.getByLabel('Declared use').selectOption('road');
      await form.getByLabel('Meter before (gallons)').fill('2040.5');
      await form.getByLabel('Meter after (gallons)').fill('2049.5');
      await form.getByRole('button', { name: 'Record draw' }).click();
      // 9 gal at $4.50 = $40.50, road tax 24.4 ¢ × 9 = 219.6 → 220 ¢: $42.70
      await form.getByText(/Recorded draw #\d+: 9.00 gal for Rosa Quill, \$42.70/).waitFor();
      await page.getByRole('table', { name: 'Draws' }).getByText('$42.70').waitFor();
      await shootBothWidths(page, 'tank-draws-brewer');
    });

    // 3. The member sees the draw, and the reservation as drawn.
    await withBrowser(async (page) => {
      await signInUi(page, ctx.users.member.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/me`);
      const draws = page.getByRole('table', { name: 'My draws' });
      await draws.getByText('$42.70').waitFor();
      await draws.getByText('9.0 gal', { exact: true }).waitFor();
      await page
        .getByRole('table', { name: 'Reservations' })
        .getByText(/drawn \(#\d+\)/)
        .waitFor();
      await expect(page.getByTestId('reserve-available').textContent()).resolves.toBe('111.0 gal');
      await shootBothWidths(page, 'tank-me-drawn');
    });

    // 4. The treasurer sets a new price; it is in force for the next draw and the old one is history.
    await withBrowser(async (page) => {
      await signInUi(page, ctx.users.treasurer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/tank/pricing`);
      const form = page.getByRole('form', { name: 'Set the member price' });
      await form.getByLabel('How the price is set').selectOption('cost-plus-amount');
      await form.getByLabel('Amount added (USD per gal)').fill('0.405');
      await form.getByRole('button', { name: 'Save new price' }).click();
      await form.getByText('Use at most 2 decimals.').waitFor();
      await form.getByLabel('Amount added (USD per gal)').fill('0.40');
      await form.getByLabel('Road-fuel tax (cents per gal, optional)').fill('24.4');
      await form.getByRole('button', { name: 'Save new price' }).click();
      await page
        .getByText('Average cost + $0.40/gal · road tax 24.4¢/gal (road use only)', { exact: true })
        .first()
        .waitFor();
      const history = page.getByRole('table', { name: 'Pricing history' });
      await history.getByText('in force').waitFor();
      await history.getByText('past').waitFor();
      await shootBothWidths(page, 'tank-pricing-treasurer');
    });
  });
});
