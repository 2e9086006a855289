import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { baseUrl } from '../support/api';
import { withBrowser, checkA11y, holdScripts, signInUi, SHOTS, live } from '../support/browser';

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

describe('app shell in headless Chromium', () => {
  it('an admin signs in, sees the co-op overview and the audit log; both pass axe at 360 and 1280 px', async () => {
    await withBrowser(async (page) => {
      await signInUi(page, 'marisol.admin@example.org', 'tallyvat-demo-2026');
      expect(new URL(page.url()).pathname).toBe('/coops');
      await page.getByRole('link', { name: 'Prairie Lantern Fuel Co-op' }).click();
      await page.waitForURL('**/c/prairie-lantern');
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Prairie Lantern Fuel Co-op');
      for (const width of [360, 1280]) {
        await page.setViewportSize({ width, height: 800 });
        await page.goto(`${baseUrl()}/c/prairie-lantern/audit`);
        await page.getByRole('heading', { name: 'Audit log' }).waitFor();
        await page.screenshot({ path: path.join(SHOTS, `audit-${width}.png`), fullPage: true });
        await checkA11y(page);
      }
      await page.goto(`${baseUrl()}/c/prairie-lantern`);
      await page.screenshot({ path: path.join(SHOTS, 'overview-admin-1280.png'), fullPage: true });
      await checkA11y(page);
      // Sign out: back on the landing page, and the co-op's pages ask to sign in again.
      await (await live(page.getByRole('button', { name: 'Sign out' }))).click();
      await page.waitForURL(`${baseUrl()}/`);
      expect((await page.context().cookies()).some((c) => c.name.includes('session-token'))).toBe(false);
      await page.goto(`${baseUrl()}/c/prairie-lantern`);
      await page.waitForURL('**/sign-in**');
    });
  }, 150_000);
});

describe('forms before the page comes alive', () => {
  it('sign-in cannot be sent before its script runs (no password in the address); once it runs, it signs in', async () => {
    await withBrowser(async (page) => {
      const release = await holdScripts(page);
      await page.goto(`${baseUrl()}/sign-in`, { waitUntil: 'commit' });
      await page.getByLabel('E-mail').fill('marisol.admin@example.org');
      await page.getByLabel('Password').fill('tallyvat-demo-2026');
      const submit = page.getByRole('button', { name: 'Sign in' });
      await expect(submit.isDisabled()).resolves.toBe(true);
      // Not greyed out meanwhile: it keeps the colour it has once live (no flash on every load),
      // read once the page's stylesheets (not held back) have arrived.
      await page.waitForFunction(() =>
        [...document.querySelectorAll<HTMLLinkElement>('link[rel="stylesheet"]')].every((l) => l.sheet),
      );
      const colour = () => submit.evaluate((el) => getComputedStyle(el).backgroundColor);
      const waitingColour = await colour();
      await page.getByLabel('Password').press('Enter');
      await release();
      await expect.poll(() => submit.isEnabled()).toBe(true);
      expect(page.url()).toBe(`${baseUrl()}/sign-in`);
      await expect(colour()).resolves.toBe(waitingColour);
      await Promise.all([page.waitForURL('**/coops'), submit.click()]);
    });
  }, 60_000);
});
