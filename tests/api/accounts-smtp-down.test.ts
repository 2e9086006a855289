// "If the SMTP server is down, the invitation is still saved, marked not-sent, and can be resent."
// The SMTP catcher serves the whole test run, so the down case is exercised here on the service
// itself (lib/invitations, real PostgreSQL) with its mail transport pointed at a loopback port
// where nothing listens. The resend then goes through the real server and the real catcher.
import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { makeCoop, makeUser, signIn, sql, waitForMail } from '../support/api';

async function closedPort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((r) => s.listen(0, '127.0.0.1', r));
  const { port } = s.address() as net.AddressInfo;
  await new Promise((r) => s.close(r));
  return port;
}

describe('invitation while the mail server is down', () => {
  let lib: typeof import('@/lib/invitations');
  let db: typeof import('@/lib/db');
  beforeAll(async () => {
    process.env.DATABASE_URL = inject('databaseUrl');
    process.env.APP_URL = inject('baseUrl');
    process.env.SMTP_HOST = '127.0.0.1';
    process.env.SMTP_PORT = String(await closedPort());
    lib = await import('@/lib/invitations');
    db = await import('@/lib/db');
  });
  afterAll(async () => {
    await db?.sequelize.close();
  });

  it('is saved as "not-sent" (audited), listed for resending, and a resend through the app delivers a working link', async () => {
    const coop = await makeCoop({ name: 'Quillfeather Fuel Circle' });
    const admin = await makeUser({ coopId: coop.id, role: 'admin', name: 'Signe Halloran' });
    const actor = {
      user: { id: admin.id, email: admin.email, name: 'Signe Halloran' },
      coop: { id: coop.id, slug: coop.slug, name: 'Quillfeather Fuel Circle', units: 'us' as const, currency: 'USD', timezone: 'America/Chicago', settings: {} },
      role: 'admin' as const,
      membershipId: admin.membershipId!,
    };
    const email = `offline-${Date.now().toString(36)}@example.org`;

    const result = await lib.createInvitation(actor, { email, role: 'treasurer' });
    expect(result.sent).toBe(false);
    expect(result.invitation).toMatchObject({ email, role: 'treasurer', delivery: 'not-sent', expired: false });
    const [row] = await sql<{ delivery: string; status: string }>('SELECT delivery, status FROM invitations WHERE id = $1', [result.invitation.id]);
    expect(row).toEqual({ delivery: 'not-sent', status: 'pending' });
    const [event] = await sql<{ action: string }>(`SELECT action FROM audit_events WHERE coop_id = $1 AND entity_id = $2`, [coop.id, String(result.invitation.id)]);
    expect(event!.action).toBe('invitation.create');

    // A resend from the service while still down: new link, still not sent, nothing lost.
    const again = await lib.resendInvitation(actor, result.invitation.id);
    expect(again).toMatchObject({ sent: false, invitation: { delivery: 'not-sent' } });

    // The mail server is back (the app's own transport reaches the catcher): resend from the members screen's API.
    const agent = await signIn(admin.email);
    const listed = await agent.get(`/api/coops/${coop.slug}/invitations`).expect(200);
    expect(listed.body.invitations).toEqual([expect.objectContaining({ id: result.invitation.id, delivery: 'not-sent' })]);
    const resent = await agent.post(`/api/coops/${coop.slug}/invitations/${result.invitation.id}/resend`).expect(200);
    expect(resent.body).toMatchObject({ sent: true, invitation: { delivery: 'sent' } });
    const mail = await waitForMail(email);
    const token = mail.text.match(/\/invite\/([A-Za-z0-9_-]{43})/)![1]!;
    const info = await agent.get(`/api/invitations/${token}`).expect(200);
    expect(info.body).toMatchObject({ role: 'treasurer', coop: { slug: coop.slug } });
  });
});
