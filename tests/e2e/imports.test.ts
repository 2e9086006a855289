// In headless Chromium: an admin moves members in from a spreadsheet — chooses a CSV file, sees
// each row's fate, invites, and follows the e-mails on the result page; then previews an opening
// balances file with a bad row, and imports past batches (shown read-only, "Imported summary"). Every screen passes axe and fits 360 px and desktop widths.
import { describe, expect, it } from 'vitest';
import { baseUrl, makeCoop, makeUser, TEST_PASSWORD } from '../support/api';
import { holdScripts, shootBothWidths, signInUi, withBrowser } from '../support/browser';

describe('imports in the browser', () => {
  it('bulk invitations: file → preview with each row’s fate → invite → result with delivery; balances preview names a bad row', async () => {
    const coop = await makeCoop({ name: 'Thistledown Fuel Commons' });
    const admin = await makeUser({ coopId: coop.id, role: 'admin', name: 'Ottilie Brandvold' });
    const t = Date.now().toString(36);
    const csv = `Name;E-mail;Role\nFenna Aldous;fenna-${t}@example.org;brewer\nJory Quell;not-an-address;member\nMaud Ferris;maud-${t}@example.org;skipper\n`;

    await withBrowser(async (page) => {
      await signInUi(page, admin.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${coop.slug}/imports`);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Import from a spreadsheet');
      await shootBothWidths(page, 'imports');

      await page
        .locator('#invitations-file')
        .setInputFiles({ name: 'members.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
      await page.getByRole('button', { name: 'Preview' }).first().click();
      await page.getByText('Preview of members.csv').waitFor();
      await expect(page.getByText('Unknown role').count()).resolves.toBeGreaterThan(0);
      await expect(page.getByText('Bad e-mail').count()).resolves.toBeGreaterThan(0);
      await shootBothWidths(page, 'imports-invitations-preview');

      await Promise.all([
        page.waitForURL(/\/imports\/invitations\/\d+$/),
        page.getByRole('button', { name: 'Invite 1 person' }).click(),
      ]);
      await page.getByText('E-mails sent: 1 of 1').waitFor({ timeout: 30_000 });
      await shootBothWidths(page, 'imports-invitations-result');

      // The file is chosen before the page's scripts have run (as on a slow phone): the choice
      // still counts once the page comes alive.
      const release = await holdScripts(page);
      await page.goto(`${baseUrl()}/c/${coop.slug}/imports`, { waitUntil: 'commit' });
      await page.locator('#opening-balances-file').setInputFiles({
        name: 'balances.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from('E-mail,Balance,As of\nnobody@example.org,12.00,11/30/2026\n'),
      });
      await release();
      await page.getByRole('button', { name: 'Preview' }).nth(1).click();
      await page.getByText(/not a member of this co-op yet/).waitFor();
      await expect(page.getByRole('button', { name: 'Import 0 rows' }).isDisabled()).resolves.toBe(true);
      await shootBothWidths(page, 'imports-balances-preview');

      // Past batches: a bad row is named beside its field; a good file imports read-only batches.
      const head = 'Batch number,Date,Oil in (gallons),Fuel out (gallons),Cost per gallon,Quality,Notes\n';
      await page.locator('#past-batches-file').setInputFiles({
        name: 'history-bad.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from(`${head}7,03/14/2025,40,60,1.90,pass,\n`),
      });
      await page.getByRole('button', { name: 'Preview' }).nth(4).click();
      await page.getByText(/More fuel out than 1\.1 ×/).waitFor();
      await shootBothWidths(page, 'imports-past-batches-preview');
      await page.locator('#past-batches-file').setInputFiles({
        name: 'history.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from(`${head}7,03/14/2025,40,38,1.90,pass,Clear\n8,04/02/2025,40,36,,,\n`),
      });
      await page.getByRole('button', { name: 'Preview' }).nth(4).click();
      await page.getByRole('button', { name: 'Import 2 rows' }).click();
      await page.getByText('Imported 2 rows.').waitFor({ timeout: 30_000 });

      await page.goto(`${baseUrl()}/c/${coop.slug}/batches`);
      await expect(page.getByText('Imported summary').count()).resolves.toBeGreaterThan(0);
      await page.getByRole('link', { name: 'Batch 7', exact: true }).first().click();
      await page.getByRole('heading', { name: 'Batch 7' }).waitFor();
      await page.getByText(/imported from its records/).waitFor();
      await shootBothWidths(page, 'imports-past-batch-page');
    });
  }, 360_000);
});
