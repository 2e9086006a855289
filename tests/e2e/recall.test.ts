import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, makeCoopWithRoles, sql, TEST_PASSWORD } from '../support/api';
import { insertBatch } from '../support/batches';
import { checkA11y, signInUi, SHOTS, withBrowser } from '../support/browser';

// A lab result fails after release: the brewer records it on the batch page and sees the batch
// under review with the member who drew it; that member sees the notice on their overview.
describe('recall in headless Chromium', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let batchId: number;

  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    await sql(`UPDATE coops SET units = 'metric' WHERE id = $1`, [ctx.coop.id]);
    const P = `/api/coops/${ctx.coop.slug}`;
    const tankId = (await ctx.agents.brewer.post(`${P}/tanks`).send({ name: 'Barn tank', capacity: '500' }).expect(201))
      .body.id;
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
        quantity: 20,
        unit: 'L',
        totalCost: '30.00',
      })
      .expect(201);
    await ctx.agents.brewer
      .post(`${P}/supplies/chemicals`)
      .send({
        kind: 'KOH',
        supplier: 'Lakeside Lab Goods',
        receivedOn: '2026-10-01',
        quantity: 1,
        unit: 'kg',
        totalCost: '9.00',
        purityPct: 90,
      })
      .expect(201);
    batchId = await insertBatch(ctx.coop.id, { number: 1, status: 'testing', methanolLiters: 2, catalystGrams: 50 });
    await ctx.agents.brewer
      .post(`${P}/batches/${batchId}/release`)
      .send({ tankId, volume: '120', reason: 'Lab results to follow' })
      .expect(200);
    await ctx.agents.brewer
      .post(`${P}/draws`)
      .send({ membershipId: ctx.users.member.membershipId, tankId, quantity: '25', declaredUse: 'road' })
      .expect(201);
  });

  it('the brewer records a failing lab result and sees the affected draws; the member sees the notice', async () => {
    await withBrowser(async (page) => {
      page.setDefaultTimeout(45_000);
      await signInUi(page, ctx.users.brewer.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${ctx.coop.slug}/batches/${batchId}`);
      await page.getByText('Record a late laboratory result').click();
      await page.getByLabel('Property', { exact: true }).selectOption('acidNumber');
      await page.getByLabel('Value', { exact: true }).fill('0.9');
      await page.getByLabel('Laboratory', { exact: true }).fill('Riverbend Fuel Lab');
      await page.getByLabel('Test method', { exact: true }).fill('ASTM D664');
      await page.getByLabel('Date tested', { exact: true }).fill('2026-11-30');
      await page.getByRole('button', { name: 'Record lab result' }).click();
      await page.getByText('Batch 1 is under review').waitFor({ timeout: 30_000 });
      await page.getByText('Affected draws (1)').click();
      // One member drew it: the header row and one member row; the draw is listed with its share.
      expect(
        await page
          .getByRole('table', { name: /Members who drew fuel from batch 1/ })
          .getByRole('row')
          .count(),
      ).toBe(2);
      await page.getByText(/25(\.0+)? L of this batch/).waitFor();
      await page.screenshot({ path: path.join(SHOTS, 'recall-batch-brewer.png'), fullPage: true });
      await checkA11y(page);
    });
    await withBrowser(async (page) => {
      page.setDefaultTimeout(45_000);
      await signInUi(page, ctx.users.member.email, TEST_PASSWORD);
      for (const width of [360, 1280]) {
        await page.setViewportSize({ width, height: 900 });
        await page.goto(`${baseUrl()}/c/${ctx.coop.slug}`);
        await page.getByText('Fuel you drew from batch 1 is under review').waitFor();
        expect(await page.getByText(/Stop using this fuel in road vehicles/).count()).toBeGreaterThan(0);
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
        expect(overflow).toBeLessThanOrEqual(0);
        await checkA11y(page);
      }
      await page.screenshot({ path: path.join(SHOTS, 'recall-member-overview.png'), fullPage: true });
    });
  }, 300_000); // two browsers and axe on a long page: minutes on a loaded 2-core machine
});
