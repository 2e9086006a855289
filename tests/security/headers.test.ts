// Finding 3: no security headers on pages or JSON (the members page rendered inside a frame).
// Now every page carries a Content-Security-Policy whose only script source is a per-request
// nonce that Next.js puts on its own scripts, and every response refuses framing and sniffing.
import { describe, expect, it } from 'vitest';
import { api, makeCoopWithRoles } from '../support/api';

const COMMON = {
  'x-frame-options': 'DENY',
  'x-content-type-options': 'nosniff',
  'referrer-policy': 'strict-origin-when-cross-origin',
};

function directives(csp: string): Map<string, string[]> {
  return new Map(
    csp
      .split(';')
      .map((d) => d.trim().split(/\s+/))
      .filter((p) => p[0])
      .map(([name, ...values]) => [name!, values]),
  );
}

describe('security headers', () => {
  it('a page: CSP with a fresh nonce on every script, no inline scripts allowed, no framing', async () => {
    const nonces = new Set<string>();
    for (let i = 0; i < 2; i++) {
      const res = await api().get('/sign-in').expect(200);
      expect(res.headers).toMatchObject(COMMON);
      expect(res.headers['permissions-policy']).toMatch(/camera=\(\)/);
      const csp = directives(res.headers['content-security-policy'] ?? '');
      const scripts = csp.get('script-src') ?? [];
      expect(scripts).not.toContain("'unsafe-inline'");
      expect(scripts).not.toContain("'unsafe-eval'");
      expect(scripts).not.toContain('*');
      const nonce = scripts.find((s) => s.startsWith("'nonce-"))?.slice(7, -1);
      expect(nonce, 'a nonce in script-src').toMatch(/^[A-Za-z0-9+/=]{16,}$/);
      nonces.add(nonce!);
      expect(csp.get('frame-ancestors')).toEqual(["'none'"]);
      expect(csp.get('object-src')).toEqual(["'none'"]);
      expect(csp.get('base-uri')).toEqual(["'self'"]);
      // Every script the page carries holds this request's nonce.
      const tags = res.text.match(/<script\b[^>]*>/g) ?? [];
      expect(tags.length).toBeGreaterThan(0);
      for (const tag of tags) expect(tag, tag).toContain(`nonce="${nonce}"`);
      // No https: over plain http (HSTS is for https only).
      expect(res.headers['strict-transport-security']).toBeUndefined();
    }
    expect(nonces.size).toBe(2);
  });

  it("a signed-in page (the members list) can't be framed", async () => {
    const ctx = await makeCoopWithRoles();
    const res = await ctx.agents.admin.get(`/c/${ctx.coop.slug}/members`).expect(200);
    expect(res.headers['x-frame-options']).toBe('DENY');
    expect(directives(res.headers['content-security-policy'] ?? '').get('frame-ancestors')).toEqual(["'none'"]);
  });

  it('JSON answers, errors included, carry the headers and a sandboxing policy', async () => {
    for (const req of [api().get('/api/me'), api().post('/api/password-reset').send({ email: 'x' })]) {
      const res = await req;
      expect(res.status).toBeGreaterThanOrEqual(400);
      expect(res.headers).toMatchObject(COMMON);
      expect(res.headers['content-security-policy']).toMatch(/sandbox/);
      expect(res.headers['content-security-policy']).toMatch(/frame-ancestors 'none'/);
      // One value each, not the same header twice.
      expect(res.headers['x-content-type-options']).toBe('nosniff');
    }
  });

  it('static files carry the common headers too', async () => {
    const page = await api().get('/sign-in').expect(200);
    const css = /href="(\/_next\/static\/[^"]+\.css)"/.exec(page.text)?.[1];
    expect(css).toBeDefined();
    const res = await api().get(css!).expect(200);
    expect(res.headers).toMatchObject(COMMON);
  });
});
