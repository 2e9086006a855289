import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { baseUrl, DEMO_PASSWORD } from '../support/api';
import { checkA11y, signInUi, SHOTS, withBrowser } from '../support/browser';

// Each demo role's first screen: the section only that role (and admins) sees, the charts it
// gets, axe at phone and desktop widths, and a screenshot of each.
const ROLES = [
  {
    who: 'marisol.admin',
    role: 'admin',
    headings: ['Brewing', 'Billing this month', 'Invitations'],
    charts: ['Cost per gallon, last finished batches', 'Members with the largest unpaid balances'],
  },
  {
    who: 'tobias.treasurer',
    role: 'treasurer',
    headings: ['Billing this month'],
    charts: ['Cost per gallon, last finished batches', 'Members with the largest unpaid balances'],
  },
  { who: 'juniper.brewer', role: 'brewer', headings: ['Brewing'], charts: ['Cost per gallon, last finished batches'] },
  { who: 'dale.member', role: 'member', headings: ['My account', 'My reservations'], charts: [] },
] as const;

describe('overview per role in headless Chromium', () => {
  for (const r of ROLES) {
    it(`${r.role}: sees their section and charts, passes axe at 360 and 1280 px`, async () => {
      await withBrowser(async (page) => {
        await signInUi(page, `${r.who}@example.org`, DEMO_PASSWORD);
        for (const width of [360, 1280]) {
          await page.setViewportSize({ width, height: 900 });
          await page.goto(`${baseUrl()}/c/prairie-lantern`);
          await page.getByRole('heading', { level: 1 }).waitFor();
          for (const h of r.headings) await page.getByRole('heading', { name: h, exact: true }).waitFor();
          for (const c of [...r.charts, 'Fuel made and drawn per month'])
            await page.getByRole('heading', { name: c, exact: true }).waitFor();
          if (r.role === 'member')
            expect(await page.getByRole('heading', { name: 'Brewing', exact: true }).count()).toBe(0);
          if (r.role === 'brewer')
            expect(await page.getByRole('heading', { name: 'Billing this month', exact: true }).count()).toBe(0);
          const file = path.join(SHOTS, `overview-${r.role}-${width}.png`);
          await page.screenshot({ path: file, fullPage: true });
          expect(fs.statSync(file).size).toBeGreaterThan(5_000);
          const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
          expect(overflow).toBeLessThanOrEqual(0);
          await checkA11y(page);
        }
      });
    });
  }
});
