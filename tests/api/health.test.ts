import { describe, expect, it } from 'vitest';
import { api, sql } from '../support/api';

describe('GET /api/health', () => {
  it('answers 200 with the database up', async () => {
    const res = await api().get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok' });
  });

  it('liveness answers without touching anything; readiness checks the database and the storage bucket', async () => {
    expect((await api().get('/api/live').expect(200)).body).toEqual({ status: 'alive' });
    expect((await api().get('/api/ready').expect(200)).body).toEqual({ status: 'ready', db: 'ok', storage: 'ok' });
  });

  it('the demo seeder created two co-ops with one person per role in the first', async () => {
    const rows = await sql<{ slug: string; role: string }>(
      `SELECT c.slug, m.role FROM memberships m JOIN coops c ON c.id = m.coop_id
       JOIN users u ON u.id = m.user_id WHERE u.email LIKE '%@example.org' ORDER BY c.slug, m.role`,
    );
    expect(
      rows
        .filter((r) => r.slug === 'prairie-lantern')
        .map((r) => r.role)
        .sort(),
    ).toEqual(['admin', 'brewer', 'member', 'treasurer']);
    expect(rows.filter((r) => r.slug === 'harbourside').length).toBeGreaterThanOrEqual(1);
  });
});
