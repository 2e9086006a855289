// At 360×740, the size of a phone held at the tank: a member reserves and cancels, a brewer
// records and reverses a draw, a treasurer reconciles a payment. In every list the row's status,
// amount and action must be inside the screen without sideways scrolling; every consequential
// action is confirmed in a dialog and its result announced with keyboard focus on it; axe on each
// screen (dialogs open too).
import path from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, makeCoopWithRoles, sql, TEST_PASSWORD } from '../support/api';
import { dayIn, insertDraw, makeBillingCoop, monthsAgo, runMonth } from '../support/billing';
import { checkA11y, expectAnnounced, signInUi, SHOTS, withBrowser, live } from '../support/browser';

const PHONE = { width: 360, height: 740 };

/** Fails unless every locator is on screen horizontally and the page does not scroll sideways. */
async function expectOnScreen(page: Page, what: string, parts: Record<string, Locator>) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow, `${what}: the page scrolls sideways`).toBeLessThanOrEqual(0);
  for (const [name, loc] of Object.entries(parts)) {
    await loc.scrollIntoViewIfNeeded();
    const box = await loc.boundingBox();
    expect(box, `${what}: ${name} is not rendered`).not.toBeNull();
    expect(box!.x, `${what}: ${name} starts left of the screen`).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width, `${what}: ${name} ends right of the screen`).toBeLessThanOrEqual(PHONE.width);
    expect(box!.width, `${what}: ${name} has no width`).toBeGreaterThan(0);
  }
}

const shot = (page: Page, name: string) =>
  page.screenshot({ path: path.join(SHOTS, `phone-${name}.png`), fullPage: false });

describe('at 360×740', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let slug: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    slug = ctx.coop.slug;
    await sql("UPDATE users SET name = 'Ines Varga' WHERE id = $1", [ctx.users.member.id]);
    const tank = (
      await ctx.agents.brewer.post(`/api/coops/${slug}/tanks`).send({ name: 'Barn tank', capacity: '500' }).expect(201)
    ).body;
    await ctx.agents.brewer
      .post(`/api/coops/${slug}/tanks/${tank.id}/dips`)
      .send({ measured: '120', reason: 'Opening balance', unitCost: '3.20' })
      .expect(201);
    await ctx.agents.treasurer.post(`/api/coops/${slug}/pricing`).send({ kind: 'fixed', price: '4.50' }).expect(201);
  });

  it('a member reserves and cancels; the row keeps status, amount and Cancel on screen', async () => {
    await withBrowser(async (page) => {
      await page.setViewportSize(PHONE);
      await signInUi(page, ctx.users.member.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/me`);
      // The compact navigation says where you are and opens the sections.
      const nav = page.getByRole('navigation', { name: 'Co-op' });
      await expect(nav.getByTestId('current-section').textContent()).resolves.toBe('Section: My fuel');
      await (await live(nav.getByRole('button', { name: 'Menu' }))).click();
      await nav.getByRole('link', { name: 'Tank' }).waitFor();
      await checkA11y(page);
      await shot(page, 'nav-open');
      await nav.getByRole('button', { name: 'Close menu' }).click();

      await page.getByLabel('Quantity (gallons)').fill('12');
      await page.getByRole('button', { name: 'Reserve fuel' }).click();
      await expectAnnounced(page, /^Reserved\./);
      const row = page.getByRole('table', { name: 'Reservations' }).getByRole('row').filter({ hasText: '12.0 gal' });
      await row.getByText('open', { exact: true }).waitFor();
      await expectOnScreen(page, 'reservation row', {
        status: row.getByText('open', { exact: true }),
        amount: row.getByText('12.0 gal', { exact: true }),
        action: row.getByRole('button', { name: /^Cancel reservation/ }),
      });
      await shot(page, 'me-reserved');
      await checkA11y(page);

      await row.getByRole('button', { name: /^Cancel reservation/ }).click();
      const dialog = page.getByRole('dialog', { name: /^Cancel reservation \d+\?$/ });
      await dialog.getByText('The 12.0 gal held for you goes back to everyone.', { exact: false }).waitFor();
      await checkA11y(page);
      await shot(page, 'me-cancel-dialog');
      await dialog.getByRole('button', { name: 'Yes, cancel it' }).click();
      await expectAnnounced(page, /Cancelled reservation \d+: 12.0 gal is back for everyone/);
      await row.getByText('cancelled', { exact: true }).waitFor();
      await expectOnScreen(page, 'cancelled row', {
        status: row.getByText('cancelled', { exact: true }),
        amount: row.getByText('12.0 gal', { exact: true }),
      });
      await checkA11y(page);
    });
  }, 150_000);

  it('a brewer records a draw and reverses it; the row keeps status, amount and Reverse on screen', async () => {
    await withBrowser(async (page) => {
      await page.setViewportSize(PHONE);
      await signInUi(page, ctx.users.brewer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/draws`);
      const form = page.getByRole('form', { name: 'Record a draw' });
      await form.getByLabel('Member').selectOption({ label: 'Ines Varga' });
      await form.getByLabel('Meter before (gallons)').fill('100');
      await form.getByLabel('Meter after (gallons)').fill('108');
      await form.getByRole('button', { name: 'Record draw' }).click();
      // 8 gal at $4.50 = $36.00 (no tax or surcharge in this co-op's policy).
      const result = form.getByText(/Recorded draw #\d+: 8.00 gal for Ines Varga, \$36.00/);
      await result.waitFor();
      await expectOnScreen(page, 'draw result', { message: result });
      // After saving, the form is back to "choose a member" rather than a stale walk-up hint.
      await expect(form.getByLabel('Member').inputValue()).resolves.toBe('');
      await shot(page, 'draw-recorded');
      const row = page.getByRole('table', { name: 'Draws' }).getByRole('row').filter({ hasText: '$36.00' });
      await expectOnScreen(page, 'draw row', {
        status: row.getByText('recorded'),
        amount: row.getByText('$36.00', { exact: true }),
        action: row.getByRole('button', { name: /^Reverse draw/ }),
      });
      // The tank and member are behind the row's Details button.
      await row.getByRole('button', { name: 'Details' }).click();
      await row.getByText('Barn tank').waitFor();
      await checkA11y(page);
      await shot(page, 'draw-row-details');

      await row.getByRole('button', { name: /^Reverse draw/ }).click();
      const dialog = page.getByRole('dialog', { name: /^Reverse draw #\d+\?$/ });
      await dialog.getByRole('button', { name: 'Reverse draw' }).click();
      await dialog
        .getByText(/reason/i)
        .first()
        .waitFor();
      await dialog.getByLabel('Reason for reversing').fill('Meter misread');
      await checkA11y(page);
      await dialog.getByRole('button', { name: 'Reverse draw' }).click();
      await expectAnnounced(page, /Draw #\d+ is reversed/);
      await page
        .getByRole('table', { name: 'Draws' })
        .getByText(/reversed by #/)
        .waitFor();
      await checkA11y(page);
    });
  }, 150_000);

  it('a treasurer matches a cash payment; invoice status, amount and link stay on screen', async () => {
    const month = monthsAgo(1);
    const c = await makeBillingCoop({ members: ['Odile Park'] });
    const odile = c.members['Odile Park']!;
    await insertDraw({
      coopId: c.coop.id,
      tankId: c.tankId,
      membershipId: odile.membershipId,
      liters: '37.854',
      occurredAt: dayIn(month, 9),
      unitPrice: 400,
      fuelCents: 4000,
    });
    await runMonth(c.treasurerAgent, c.coop.slug, month);
    await c.treasurerAgent.post(`/api/coops/${c.coop.slug}/billing/periods/${month}/issue`).send({}).expect(200);
    const today = new Date().toISOString().slice(0, 10);
    await c.treasurerAgent
      .post(`/api/coops/${c.coop.slug}/billing/payments`)
      .send({
        memberId: odile.membershipId,
        method: 'cash',
        amount: '40.00',
        receivedOn: `${month}-28` < today ? `${month}-28` : today,
      })
      .expect(201);

    await withBrowser(async (page) => {
      page.setDefaultTimeout(20_000);
      await page.setViewportSize(PHONE);
      await signInUi(page, c.treasurer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${c.coop.slug}/billing/${month}`);
      const pay = page
        .getByRole('table', { name: 'Unmatched payments' })
        .getByRole('row')
        .filter({ hasText: 'Odile Park' });
      await expectOnScreen(page, 'payment row', {
        amount: pay.getByText('$40.00').first(),
        action: pay.getByRole('button', { name: 'Match' }),
      });
      await checkA11y(page);
      await shot(page, 'billing-unmatched');
      await pay.getByRole('button', { name: 'Match' }).click();
      await expectAnnounced(page, /Payment matched to INV-\d+/);
      await page.getByText('Every payment received this month is matched.').waitFor();
      const inv = page.getByRole('row', { name: /INV-\d+/ }).first();
      await inv.getByText('Paid', { exact: true }).waitFor();
      await expectOnScreen(page, 'invoice row', {
        status: inv.getByText('Paid', { exact: true }),
        amount: inv.getByText('$40.00').first(),
        action: inv.getByRole('link', { name: /INV-\d+/ }),
      });
      await checkA11y(page);
      await shot(page, 'billing-reconciled');
    });
  }, 150_000);

  it('an admin sorts the member cards with the Sort by control (the headers are hidden on a phone)', async () => {
    const names = { admin: 'Bea Ostrander', treasurer: 'Cyril Moss', brewer: 'Dana Quill' } as const;
    for (const [role, name] of Object.entries(names))
      await sql('UPDATE users SET name = $1 WHERE id = $2', [name, ctx.users[role as keyof typeof names].id]);
    await withBrowser(async (page) => {
      page.setDefaultTimeout(20_000);
      await page.setViewportSize(PHONE);
      await signInUi(page, ctx.users.admin.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${slug}/members`);
      const sortForm = page.getByRole('form', { name: 'Sort Members of the co-op' });
      await sortForm.getByLabel('Sort by').selectOption({ label: 'Name' });
      await sortForm.getByLabel('Order').selectOption('desc');
      await checkA11y(page);
      await shot(page, 'members-sort');
      await Promise.all([
        page.waitForURL(/sort=name&dir=desc/),
        sortForm.getByRole('button', { name: 'Sort' }).click(),
      ]);
      const table = page.getByRole('table', { name: 'Members of the co-op' });
      await expect
        .poll(
          async () => {
            const text = (await table.textContent()) ?? '';
            return ['Ines Varga', 'Dana Quill', 'Cyril Moss', 'Bea Ostrander'].map((n) => text.indexOf(n));
          },
          { timeout: 20_000 },
        )
        .toSatisfy((at: number[]) => at.every((x, i) => x >= 0 && (i === 0 || x > at[i - 1]!)));
      // The control shows the order in force after the reload.
      await expect(sortForm.getByLabel('Sort by').inputValue()).resolves.toBe('name');
      await expect(sortForm.getByLabel('Order').inputValue()).resolves.toBe('desc');
      await expectOnScreen(page, 'sort control', { control: sortForm.getByRole('button', { name: 'Sort' }) });
    });
  }, 150_000);
});
