// Nothing typed on a batch is lost, and release is a deliberate act — in headless Chromium.
import { describe, expect, it } from 'vitest';
import { baseUrl, makeCoop, makeUser, sql, TEST_PASSWORD } from '../support/api';
import { shootBothWidths, signInUi, withBrowser, live } from '../support/browser';

describe('the batch record in the browser', () => {
  it('typed step and quality values are saved when the batch moves on; release with incomplete verdicts asks a reason in a dialog', async () => {
    const coop = await makeCoop({
      settings: { recipe: { catalyst: 'KOH', baseGramsPerLiter: 4.91, purityPct: 90, methanolPct: 20 } },
    });
    const brewer = await makeUser({ coopId: coop.id, role: 'brewer', name: 'Wren Halloway' });
    // A small tote without room for the batch first, then the main tank: the dialog defaults to the tank with room.
    await sql(`INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Small tote', 20)`, [coop.id]);
    await sql(`INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Main tank', 2000)`, [coop.id]);
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

    await withBrowser(async (page) => {
      await signInUi(page, brewer.email, TEST_PASSWORD);
      const api = `${baseUrl()}/api/coops/${coop.slug}`;
      const headers = { origin: baseUrl() }; // same-origin check on writes
      const created = await page.request.post(`${api}/batches`, {
        headers,
        data: { oilVolume: 10, titrationTrials: [2], catalyst: 'KOH' },
      });
      expect(created.status()).toBe(201);
      const id = (await created.json()).id as number;
      expect(
        (await page.request.post(`${api}/batches/${id}/advance`, { headers, data: { to: 'washing' } })).status(),
      ).toBe(200);

      // Type in the washing step, don't press Save, move on: the values are saved first.
      await page.goto(`${baseUrl()}/c/${coop.slug}/batches/${id}`);
      const washing = page.locator('section', { has: page.getByRole('heading', { name: '4. Washing', exact: true }) });
      await washing.getByLabel('Wash cycles').fill('3');
      await washing.getByLabel('Wash water used (gal)').fill('12');
      await washing.getByText('Unsaved changes').waitFor();
      await page.getByRole('button', { name: 'Move to drying' }).click();
      await page.locator('[aria-current="step"]', { hasText: /drying/i }).waitFor({ timeout: 30_000 });
      await page.reload();
      await expect(washing.getByLabel('Wash cycles').inputValue()).resolves.toBe('3');
      await expect(washing.getByLabel('Wash water used (gal)').inputValue()).resolves.toBe('12');
      const [row] = await sql<{ wash_cycles: number }>(`SELECT wash_cycles FROM batches WHERE id = $1`, [id]);
      expect(row?.wash_cycles).toBe(3);

      // Type a quality result (a home measurement, no laboratory) without "Save quality checks", move on: it is saved first.
      const testing = page.locator('section', { has: page.getByRole('heading', { name: '6. Testing', exact: true }) });
      await testing.getByLabel('Acid number (mg KOH/g)').fill('0.3');
      await testing.getByText('Unsaved changes').waitFor();
      await page.getByRole('button', { name: 'Move to testing' }).click();
      await page.locator('[aria-current="step"]', { hasText: /testing/i }).waitFor({ timeout: 30_000 });
      await page.reload();
      await expect(testing.getByLabel('Acid number (mg KOH/g)').inputValue()).resolves.toBe('0.3');
      const [lab] = await sql<{ lab_results: Record<string, unknown> }>(
        `SELECT lab_results FROM batches WHERE id = $1`,
        [id],
      );
      expect(Number(lab?.lab_results.acidNumber)).toBe(0.3);

      // Testing: the Next-step card offers Release and Reject.
      await page.getByRole('button', { name: 'Reject batch…' }).waitFor();
      await shootBothWidths(page, 'batch-record-testing');
      await page.getByRole('button', { name: 'Release to a tank…' }).click();
      const dialog = page.getByRole('dialog', { name: /Release batch 1 to a tank/ });
      // No lab results: ASTM D6751 (co-op default) not met — shown, and a reason is required.
      await dialog.getByText('Screened — 0 of 19 required properties tested, none failing', { exact: true }).waitFor();
      await expect(dialog.getByLabel('Into tank').locator('option:checked').textContent()).resolves.toMatch(
        /^Main tank/,
      );
      await dialog
        .getByText(/can’t be undone/)
        .first()
        .waitFor();
      await shootBothWidths(page, 'batch-record-release-dialog');
      await dialog.getByLabel('Volume released (gal)').fill('9');
      await dialog.getByRole('button', { name: 'Release — can’t be undone' }).click();
      await dialog.getByText(/Say why this batch is released anyway/).waitFor();
      expect((await sql<{ status: string }>(`SELECT status FROM batches WHERE id = $1`, [id]))[0]?.status).toBe(
        'testing',
      );
      await dialog.getByLabel('Why release it now?').fill('For the co-op tractor only until the lab report is back');
      await dialog.getByRole('button', { name: 'Release — can’t be undone' }).click();
      await page.getByRole('link', { name: 'Download batch quality record (PDF)' }).waitFor({ timeout: 30_000 });
      const [done] = await sql<{ status: string; notes: string }>(`SELECT status, notes FROM batches WHERE id = $1`, [
        id,
      ]);
      expect(done?.status).toBe('released');
      expect(done?.notes).toContain('For the co-op tractor only until the lab report is back');

      // The planner, at both widths, with figures showing.
      await page.goto(`${baseUrl()}/c/${coop.slug}/planner`);
      await page.getByLabel('Oil volume (gal)').fill('30');
      await page.getByLabel('Trial 1').fill('3.4');
      await page.getByText('KOH to weigh').waitFor({ timeout: 30_000 });
      await shootBothWidths(page, 'batch-record-planner');
    });
  }, 420_000);

  it('a Danger reading raises a banner on the batch and the overview until a brewer acknowledges it, and the acknowledgement is audited', async () => {
    const coop = await makeCoop({
      settings: { recipe: { catalyst: 'KOH', baseGramsPerLiter: 4.91, purityPct: 90, methanolPct: 20 } },
    });
    const brewer = await makeUser({ coopId: coop.id, role: 'brewer', name: 'Ivo Marchetti' });
    await withBrowser(async (page) => {
      await signInUi(page, brewer.email, TEST_PASSWORD);
      const api = `${baseUrl()}/api/coops/${coop.slug}`;
      const headers = { origin: baseUrl() };
      const created = await page.request.post(`${api}/batches`, {
        headers,
        data: { oilVolume: 10, titrationTrials: [2], catalyst: 'KOH' },
      });
      const id = (await created.json()).id as number;
      expect(
        (await page.request.post(`${api}/batches/${id}/advance`, { headers, data: { to: 'reacting' } })).status(),
      ).toBe(200);
      // 150 °F = 65.56 °C, at or above methanol's 64.7 °C boiling point at sea level (CRC Handbook; °F→°C NIST SP 811).
      const reading = await page.request.post(`${api}/batches/${id}/temperatures`, { headers, data: { temp: 150 } });
      expect(reading.status()).toBe(201);
      expect((await reading.json()).level).toBe('danger');

      const banner = page.getByRole('alert').filter({ hasText: 'Danger:' });
      await page.goto(`${baseUrl()}/c/${coop.slug}`);
      await banner.filter({ hasText: 'Batch 1' }).waitFor();
      await page.goto(`${baseUrl()}/c/${coop.slug}/batches/${id}`);
      await banner.waitFor();
      await (await live(banner.getByRole('button', { name: 'Acknowledge' }))).click();
      await banner.waitFor({ state: 'detached', timeout: 30_000 });
      await page.reload();
      await page.getByRole('heading', { level: 1, name: 'Batch 1' }).waitFor();
      await expect(banner.count()).resolves.toBe(0);
      await page.goto(`${baseUrl()}/c/${coop.slug}`);
      await page.getByRole('heading', { name: 'Brewing' }).waitFor();
      await expect(banner.count()).resolves.toBe(0);

      const events = await sql<{ actor_user_id: number; after: { maxTempC: number } }>(
        `SELECT actor_user_id, after FROM audit_events WHERE coop_id = $1 AND action = 'batch.danger-acknowledged' AND entity_type = 'batch' AND entity_id = $2`,
        [coop.id, String(id)],
      );
      expect(events).toHaveLength(1);
      expect(events[0]).toMatchObject({ actor_user_id: brewer.id, after: { maxTempC: 65.56 } });
    });
  }, 240_000);
});
