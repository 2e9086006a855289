// Every date on a co-op's pages is in the co-op's time zone and the one style (lib/dates), even
// when the browser is elsewhere: a Tokyo co-op viewed from a browser set to Los Angeles. The
// clock is seeded: a draw at 2026-03-01 20:30 UTC is "Mar 2, 2026, 05:30" in Tokyo (UTC+9, no
// DST; IANA tz database) and would read Mar 1 in the browser's zone or on a UTC server.
import type { Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { formatDate, formatMonthDay, formatTime, formatWhen } from '@/lib/dates';
import { baseUrl, makeCoopWithRoles, sql, TEST_PASSWORD } from '../support/api';
import { insertDraw } from '../support/billing';
import { signInUi, withBrowser } from '../support/browser';

const TZ = 'Asia/Tokyo';
const DRAWN_AT = '2026-03-01T20:30:00Z';
const MONTHS = 'Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec';

/** Checks every <time> on the page against lib/dates in the co-op's zone, and the page's text for other date styles. */
async function checkDates(page: Page, where: string) {
  const times = await page
    .locator('time[datetime]')
    .evaluateAll((els) => els.map((e) => ({ dt: e.getAttribute('datetime')!, text: (e.textContent ?? '').trim() })));
  for (const t of times) {
    const allowed = [formatWhen(t.dt, TZ), formatDate(t.dt, TZ), formatTime(t.dt, TZ), formatMonthDay(t.dt, TZ)];
    expect(allowed, `${where}: <time datetime="${t.dt}"> reads "${t.text}"`).toContain(t.text);
  }
  const text = await page.locator('main').innerText();
  expect(text.match(/\b20\d\d-\d\d-\d\d\b/g) ?? [], `${where}: ISO dates in the text`).toEqual([]);
  expect(text.match(new RegExp(`\\b\\d{1,2} (${MONTHS}) 20\\d\\d\\b`, 'g')) ?? [], `${where}: day-first dates`).toEqual(
    [],
  );
  expect(text.match(/\b\d{1,2}:\d{2}\s?(AM|PM|am|pm)\b/g) ?? [], `${where}: 12-hour times`).toEqual([]);
  return times.length;
}

describe('dates in the co-op’s zone and one style', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let slug: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    slug = ctx.coop.slug;
    await sql(`UPDATE coops SET timezone = $1 WHERE id = $2`, [TZ, ctx.coop.id]);
    await sql("UPDATE users SET name = 'Mika Sato' WHERE id = $1", [ctx.users.member.id]);
    const tank = (
      await ctx.agents.brewer.post(`/api/coops/${slug}/tanks`).send({ name: 'Shed tank', capacity: '400' }).expect(201)
    ).body;
    await ctx.agents.brewer
      .post(`/api/coops/${slug}/tanks/${tank.id}/dips`)
      .send({ measured: '100', reason: 'Opening balance', unitCost: '3.00' })
      .expect(201);
    await ctx.agents.treasurer.post(`/api/coops/${slug}/pricing`).send({ kind: 'fixed', price: '4.00' }).expect(201);
    const [m] = await sql<{ id: number }>(`SELECT id FROM memberships WHERE user_id = $1`, [ctx.users.member.id]);
    // Inserted as recorded then (the API takes draws under the price in force now): 5 gal at $4.00.
    await insertDraw({
      coopId: ctx.coop.id,
      tankId: tank.id,
      membershipId: m!.id,
      liters: '18.927',
      occurredAt: DRAWN_AT,
      use: 'off-road',
      unitPrice: 400,
      fuelCents: 2000,
    });
  });

  it('every page an admin sees, viewed from a Los Angeles browser', async () => {
    await withBrowser(
      async (page) => {
        await signInUi(page, ctx.users.admin.email, TEST_PASSWORD);
        await page.goto(`${baseUrl()}/c/${slug}/draws`);
        await page.getByRole('table', { name: 'Draws' }).getByText('Mar 2, 2026, 05:30').waitFor();
        let seen = await checkDates(page, 'draws');
        for (const p of [
          '',
          '/tank',
          '/me',
          '/audit',
          '/members',
          '/billing',
          '/batches',
          '/supplies',
          '/invoices',
          '/reports',
          '/settings',
        ]) {
          await page.goto(`${baseUrl()}/c/${slug}${p}`);
          await page.getByRole('heading', { level: 1 }).waitFor();
          seen += await checkDates(page, p || 'overview');
        }
        expect(seen, 'dates checked').toBeGreaterThan(5);
      },
      { timezoneId: 'America/Los_Angeles' },
    );
  });
});
