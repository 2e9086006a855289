// In headless Chromium: an admin invites a brewer from the members screen; the invitee opens the
// e-mailed link in a fresh browser, creates an account and lands in the co-op as a brewer.
// Every screen passes axe and is saved at phone and desktop widths.
import { describe, expect, it } from 'vitest';
import { baseUrl, makeCoop, makeUser, TEST_PASSWORD, waitForMail } from '../support/api';
import { checkA11y, shootBothWidths, signInUi, withBrowser } from '../support/browser';

describe('invitation in the browser', () => {
  it('admin invites → e-mail → invitee creates an account → lands in the co-op as a brewer', async () => {
    const coop = await makeCoop({ name: 'Larkspur Commons Fuel' });
    const admin = await makeUser({ coopId: coop.id, role: 'admin', name: 'Henrietta Vashti' });
    await makeUser({ coopId: coop.id, role: 'member', name: 'Caspian Oduya' });
    const email = `larkspur-${Date.now().toString(36)}@example.org`;

    await withBrowser(async (page) => {
      await signInUi(page, admin.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/c/${coop.slug}/members`);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Members');
      await expect(page.getByRole('cell', { name: 'Caspian Oduya', exact: true }).count()).resolves.toBe(1);
      await shootBothWidths(page, 'members');

      const form = page.locator('form', { has: page.getByRole('button', { name: 'Send invitation' }) });
      await form.getByLabel('E-mail address').fill(email);
      await form.getByLabel('Role').selectOption('brewer');
      await form.getByRole('button', { name: 'Send invitation' }).click();
      await page.getByText(`Invitation to ${email} saved`).waitFor();
      await page.getByText(email, { exact: true }).waitFor();
      await shootBothWidths(page, 'members-invited');
    });

    const mail = await waitForMail(email);
    const link = mail.text.match(/https?:\/\/\S+\/invite\/[A-Za-z0-9_-]{43}/)![0];

    await withBrowser(async (page) => {
      await page.goto(link);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Join Larkspur Commons Fuel');
      await expect(page.getByText('as a brewer', { exact: false }).first().isVisible()).resolves.toBe(true);
      await shootBothWidths(page, 'invite-accept');

      await page.getByLabel('Your name').fill('Tamsin Greaves');
      await page.getByLabel('Choose a password').fill('maple-cistern-harbor-19');
      await page.getByLabel('Password again').fill('maple-cistern-harbor-19');
      await Promise.all([
        page.waitForURL((u) => u.pathname === `/c/${coop.slug}`),
        page.getByRole('button', { name: 'Create account and join' }).click(),
      ]);
      await page.setViewportSize({ width: 1280, height: 800 });
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Larkspur Commons Fuel');
      await expect(page.getByRole('banner').getByText('brewer', { exact: true }).isVisible()).resolves.toBe(true);
      await expect(
        page.getByRole('navigation', { name: 'Co-op' }).getByRole('link', { name: 'Members' }).count(),
      ).resolves.toBe(0);
      await shootBothWidths(page, 'invite-landed');

      // The same link again: a clear message, not an error.
      await page.goto(link);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(
        'This invitation was already used',
      );
      await shootBothWidths(page, 'invite-used');
    });
  }, 150_000);

  it('profile, password reset and a bad invitation link are readable and accessible', async () => {
    const coop = await makeCoop({ name: 'Thistledown Biofuel Club' });
    const u = await makeUser({ coopId: coop.id, role: 'treasurer', name: 'Ambrose Kettering' });
    await withBrowser(async (page) => {
      await page.goto(`${baseUrl()}/invite/not-a-real-link`);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(
        'This invitation link does not work',
      );
      await shootBothWidths(page, 'invite-invalid');

      await page.goto(`${baseUrl()}/reset-password`);
      await shootBothWidths(page, 'reset-request');
      await page.getByLabel('E-mail').fill(u.email);
      await page.getByRole('button', { name: 'Send the link' }).click();
      await page.getByText('Check your e-mail').waitFor();
      const token = (await waitForMail(u.email)).text.match(/\/reset-password\/([A-Za-z0-9_-]{43})/)![1];
      await page.goto(`${baseUrl()}/reset-password/${token}`);
      await shootBothWidths(page, 'reset-password');

      await signInUi(page, u.email, TEST_PASSWORD);
      await page.goto(`${baseUrl()}/profile`);
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('My profile');
      await expect(page.getByRole('link', { name: 'Thistledown Biofuel Club' }).count()).resolves.toBe(1);
      await shootBothWidths(page, 'profile');

      // A field error shows beside its field.
      await page.getByLabel('New password', { exact: true }).fill('tiny');
      await page.getByLabel('New password again').fill('tiny');
      await page.getByLabel('Current password', { exact: true }).last().fill(TEST_PASSWORD);
      await page.getByRole('button', { name: 'Change password' }).click();
      await page.getByText('Use at least 12 characters.').waitFor();
      await checkA11y(page);
    });
  }, 150_000);
});
