// axe (WCAG 2.2 AA) on every page of the co-op navigation, for each demo role, at a phone's
// 360 px and a laptop's 1280 px, generated from the navigation's own page list: no serious or
// critical violation (checkA11y fails on any), and nothing scrolls sideways.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { NAV_ITEMS } from '@/components/shell/nav-items';
import { can } from '@/lib/auth/policies';
import type { Role } from '@/lib/auth/roles';
import { baseUrl, DEMO_PASSWORD } from '../support/api';
import { checkA11y, signInUi, SHOTS, withBrowser } from '../support/browser';

const PEOPLE: [Role, string][] = [
  ['member', 'dale.member'],
  ['brewer', 'juniper.brewer'],
  ['treasurer', 'tobias.treasurer'],
  ['admin', 'marisol.admin'],
];

describe('every page × role × width passes axe', () => {
  for (const [role, who] of PEOPLE) {
    it(`${role}: each page in the navigation at 360 and 1280 px`, async () => {
      const pages = NAV_ITEMS.filter((i) => can(role, i.action));
      await withBrowser(async (page) => {
        page.setDefaultTimeout(20_000);
        await signInUi(page, `${who}@example.org`, DEMO_PASSWORD);
        for (const width of [360, 1280]) {
          await page.setViewportSize({ width, height: width === 360 ? 740 : 800 });
          for (const item of pages) {
            await page.goto(`${baseUrl()}/c/prairie-lantern${item.href}`);
            await page.getByRole('heading', { level: 1 }).first().waitFor();
            const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
            expect(overflow, `${item.label} at ${width}px scrolls sideways`).toBeLessThanOrEqual(0);
            try {
              await checkA11y(page);
            } catch (e) {
              throw new Error(`${role} · ${item.label} · ${width}px: ${(e as Error).message}`);
            }
          }
          if (role === 'brewer') {
            // The long batch record: its step navigator stays pinned at the top while scrolling.
            await page.goto(`${baseUrl()}/c/prairie-lantern/batches`);
            await page
              .getByRole('link', { name: /^Batch \d+$/ })
              .first()
              .click();
            const steps = page.getByRole('navigation', { name: 'Batch steps' });
            await steps.waitFor();
            await page.mouse.wheel(0, 3000);
            await page.waitForTimeout(300);
            const box = await steps.boundingBox();
            expect(box && box.y >= -1 && box.y < 5, `batch steps pinned at ${width}px (y=${box?.y})`).toBe(true);
            await page.screenshot({ path: path.join(SHOTS, `batch-steps-${width}.png`) });
            await checkA11y(page);
          }
        }
      });
    }, 240_000);
  }
});
