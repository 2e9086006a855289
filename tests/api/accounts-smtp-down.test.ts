// "If the SMTP server is down, the invitation is still saved, marked not-sent, and can be resent."
// Invitations are e-mailed by the job worker. The SMTP catcher serves the whole test run, so the
// down case is exercised here on the job's own function (lib/members/invitations/deliver, real PostgreSQL)
// with its mail transport pointed at a loopback port where nothing listens. The resend then goes
// through the real server, the real worker and the real catcher.
import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { countRows, makeCoop, makeUser, signIn, sql, waitForMail } from '../support/api';

async function closedPort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((r) => s.listen(0, '127.0.0.1', r));
  const { port } = s.address() as net.AddressInfo;
  await new Promise((r) => s.close(r));
  return port;
}

describe('invitation while the mail server is down', () => {
  let deliver: typeof import('@/lib/members/invitations/deliver');
  let db: typeof import('@/lib/db');
  beforeAll(async () => {
    process.env.DATABASE_URL = inject('databaseUrl');
    process.env.APP_URL = inject('baseUrl');
    process.env.SMTP_HOST = '127.0.0.1';
    process.env.SMTP_PORT = String(await closedPort());
    // The link is derived from the claimed Message-ID with the server's secret (lib/auth/tokens).
    process.env.NEXTAUTH_SECRET = (JSON.parse(inject('workerEnv')) as NodeJS.ProcessEnv).NEXTAUTH_SECRET;
    deliver = await import('@/lib/members/invitations/deliver');
    db = await import('@/lib/db');
  });
  afterAll(async () => {
    await db?.sequelize.close();
  });

  it('a failed send stays "queued" (retried), every try failing leaves it "not-sent" for a resend that delivers a working link', async () => {
    const coop = await makeCoop({ name: 'Quillfeather Fuel Circle' });
    const admin = await makeUser({ coopId: coop.id, role: 'admin', name: 'Signe Halloran' });
    const email = `offline-${Date.now().toString(36)}@example.org`;
    // A queued invitation whose job this process runs by hand (the test worker never sees it: no job was queued).
    const [inv] = await sql<{ id: number }>(
      `INSERT INTO invitations (coop_id, email, role, token_hash, delivery, invited_by_user_id, expires_at)
       VALUES ($1, $2, 'treasurer', repeat('0', 64), 'queued', $3, now() + interval '7 days') RETURNING id`,
      [coop.id, email, admin.id],
    );

    // The job's try fails: it throws (pg-boss retries it later); the server surely never had it,
    // so its claim in the send ledger is withdrawn: still queued, nothing recorded as sent.
    await expect(deliver.deliverInvitationJob(coop.id, inv!.id, 'mail-invitation:by-hand')).rejects.toThrow();
    const [row] = await sql<{ delivery: string; status: string }>(
      'SELECT delivery, status FROM invitations WHERE id = $1',
      [inv!.id],
    );
    expect(row).toEqual({ delivery: 'queued', status: 'pending' });
    expect(await countRows('mail_sends', 'subject = $1', [`invitation.${inv!.id}`])).toBe(0);

    // Every try failed (the dead letter): marked not-sent, listed for resending.
    await deliver.invitationMailGaveUp(coop.id, inv!.id);
    const agent = await signIn(admin.email);
    const listed = await agent.get(`/api/coops/${coop.slug}/invitations`).expect(200);
    expect(listed.body.invitations).toEqual([expect.objectContaining({ id: inv!.id, delivery: 'not-sent' })]);

    // The mail server is back (the worker's transport reaches the catcher): resend from the members screen's API.
    const resent = await agent.post(`/api/coops/${coop.slug}/invitations/${inv!.id}/resend`).expect(200);
    expect(resent.body).toMatchObject({ queued: true, invitation: { delivery: 'queued' } });
    const mail = await waitForMail(email);
    const token = mail.text.match(/\/invite\/([A-Za-z0-9_-]{43})/)![1]!;
    const info = await agent.get(`/api/invitations/${token}`).expect(200);
    expect(info.body).toMatchObject({ role: 'treasurer', coop: { slug: coop.slug } });
    // A job run again for the sent invitation sends nothing.
    for (
      let i = 0;
      i < 50 &&
      (await sql<{ d: string }>('SELECT delivery AS d FROM invitations WHERE id = $1', [inv!.id]))[0]!.d !== 'sent';
      i++
    )
      await new Promise((r) => setTimeout(r, 100));
    await expect(deliver.deliverInvitationJob(coop.id, inv!.id, 'mail-invitation:by-hand')).resolves.toBe(false);
    // The delivered message is in the ledger under its Message-ID.
    const [sent] = await sql<{ message_id: string; state: string }>(
      'SELECT message_id, state FROM mail_sends WHERE subject = $1',
      [`invitation.${inv!.id}`],
    );
    expect(sent).toEqual({ message_id: mail.messageId, state: 'sent' });
  });
});
