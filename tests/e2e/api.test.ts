// The API reference page and the API tokens screen in headless Chromium: they render under the
// app's Content-Security-Policy (withBrowser fails on any violation), pass axe, and the reference's
// script stays off other pages.
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, makeCoopWithRoles, TEST_PASSWORD } from '../support/api';
import { checkA11y, signInUi, SHOTS, withBrowser } from '../support/browser';

let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
beforeAll(async () => {
  ctx = await makeCoopWithRoles();
});

describe('API reference (/docs/api)', () => {
  it(
    'renders the operations from /api/openapi.json without a CDN, at 360 and 1280 px',
    { timeout: 180_000 },
    async () => {
      await withBrowser(async (page) => {
        const external: string[] = [];
        page.on('request', (r) => {
          if (!r.url().startsWith(baseUrl()) && !r.url().startsWith('data:') && !r.url().startsWith('blob:'))
            external.push(r.url());
        });
        for (const width of [360, 1280]) {
          await page.setViewportSize({ width, height: 900 });
          await page.goto(`${baseUrl()}/docs/api`);
          await page.getByText('/api/coops/{coop}/tanks', { exact: true }).first().waitFor({ timeout: 30_000 });
          await page.screenshot({ path: path.join(SHOTS, `api-docs-${width}.png`) });
        }
        await expect(page.getByRole('heading', { name: 'Tallyvat API', exact: true }).isVisible()).resolves.toBe(true);
        // The whole page, Swagger UI included (its colours are darkened in api-reference.css).
        await checkA11y(page);
        expect(external).toEqual([]);
      });
    },
  );

  it("keeps the reference's script off other pages", async () => {
    const landing = await (await fetch(`${baseUrl()}/`)).text();
    const docs = await (await fetch(`${baseUrl()}/docs/api`)).text();
    const scripts = (html: string) => new Set([...html.matchAll(/<script[^>]+src="([^"]+)"/g)].map((m) => m[1]));
    const extra = [...scripts(docs)].filter((s) => !scripts(landing).has(s));
    // The page's own chunk loads Swagger UI on demand; the landing page carries none of it.
    expect(extra.length).toBeGreaterThan(0);
    for (const src of scripts(landing)) {
      const js = await (await fetch(`${baseUrl()}${src}`)).text();
      expect(js.includes('swagger-ui'), `${src} carries Swagger UI`).toBe(false);
    }
  });
});

describe('API tokens screen', () => {
  it(
    'a treasurer creates a read-only token, sees it once, and revokes it; axe passes',
    { timeout: 180_000 },
    async () => {
      await withBrowser(async (page) => {
        const step = (s: string) => console.log(`[api tokens e2e] ${s}`);
        await signInUi(page, ctx.users.treasurer.email, TEST_PASSWORD);
        step('signed in');
        for (const width of [360, 1280]) {
          await page.setViewportSize({ width, height: 800 });
          await page.goto(`${baseUrl()}/c/${ctx.coop.slug}/api-tokens`);
          await page.getByRole('heading', { name: 'API tokens' }).waitFor();
          await checkA11y(page);
          step(`axe at ${width}`);
        }
        await page.getByRole('button', { name: 'Create token' }).click();
        await page.getByText('At least 1 character.').waitFor();
        await page.getByLabel('Name').fill('Pump meter logger');
        await page.getByRole('button', { name: 'Create token' }).click();
        const secret = await page.getByLabel('New access token').textContent();
        expect(secret).toMatch(/^tvt_/);
        step('created');
        await page.getByRole('list', { name: 'Access tokens' }).getByText('Pump meter logger').waitFor();
        await page.screenshot({ path: path.join(SHOTS, 'api-tokens-1280.png'), fullPage: true });
        await checkA11y(page);
        const res = await fetch(`${baseUrl()}/api/coops/${ctx.coop.slug}/tanks`, {
          headers: { authorization: `Bearer ${secret}` },
        });
        expect(res.status).toBe(200);
        page.once('dialog', (d) => d.accept());
        await page.getByRole('button', { name: 'Revoke Pump meter logger' }).click();
        await page.getByText('“Pump meter logger” is revoked.').waitFor();
        expect(
          (
            await fetch(`${baseUrl()}/api/coops/${ctx.coop.slug}/tanks`, {
              headers: { authorization: `Bearer ${secret}` },
            })
          ).status,
        ).toBe(401);
      });
    },
  );
});
