// Pages on a phone and a laptop: for every page of the demo co-op's navigation × role (read from
// the navigation each role is shown, so it follows the page list), plus the pages outside a co-op,
// records in headless Chromium (the browser the e2e tests drive, tests/support/browser.ts):
//   - Largest Contentful Paint at 360×740 and 1280×800, on a cold cache (a fresh browser context);
//   - first-load JavaScript: the sum of the gzip sizes of the scripts the page loads before its
//     `load` event (gzip level 6, as a server would send them; code loaded later — a chart
//     scrolled into view — is not first-load).
// Figures are reported, not asserted. Targets: LCP < 1.0 s, first-load JS ≤ 200 kB compressed.
// Usage: `npm run bench -- pages` (BENCH_PAGES_ROLES=admin,member to limit the roles).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { chromium } from 'playwright-core';
import { startStack } from './lib.mjs';

const DEMO_PASSWORD = 'tallyvat-demo-2026';
const COOP = 'prairie-lantern';
const PEOPLE = {
  member: 'dale.member',
  brewer: 'juniper.brewer',
  treasurer: 'tobias.treasurer',
  admin: 'marisol.admin',
};
const WIDTHS = [
  { width: 360, height: 740 },
  { width: 1280, height: 800 },
];
const OUTSIDE = ['/coops', '/profile', '/docs/api'];
const LCP_TARGET_MS = 1000;
const JS_TARGET_KB = 200;
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

const roles = (process.env.BENCH_PAGES_ROLES ?? 'member,brewer,treasurer,admin').split(',').filter((r) => r in PEOPLE);
const stack = await startStack({ name: 'pages', seed: true });
const browser = await chromium.launch({
  executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  headless: true,
  args: ARGS,
});
const gzipCache = new Map();
const rows = [];

/** Signs in through the real form once; returns the session's storage state for fresh contexts. */
async function sessionOf(email) {
  const context = await browser.newContext();
  const page = await context.newPage();
  await page.goto(`${stack.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await Promise.all([
    page.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 60_000 }),
    page.getByRole('button', { name: 'Sign in' }).click(),
  ]);
  await page.goto(`${stack.baseUrl}/c/${COOP}`);
  const hrefs = await page.$$eval('nav[aria-label="Co-op"] a[href^="/c/"]', (as) => [
    ...new Set(as.map((a) => a.getAttribute('href'))),
  ]);
  const state = await context.storageState();
  await context.close();
  return { state, hrefs: hrefs.filter((h) => h.startsWith(`/c/${COOP}`)) };
}

/** One cold load of `url` at `viewport`: LCP (ms) and first-load JS (gzip bytes, raw bytes, files). */
async function measure(state, url, viewport) {
  const context = await browser.newContext({ viewport, storageState: state });
  const page = await context.newPage();
  const scripts = [];
  page.on('response', (r) => {
    if (r.request().resourceType() === 'script' && r.ok()) scripts.push(r);
  });
  await page.goto(url, { waitUntil: 'load', timeout: 60_000 });
  // Scripts fetched from here on (charts, form schemas: loaded once the page has loaded) are not first-load.
  const firstLoad = scripts.length;
  const lcp = await page.evaluate(
    () =>
      new Promise((done) => {
        let last = 0;
        new PerformanceObserver((list) => {
          for (const e of list.getEntries()) last = e.startTime;
        }).observe({ type: 'largest-contentful-paint', buffered: true });
        setTimeout(() => done(last), 500);
      }),
  );
  let gz = 0;
  let raw = 0;
  let laterGz = 0;
  for (const [i, r] of scripts.entries()) {
    const key = r.url();
    if (!gzipCache.has(key)) {
      const body = await r.body().catch(() => Buffer.alloc(0));
      gzipCache.set(key, { raw: body.length, gz: zlib.gzipSync(body, { level: 6 }).length });
    }
    if (i >= firstLoad) {
      laterGz += gzipCache.get(key).gz;
      continue;
    }
    raw += gzipCache.get(key).raw;
    gz += gzipCache.get(key).gz;
  }
  await context.close();
  return {
    lcpMs: Math.round(lcp),
    jsGzipKB: Math.round(gz / 1024),
    jsRawKB: Math.round(raw / 1024),
    files: firstLoad,
    laterGzipKB: Math.round(laterGz / 1024),
  };
}

try {
  for (const role of roles) {
    const { state, hrefs } = await sessionOf(`${PEOPLE[role]}@example.org`);
    for (const href of [...hrefs, ...(role === 'admin' ? OUTSIDE : [])]) {
      const row = { role, page: href.replace(`/c/${COOP}`, '') || '(overview)' };
      for (const vp of WIDTHS) {
        const m = await measure(state, `${stack.baseUrl}${href}`, vp);
        row[`lcp${vp.width}`] = m.lcpMs;
        row.jsGzipKB = m.jsGzipKB;
        row.jsRawKB = m.jsRawKB;
        row.files = m.files;
        row.laterGzipKB = Math.max(row.laterGzipKB ?? 0, m.laterGzipKB);
      }
      rows.push(row);
      const flag = (ms) => (ms < LCP_TARGET_MS ? '' : ' !');
      console.log(
        `${role.padEnd(9)} ${row.page.padEnd(14)} LCP 360 ${String(row.lcp360).padStart(5)} ms${flag(row.lcp360)}  LCP 1280 ${String(row.lcp1280).padStart(5)} ms${flag(row.lcp1280)}  first-load JS ${String(row.jsGzipKB).padStart(4)} kB gz (${row.jsRawKB} kB raw, ${row.files} files)${row.jsGzipKB > JS_TARGET_KB ? ' !' : ''}${row.laterGzipKB ? `, ${row.laterGzipKB} kB gz after load` : ''}`,
      );
    }
  }
  const worstJs = [...rows].sort((a, b) => b.jsGzipKB - a.jsGzipKB)[0];
  const over = rows.filter((r) => r.jsGzipKB > JS_TARGET_KB).length;
  const slow = rows.filter((r) => r.lcp360 >= LCP_TARGET_MS || r.lcp1280 >= LCP_TARGET_MS).length;
  console.log(
    `\n${rows.length} page × role rows; first-load JS over ${JS_TARGET_KB} kB: ${over} (worst ${worstJs?.page} ${worstJs?.jsGzipKB} kB); LCP ≥ ${LCP_TARGET_MS} ms at either width: ${slow}`,
  );
  console.log(
    `load average at the end: ${fs.readFileSync('/proc/loadavg', 'utf8').split(' ').slice(0, 3).join(' ')} (LCP is unreliable under load; JS size is not)`,
  );
  const out = path.resolve('bench', 'output');
  fs.mkdirSync(out, { recursive: true });
  fs.writeFileSync(path.join(out, 'pages.json'), JSON.stringify(rows, null, 2));
} finally {
  await browser.close();
  await stack.stop();
}
