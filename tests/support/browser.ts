// Headless Chromium (Debian's package) driven by playwright-core, with axe-core checks.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import { chromium, type Locator, type Page } from 'playwright-core';
import { expect } from 'vitest';
import { baseUrl } from './api';

export const SHOTS = path.resolve('tests', 'output', 'screenshots');
fs.mkdirSync(SHOTS, { recursive: true });

const ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-dev-shm-usage',
];

/** A Content-Security-Policy violation reported by a page. */
export interface CspViolation {
  url: string;
  directive: string;
  blocked: string;
  sample: string;
}

/**
 * Runs fn with a page in a fresh browser profile (optionally in another time zone), with the app's Content-Security-Policy in force:
 * every `securitypolicyviolation` on any page fails the test (a script the policy blocks is a
 * broken page, or an injection). Closes everything afterwards.
 */
export async function withBrowser(fn: (page: Page) => Promise<void>, opts: { timezoneId?: string } = {}) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tallyvat-chromium-'));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ARGS,
    viewport: { width: 1280, height: 800 },
    timezoneId: opts.timezoneId,
  });
  const violations: CspViolation[] = [];
  try {
    await context.exposeFunction('__tallyvatCspViolation', (v: CspViolation) => {
      violations.push(v);
      // Said at once as well, so a test that then times out still shows the cause.
      console.error('Content-Security-Policy violation:', v);
    });
    await context.addInitScript(() => {
      document.addEventListener(
        'securitypolicyviolation',
        (e) => {
          const report = (window as unknown as { __tallyvatCspViolation?: (v: unknown) => void })
            .__tallyvatCspViolation;
          report?.({ url: e.documentURI, directive: e.effectiveDirective, blocked: e.blockedURI, sample: e.sample });
        },
        true,
      );
    });
    const page = context.pages()[0] ?? (await context.newPage());
    await fn(page);
    expect(violations, 'Content-Security-Policy violations').toEqual([]);
  } finally {
    await context.close();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Holds back the page's scripts (as on a slow phone) until the returned release is awaited:
 * what the server's HTML does on its own can be tried before the page comes alive.
 */
export async function holdScripts(page: Page): Promise<() => Promise<void>> {
  let open!: () => void;
  const gate = new Promise<void>((r) => (open = r));
  await page.route('**/_next/static/chunks/**/*.js', async (route) => {
    await gate;
    // A request the page gave up on meanwhile (a prefetch) is already over.
    await route.continue().catch(() => undefined);
  });
  return async () => {
    open();
    await page.unrouteAll({ behavior: 'wait' });
  };
}

/**
 * The element once React has taken it over (its handlers attached). A press before that does
 * nothing, as on a slow phone, so a test presses a button that is not a form's submit (those wait,
 * disabled) only when it is live. React marks a hydrated element with a `__reactProps$…` key.
 */
export async function live(locator: Locator): Promise<Locator> {
  await expect
    .poll(() => locator.evaluate((el) => Object.keys(el).some((k) => k.startsWith('__reactProps$'))), {
      timeout: 30_000,
    })
    .toBe(true);
  return locator;
}

/** Signs in through the real form. */
export async function signInUi(page: Page, email: string, password: string) {
  await page.goto(`${baseUrl()}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await Promise.all([
    page.waitForURL((u) => !u.pathname.startsWith('/sign-in')),
    page.getByRole('button', { name: 'Sign in' }).click(),
  ]);
}

/** Fails on any WCAG 2.x A/AA violation axe-core finds on the page. */
export async function checkA11y(page: Page) {
  // Next.js streams a dynamic page's metadata after its content, so after a client-side navigation the
  // <title> can arrive a moment after the content the test waited for: judge the page once it has one.
  await page.waitForFunction(() => document.title.trim().length > 0);
  const result = await new AxeBuilder({ page })
    .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'])
    .analyze();
  const summary = result.violations.map(
    (v) =>
      `${v.id}: ${v.help} (${v.nodes
        .map((n) => n.target.join(' '))
        .slice(0, 3)
        .join(', ')})`,
  );
  expect(summary).toEqual([]);
}

/** Waits until the shell's Announcer says `text` (substring or pattern) and holds keyboard focus. */
export async function expectAnnounced(page: Page, text: string | RegExp) {
  const box = page.getByTestId('announcement');
  await box.filter({ hasText: text }).waitFor();
  await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'announcement', undefined, {
    timeout: 5_000,
  });
}

/**
 * The one screenshot helper: full-page screenshots at 360 and 1280 px (800 high) named
 * `<name>-<width>.png`; fails when a shot is blank or the page scrolls sideways at either width,
 * then runs axe (at 1280 px, where it leaves the page).
 */
export async function shootBothWidths(page: Page, name: string) {
  for (const width of [360, 1280]) {
    await page.setViewportSize({ width, height: 800 });
    // Let the layout settle at the new width (two frames, at most half a second) before measuring and shooting.
    await page.evaluate(
      () =>
        new Promise((done) => {
          requestAnimationFrame(() => requestAnimationFrame(() => done(null)));
          setTimeout(() => done(null), 500);
        }),
    );
    const file = path.join(SHOTS, `${name}-${width}.png`);
    await page.screenshot({ path: file, fullPage: true });
    expect(fs.statSync(file).size, `${name} at ${width}px looks blank`).toBeGreaterThan(5_000);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow, `${name} scrolls sideways at ${width}px`).toBeLessThanOrEqual(0);
  }
  await checkA11y(page);
}
