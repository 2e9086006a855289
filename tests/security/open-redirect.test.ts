// Finding 1: `/sign-in?next=/%5Cevil.example/x` sent the browser to http://evil.example/x after
// signing in (only `//` was refused; browsers read `\` and tab as `/`). Now the target is judged
// with the URL API against the app's own origin.
import { describe, expect, it } from 'vitest';
import { DEFAULT_AFTER_SIGN_IN, safeNextPath } from '@/lib/security/redirect';
import { baseUrl, DEMO_PASSWORD } from '../support/api';
import { withBrowser } from '../support/browser';

const HOSTILE = [
  '/\\evil.example/x',
  '/\t/evil.example/x',
  '/\n/evil.example',
  '//evil.example',
  '///evil.example',
  '/.//evil.example',
  '/%2F/evil.example',
  'https://evil.example/',
  'http:evil.example',
  'javascript:alert(1)',
  ' /coops',
  'evil.example',
  '\\\\evil.example',
  '/\\/evil.example',
  '',
  '/\u0000',
];

describe('post-sign-in target', () => {
  it('refuses every target that leaves the app', () => {
    for (const next of HOSTILE) {
      const got = safeNextPath(next);
      const resolved = new URL(got, 'http://app.invalid');
      expect(resolved.origin, JSON.stringify(next)).toBe('http://app.invalid');
      expect(got.startsWith('//') || got.startsWith('/\\'), JSON.stringify(next)).toBe(false);
    }
    expect(safeNextPath('/\\evil.example/x')).toBe(DEFAULT_AFTER_SIGN_IN);
  });

  it('keeps paths on the app, with their query and fragment', () => {
    expect(safeNextPath('/c/prairie-lantern/tank?tab=dips#top')).toBe('/c/prairie-lantern/tank?tab=dips#top');
    expect(safeNextPath(undefined)).toBe(DEFAULT_AFTER_SIGN_IN);
  });

  it('in the browser: signing in from /sign-in?next=/%5Cevil.example/x stays on the app', async () => {
    await withBrowser(async (page) => {
      await page.route(
        (u) => u.hostname.endsWith('evil.example'),
        (route) => route.fulfill({ status: 200, body: 'evil' }),
      );
      await page.goto(`${baseUrl()}/sign-in?next=/%5Cevil.example/x`);
      await page.getByLabel('E-mail').fill('marisol.admin@example.org');
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      await Promise.all([
        page.waitForURL((u) => !u.pathname.startsWith('/sign-in')),
        page.getByRole('button', { name: 'Sign in' }).click(),
      ]);
      const landed = new URL(page.url());
      expect(landed.origin).toBe(baseUrl());
      expect(landed.pathname).toBe('/coops');
    });
  });
});
