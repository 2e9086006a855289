import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { baseUrl } from '../support/api';
import { withBrowser, checkA11y, SHOTS } from '../support/browser';

describe('landing page in headless Chromium', () => {
  it('says what Tallyvat is, passes axe, and is saved as a screenshot at phone and desktop widths', async () => {
    await withBrowser(async (page) => {
      for (const width of [360, 1280]) {
        await page.setViewportSize({ width, height: 800 });
        await page.goto(`${baseUrl()}/`);
        await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toMatch(/biodiesel co-op/i);
        const file = path.join(SHOTS, `landing-${width}.png`);
        await page.screenshot({ path: file, fullPage: true });
        expect(fs.statSync(file).size).toBeGreaterThan(5_000);
        // No horizontal scrolling at phone width.
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
        expect(overflow).toBeLessThanOrEqual(0);
      }
      await checkA11y(page);
    });
  });
});
