import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { baseUrl } from '../support/api';
import { checkA11y, signInUi, SHOTS, withBrowser, live } from '../support/browser';

describe('a page outside the role, in headless Chromium', () => {
  it('a member opening Reports and Settings sees the forbidden page with the navigation, at 360 and 1280 px', async () => {
    await withBrowser(async (page) => {
      await signInUi(page, 'dale.member@example.org', 'tallyvat-demo-2026');
      for (const [width, where] of [
        [360, 'reports'],
        [1280, 'settings'],
      ] as const) {
        await page.setViewportSize({ width, height: 800 });
        await page.goto(`${baseUrl()}/c/prairie-lantern/${where}`);
        await page.getByRole('heading', { name: 'Not part of your role' }).waitFor();
        await expect(page.getByText('Something went wrong').count()).resolves.toBe(0);
        // On a phone the sections are behind the Menu button, which says where you are.
        if (width === 360)
          await (
            await live(page.getByRole('navigation', { name: 'Co-op' }).getByRole('button', { name: 'Menu' }))
          ).click();
        await expect(page.getByRole('link', { name: 'My fuel' }).count()).resolves.toBeGreaterThan(0);
        await page.screenshot({ path: path.join(SHOTS, `forbidden-${where}-${width}.png`), fullPage: true });
        await checkA11y(page);
      }
    });
  });
});
