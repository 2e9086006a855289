// A brewer plans a batch and records it to release in headless Chromium, at phone and desktop
// widths, with axe-core checks on the planner and the batch page.
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { baseUrl, makeCoop, makeUser, sql, TEST_PASSWORD } from '../support/api';
import { checkA11y, shootBothWidths, signInUi, withBrowser } from '../support/browser';

const section = (page: Page, title: string) =>
  page.locator('section', { has: page.getByRole('heading', { name: title, exact: true }) });

describe('brewing in the browser', () => {
  it('a brewer plans a batch, records every step and releases it into the tank', { timeout: 240_000 }, async () => {
    const coop = await makeCoop({
      settings: { recipe: { catalyst: 'KOH', baseGramsPerLiter: 4.91, purityPct: 90, methanolPct: 20 } },
    });
    const brewer = await makeUser({ coopId: coop.id, role: 'brewer', name: 'Rowan Ashby' });
    const [tank] = await sql<{ id: number }>(
      `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Main tank', 2000) RETURNING id`,
      [coop.id],
    );
    await sql(
      `INSERT INTO chemical_lots (coop_id, kind, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents)
               VALUES ($1, 'methanol', 'Valley Chem Supply', '2026-10-01', 'L', 200, 200, 36000)`,
      [coop.id],
    );
    await sql(
      `INSERT INTO chemical_lots (coop_id, kind, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents, purity_pct)
               VALUES ($1, 'KOH', 'Lakeside Lab Goods', '2026-10-01', 'g', 5000, 5000, 4250, 90)`,
      [coop.id],
    );
    const [oil] = await sql<{ id: number }>(
      `INSERT INTO oil_lots (coop_id, collected_from, collected_on, volume_liters, titration_ml, titrant)
               VALUES ($1, 'Juniper Street Grill', '2026-10-20', 150, 3.5, 'KOH') RETURNING id`,
      [coop.id],
    );

    await withBrowser(async (page) => {
      await signInUi(page, brewer.email, TEST_PASSWORD);

      // Plan: 30 gal of oil, three titration trials → the figures appear beside the inputs.
      await page.goto(`${baseUrl()}/c/${coop.slug}/planner`);
      await page.getByLabel('Oil volume (gal)').fill('30');
      await page.getByLabel('Trial 1').fill('3.4');
      await page.getByLabel('Trial 2').fill('3.6');
      await page.getByLabel('Trial 3').fill('3.5');
      await page.getByLabel('Oil lot (optional)').selectOption(String(oil!.id));
      await expect(page.getByText('KOH to weigh').waitFor({ timeout: 15_000 })).resolves.toBeUndefined();
      // 30 gal = 113.562 L (NIST gallon); (4.91 ÷ 0.9 + 3.5) g/L × 113.562 L = 1017.0 g (purity rule, common practice)
      await expect(page.getByText('1.017 kg').first().waitFor({ timeout: 10_000 })).resolves.toBeUndefined();
      await shootBothWidths(page, 'brewing-planner');

      await Promise.all([
        page.waitForURL(/\/batches\/\d+$/),
        page.getByRole('button', { name: 'Create batch' }).click(),
      ]);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Batch 1');
      await checkA11y(page);

      const advance = async (to: string) => {
        await page.getByRole('button', { name: `Move to ${to}` }).click();
        await page.locator('[aria-current="step"]', { hasText: new RegExp(to, 'i') }).waitFor();
      };

      await advance('reacting');
      const reaction = section(page, '2. Reaction');
      await reaction.getByLabel('KOH weighed out (g)').fill('1017');
      await reaction.getByLabel('Methanol measured (gal)').fill('6');
      await reaction.getByLabel('Mixing time (minutes)').fill('60');
      await reaction.getByRole('button', { name: 'Save' }).click();
      await reaction.getByText('Saved.').waitFor();
      // A temperature warning shows while typing, before saving.
      await reaction.getByLabel('Reading (°F)').fill('142');
      await reaction.getByText(/above 140 °F/).waitFor();
      await reaction.getByLabel('Reading (°F)').fill('131');
      await reaction.getByText(/within the usual range/).waitFor();
      await reaction.getByRole('button', { name: 'Add reading' }).click();
      await reaction.getByText('In range').waitFor();

      await advance('settling');
      const settling = section(page, '3. Settling and draining');
      await settling.getByLabel('Settling time (hours)').fill('16');
      await settling.getByLabel('Glycerin drained (gal)').fill('1.6');
      await settling.getByRole('button', { name: 'Save' }).click();
      await settling.getByText('Saved.').waitFor();
      await advance('draining');
      await advance('washing');
      const washing = section(page, '4. Washing');
      await washing.getByLabel('Wash cycles').fill('3');
      await washing.getByRole('button', { name: 'Save' }).click();
      await washing.getByText('Saved.').waitFor();
      await advance('drying');
      await advance('testing');

      const testing = section(page, '6. Testing');
      await testing.getByLabel('3/27 methanol test').selectOption('clear');
      await testing.getByLabel('Shake (wash) test').selectOption('clean-split');
      await testing.getByLabel('Water (looking at the dried fuel)').selectOption('clear');
      await testing.getByLabel('Acid number (mg KOH/g)').fill('0.35');
      await testing.getByRole('button', { name: 'Save quality checks' }).click();
      await testing.getByText('Quality checks saved.').waitFor();

      // Release from the Next-step card: a dialog with the quality state, a reason (one screening result is not the standard met), can't be undone.
      await page.getByRole('button', { name: 'Release to a tank…' }).click();
      const dialog = page.getByRole('dialog', { name: /Release batch 1 to a tank/ });
      await dialog.getByText('Screened — 0 of 19 required properties tested, none failing', { exact: true }).waitFor();
      await dialog
        .getByText(/can’t be undone/)
        .first()
        .waitFor();
      await dialog.getByLabel('Volume released (gal)').fill('28');
      await dialog.getByRole('button', { name: 'Release — can’t be undone' }).click();
      await dialog.getByText(/Say why this batch is released anyway/).waitFor();
      await dialog.getByLabel('Why release it now?').fill('Off-road use only until the lab report arrives');
      await dialog.getByRole('button', { name: 'Release — can’t be undone' }).click();
      await page.getByText('Cost per gallon').waitFor({ timeout: 15_000 });
      await page.getByRole('link', { name: 'Download batch quality record (PDF)' }).waitFor();
      await shootBothWidths(page, 'brewing-batch-released');

      await page.goto(`${baseUrl()}/c/${coop.slug}/batches`);
      await page.getByRole('link', { name: 'Batch 1' }).waitFor();
      await shootBothWidths(page, 'brewing-list');
    });

    const [batch] = await sql<{
      status: string;
      released_liters: string;
      actual_catalyst_grams: string;
      total_cost_cents: string;
    }>(`SELECT status, released_liters, actual_catalyst_grams, total_cost_cents FROM batches WHERE coop_id = $1`, [
      coop.id,
    ]);
    expect(batch).toMatchObject({ status: 'released', released_liters: '105.992', actual_catalyst_grams: '1017.000' });
    const [t] = await sql<{ on_hand_liters: string; value_cents: string }>(
      `SELECT on_hand_liters, value_cents FROM tanks WHERE id = $1`,
      [tank!.id],
    );
    expect(t).toEqual({ on_hand_liters: '105.992', value_cents: batch!.total_cost_cents });
  });

  it('supplies pages work at phone and desktop widths and pass axe', { timeout: 240_000 }, async () => {
    await withBrowser(async (page) => {
      await signInUi(page, 'juniper.brewer@example.org', 'tallyvat-demo-2026');
      await page.goto(`${baseUrl()}/c/prairie-lantern/supplies`);
      await page.getByRole('heading', { name: 'Stock on hand' }).waitFor();
      await shootBothWidths(page, 'brewing-supplies');
      await page.goto(`${baseUrl()}/c/prairie-lantern/supplies/oil`);
      await page.getByRole('heading', { name: 'Oil lots', exact: true }).waitFor();
      await shootBothWidths(page, 'brewing-oil');
      await page.goto(`${baseUrl()}/c/prairie-lantern/batches`);
      await page
        .getByRole('link', { name: /Batch \d+/ })
        .first()
        .click();
      await page.getByRole('heading', { level: 1, name: /Batch \d+/ }).waitFor();
      await shootBothWidths(page, 'brewing-demo-batch');
    });
  });

  it('a member sees released batches only, with the quality summary', { timeout: 240_000 }, async () => {
    await withBrowser(async (page) => {
      await signInUi(page, 'dale.member@example.org', 'tallyvat-demo-2026');
      await page.goto(`${baseUrl()}/c/prairie-lantern/batches`);
      const statuses = await page.locator('tbody td:nth-child(3)').allTextContents();
      expect(statuses.length).toBeGreaterThan(0);
      expect(new Set(statuses)).toEqual(new Set(['Released']));
      await page
        .getByRole('link', { name: /Batch \d+/ })
        .first()
        .click();
      await page.getByRole('heading', { name: 'Quality' }).waitFor();
      await expect(page.getByText(/screening only/).count()).resolves.toBeGreaterThan(0);
      await expect(page.getByRole('button', { name: /Move to/ }).count()).resolves.toBe(0);
      await shootBothWidths(page, 'brewing-member-batch');
      // Pages check the role on the server too: the planner is not for members.
      await page.goto(`${baseUrl()}/c/prairie-lantern/planner`);
      await page.getByRole('heading', { name: 'Not part of your role' }).waitFor();
      await expect(page.getByLabel('Oil volume (gal)').count()).resolves.toBe(0);
    });
  });
});
