// Invitations: invite → e-mail caught by the SMTP catcher → link → account → signed in with the
// invited role; existing accounts; re-invites; resend, revoke, expiry, reuse; bad input.
import crypto from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  api,
  baseUrl,
  caughtMail,
  countRows,
  makeCoopWithRoles,
  makeUser,
  signIn,
  sql,
  TEST_PASSWORD,
  waitForMail,
} from '../support/api';
import { mailSettled } from '../support/worker';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;

const NEW_PASSWORD = 'kettle-lantern-orchard-47';
let n = 0;
const freshEmail = () => `invitee-${Date.now().toString(36)}-${n++}@example.org`;
const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** Waits until the worker's send has committed (it commits just after the SMTP server's answer). */
async function waitForDelivery(id: number, delivery = 'sent'): Promise<void> {
  for (let i = 0; i < 100; i++) {
    const [row] = await sql<{ delivery: string }>('SELECT delivery FROM invitations WHERE id = $1', [id]);
    if (row?.delivery === delivery) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`invitation ${id} never became ${delivery}`);
}

/** The token from the link in a caught invitation e-mail (and the link itself). */
function linkIn(text: string): { link: string; token: string } {
  const m = text.match(/(https?:\/\/\S+\/invite\/([A-Za-z0-9_-]{43}))/);
  if (!m) throw new Error(`no invitation link in:\n${text}`);
  return { link: m[1]!, token: m[2]! };
}

describe('invitation by e-mail, end to end through the API', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });
  const invitations = () => `/api/coops/${ctx.coop.slug}/invitations`;

  it('invites a new person, who follows the e-mailed link, creates an account and is signed in as a brewer', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin
      .post(invitations())
      .send({ email: email.toUpperCase(), role: 'brewer' })
      .expect(201);
    // Saved and queued in the request; the job worker makes the link and e-mails it.
    expect(created.body).toMatchObject({
      queued: true,
      invitation: { email, role: 'brewer', delivery: 'queued', expired: false },
    });

    const mail = await waitForMail(email);
    await waitForDelivery(created.body.invitation.id);
    expect(mail.subject).toMatch(/Invitation to join .+ on Tallyvat/);
    expect(mail.text).toMatch(/as a brewer/);
    expect(mail.text).toMatch(/expires on/);
    const { link, token } = linkIn(mail.text);
    expect(link).toBe(`${baseUrl()}/invite/${token}`);

    // Only the SHA-256 of the token is stored; it expires in 7 days.
    const [row] = await sql<{ token_hash: string; expires_at: Date; status: string; invited_by_user_id: number }>(
      'SELECT token_hash, expires_at, status, invited_by_user_id FROM invitations WHERE id = $1',
      [created.body.invitation.id],
    );
    expect(row!.token_hash).toBe(sha256(token));
    expect(row!.invited_by_user_id).toBe(ctx.users.admin.id);
    expect(Math.abs(new Date(row!.expires_at).getTime() - (Date.now() + 7 * 86_400_000))).toBeLessThan(60_000);
    expect(
      await countRows('audit_events', "coop_id = $1 AND action = 'invitation.create' AND entity_id = $2", [
        ctx.coop.id,
        String(created.body.invitation.id),
      ]),
    ).toBe(1);

    // The link opens a page naming the co-op and the role.
    const page = await api().get(`/invite/${token}`).expect(200);
    // (React marks the boundary between adjacent text pieces with an empty comment.)
    expect(page.text.replaceAll('<!-- -->', '')).toContain('as <strong>a brewer</strong>');
    const info = await api().get(`/api/invitations/${token}`).expect(200);
    expect(info.body).toMatchObject({ email, role: 'brewer', account: 'new', coop: { slug: ctx.coop.slug } });

    const accepted = await api()
      .post(`/api/invitations/${token}`)
      .send({ name: 'Rosalind Achterberg', password: NEW_PASSWORD })
      .expect(201);
    expect(accepted.body).toEqual({
      coop: { slug: ctx.coop.slug, name: expect.any(String) },
      role: 'brewer',
      email,
      newAccount: true,
    });

    const agent = await signIn(email, NEW_PASSWORD);
    const mine = await agent.get('/api/coops').expect(200);
    expect(mine.body.coops).toEqual([
      expect.objectContaining({ slug: ctx.coop.slug, role: 'brewer', status: 'active' }),
    ]);
    // Brewer, not admin: the members screen stays closed.
    await agent.get(`/api/coops/${ctx.coop.slug}/members`).expect(403);

    // Single use: the same link now says it was used.
    const again = await api()
      .post(`/api/invitations/${token}`)
      .send({ name: 'Someone Else', password: NEW_PASSWORD })
      .expect(410);
    expect(again.body).toMatchObject({ reason: 'accepted', error: expect.stringMatching(/already been used/) });
    expect((await api().get(`/invite/${token}`).expect(200)).text).toContain('already used');
    const audit = await sql<{ action: string }>(
      `SELECT action FROM audit_events WHERE coop_id = $1 AND actor_user_id = (SELECT id FROM users WHERE email = $2) ORDER BY id`,
      [ctx.coop.id, email],
    );
    expect(audit.map((a) => a.action)).toEqual(['invitation.accept', 'membership.create']);
  });

  it('a person who already has an account signs in as that address and joins with one click', async () => {
    const existing = await makeUser({ coopId: ctx.other.id, role: 'member', name: 'Existing Person' });
    await ctx.agents.admin.post(invitations()).send({ email: existing.email, role: 'treasurer' }).expect(201);
    const { token } = linkIn((await waitForMail(existing.email)).text);

    const anon = await api().get(`/api/invitations/${token}`).expect(200);
    expect(anon.body.account).toBe('sign-in-needed');
    const noSession = await api().post(`/api/invitations/${token}`).send({}).expect(401);
    expect(noSession.body.error).toContain(`Sign in as ${existing.email}`);
    // Signed in as somebody else: refused, and the invitation stays usable.
    const wrong = await ctx.agents.member.post(`/api/invitations/${token}`).send({}).expect(403);
    expect(wrong.body.error).toMatch(/signed in as/);
    expect((await ctx.agents.member.get(`/api/invitations/${token}`).expect(200)).body.account).toBe('other-account');

    const agent = await signIn(existing.email);
    expect((await agent.get(`/api/invitations/${token}`).expect(200)).body.account).toBe('signed-in');
    const accepted = await agent.post(`/api/invitations/${token}`).send({}).expect(201);
    expect(accepted.body).toMatchObject({ role: 'treasurer', newAccount: false });
    const mine = await agent.get('/api/coops').expect(200);
    expect(mine.body.coops).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ slug: ctx.coop.slug, role: 'treasurer' }),
        expect.objectContaining({ slug: ctx.other.slug, role: 'member' }),
      ]),
    );
    // Their password was not touched.
    await signIn(existing.email, TEST_PASSWORD);
  });

  it('lists pending invitations for admins', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    await waitForMail(email);
    await waitForDelivery(created.body.invitation.id);
    const res = await ctx.agents.admin.get(invitations()).expect(200);
    const inv = res.body.invitations.find((i: { email: string }) => i.email === email);
    expect(inv).toMatchObject({ role: 'member', delivery: 'sent', expired: false, invitedBy: expect.any(String) });
    expect(res.body.invitations.every((i: { email: string }) => typeof i.email === 'string')).toBe(true);
    expect(JSON.stringify(res.body)).not.toMatch(/token/i);
  });

  it('re-inviting an address with a pending invitation, or a member, is a 409 and writes nothing', async () => {
    const email = freshEmail();
    const first = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    const before = await countRows('invitations', 'coop_id = $1', [ctx.coop.id]);
    const dup = await ctx.agents.admin
      .post(invitations())
      .send({ email: ` ${email.toUpperCase()} `.trim(), role: 'admin' })
      .expect(409);
    expect(dup.body).toMatchObject({
      invitationId: first.body.invitation.id,
      error: expect.stringMatching(/already waiting/),
    });
    const member = await ctx.agents.admin
      .post(invitations())
      .send({ email: ctx.users.brewer.email, role: 'member' })
      .expect(409);
    expect(member.body.error).toMatch(/already a member/);
    expect(await countRows('invitations', 'coop_id = $1', [ctx.coop.id])).toBe(before);
    const [row] = await sql<{ role: string }>('SELECT role FROM invitations WHERE id = $1', [first.body.invitation.id]);
    expect(row!.role).toBe('member');
  });

  it('resend makes a new link (the old one stops working) and is audited', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    const oldToken = linkIn((await waitForMail(email)).text).token;
    const id = created.body.invitation.id;
    const res = await ctx.agents.admin.post(`${invitations()}/${id}/resend`).expect(200);
    expect(res.body).toMatchObject({ queued: true, invitation: { id, delivery: 'queued' } });
    const newToken = linkIn((await waitForMail(email, (m) => !m.text.includes(oldToken))).text).token;
    expect(newToken).not.toBe(oldToken);
    await api().get(`/api/invitations/${oldToken}`).expect(404);
    await api().get(`/api/invitations/${newToken}`).expect(200);
    expect(
      await countRows('audit_events', "coop_id = $1 AND action = 'invitation.resend' AND entity_id = $2", [
        ctx.coop.id,
        String(id),
      ]),
    ).toBe(1);
  });

  it('revoke withdraws the invitation: the link says so, and it can no longer be resent', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    const { token } = linkIn((await waitForMail(email)).text);
    const id = created.body.invitation.id;
    await ctx.agents.admin.delete(`${invitations()}/${id}`).expect(200);
    const info = await api().get(`/api/invitations/${token}`).expect(410);
    expect(info.body).toMatchObject({ reason: 'revoked', error: expect.stringMatching(/withdrawn/) });
    await api().post(`/api/invitations/${token}`).send({ name: 'Too Late', password: NEW_PASSWORD }).expect(410);
    expect(await countRows('users', 'lower(email) = $1', [email])).toBe(0);
    expect((await ctx.agents.admin.post(`${invitations()}/${id}/resend`).expect(409)).body.error).toMatch(/revoked/);
    await ctx.agents.admin.delete(`${invitations()}/${id}`).expect(409);
    const [event] = await sql<{ before: { status: string }; after: { status: string } }>(
      `SELECT before, after FROM audit_events WHERE coop_id = $1 AND action = 'invitation.revoke' AND entity_id = $2`,
      [ctx.coop.id, String(id)],
    );
    expect(event).toMatchObject({ before: { status: 'pending' }, after: { status: 'revoked' } });
    // Revoked invitations leave the pending list; the address can be invited afresh.
    const list = await ctx.agents.admin.get(invitations()).expect(200);
    expect(list.body.invitations.map((i: { id: number }) => i.id)).not.toContain(id);
    await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
  });

  it('an expired link is refused with a clear message; inviting the address again renews it', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    const { token } = linkIn((await waitForMail(email)).text);
    await sql(`UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE id = $1`, [
      created.body.invitation.id,
    ]);
    const res = await api().get(`/api/invitations/${token}`).expect(410);
    expect(res.body).toMatchObject({ reason: 'expired', error: expect.stringMatching(/expired/) });
    await api().post(`/api/invitations/${token}`).send({ name: 'Late Comer', password: NEW_PASSWORD }).expect(410);
    expect((await api().get(`/invite/${token}`).expect(200)).text).toContain('This invitation has expired');
    expect(
      (await ctx.agents.admin.get(invitations()).expect(200)).body.invitations.find(
        (i: { id: number }) => i.id === created.body.invitation.id,
      ).expired,
    ).toBe(true);

    const renewed = await ctx.agents.admin.post(invitations()).send({ email, role: 'brewer' }).expect(201);
    expect(renewed.body.invitation).toMatchObject({ id: created.body.invitation.id, role: 'brewer', expired: false });
    const fresh = linkIn((await waitForMail(email, (m) => !m.text.includes(token))).text).token;
    await api().post(`/api/invitations/${fresh}`).send({ name: 'Late Comer', password: NEW_PASSWORD }).expect(201);
    expect(
      await countRows(
        'memberships',
        "coop_id = $1 AND role = 'brewer' AND user_id = (SELECT id FROM users WHERE email = $2)",
        [ctx.coop.id, email],
      ),
    ).toBe(1);
  });

  it('an unknown or malformed link is a 404 with a clear message', async () => {
    const unknown = crypto.randomBytes(32).toString('base64url');
    const res = await api().get(`/api/invitations/${unknown}`).expect(404);
    expect(res.body.error).toMatch(/not valid/);
    await api().get('/api/invitations/short').expect(404);
    await api().post(`/api/invitations/${unknown}`).send({ name: 'Nobody', password: NEW_PASSWORD }).expect(404);
    expect((await api().get(`/invite/${unknown}`).expect(200)).text).toContain('This invitation link does not work');
  });

  it('an invitation whose e-mail was not sent stays saved as "not-sent" and is resent successfully', async () => {
    // The SMTP catcher runs for the whole test run, so this arranges the state the service leaves
    // behind when the mail server is down (see accounts-smtp-down.test.ts for that path itself).
    const email = freshEmail();
    const [row] = await sql<{ id: number }>(
      `INSERT INTO invitations (coop_id, email, role, token_hash, delivery, invited_by_user_id, expires_at)
       VALUES ($1, $2, 'member', $3, 'not-sent', $4, now() + interval '7 days') RETURNING id`,
      [ctx.coop.id, email, sha256(crypto.randomBytes(32).toString('base64url')), ctx.users.admin.id],
    );
    const listed = (await ctx.agents.admin.get(invitations()).expect(200)).body.invitations.find(
      (i: { id: number }) => i.id === row!.id,
    );
    expect(listed.delivery).toBe('not-sent');
    const res = await ctx.agents.admin.post(`${invitations()}/${row!.id}/resend`).expect(200);
    expect(res.body).toMatchObject({ queued: true, invitation: { delivery: 'queued' } });
    const { token } = linkIn((await waitForMail(email)).text);
    await waitForDelivery(row!.id);
    await api().get(`/api/invitations/${token}`).expect(200);
  });

  it('shows "sent" once delivered, with the Message-ID in the send ledger; a resend is the next send, exactly once', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    const id = created.body.invitation.id as number;
    expect(created.body.invitation).toMatchObject({ delivery: 'queued', sentAt: null });
    const first = await waitForMail(email);
    await waitForDelivery(id);
    const listed = (await ctx.agents.admin.get(invitations()).expect(200)).body.invitations.find(
      (i: { id: number }) => i.id === id,
    );
    expect(listed).toMatchObject({ delivery: 'sent', sentAt: expect.any(String) });
    const ledger = () =>
      sql<{ generation: number; state: string; message_id: string }>(
        'SELECT generation, state, message_id FROM mail_sends WHERE subject = $1 AND coop_id = $2 ORDER BY generation',
        [`invitation.${id}`, ctx.coop.id],
      );
    expect(await ledger()).toEqual([{ generation: 1, state: 'sent', message_id: first.messageId }]);
    // The members screen says so.
    expect((await ctx.agents.admin.get(`/c/${ctx.coop.slug}/members`).expect(200)).text).toContain('E-mail sent');

    // Resend: one more message, with a new link and its own Message-ID.
    await ctx.agents.admin.post(`${invitations()}/${id}/resend`).expect(200);
    await waitForMail(email, (m) => m.messageId !== first.messageId);
    await waitForDelivery(id);
    await mailSettled();
    const mails = await caughtMail(email);
    expect(mails).toHaveLength(2);
    const rows = await ledger();
    expect(rows.map((r) => [r.generation, r.state])).toEqual([
      [1, 'sent'],
      [2, 'sent'],
    ]);
    expect(mails[0]!.messageId).toBe(rows[1]!.message_id);
    // The new link works; the first one no longer does.
    await api()
      .get(`/api/invitations/${linkIn(mails[0]!.text).token}`)
      .expect(200);
    await api()
      .get(`/api/invitations/${linkIn(first.text).token}`)
      .expect(404);
  });

  it('resend and revoke of another co-op’s invitation are 404', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin.post(invitations()).send({ email, role: 'member' }).expect(201);
    const id = created.body.invitation.id;
    // ctx.agents.outsider is an admin of ctx.other.
    await ctx.agents.outsider.post(`/api/coops/${ctx.other.slug}/invitations/${id}/resend`).expect(404);
    await ctx.agents.outsider.delete(`/api/coops/${ctx.other.slug}/invitations/${id}`).expect(404);
    const [row] = await sql<{ status: string }>('SELECT status FROM invitations WHERE id = $1', [id]);
    expect(row!.status).toBe('pending');
  });
});

describe('invitation bad input → 422 with field and reason, nothing written', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });

  it('creating an invitation', async () => {
    const url = `/api/coops/${ctx.coop.slug}/invitations`;
    const before = await countRows('invitations');
    const cases: [unknown, string[]][] = [
      [{}, ['email', 'role']],
      [{ email: 'not-an-address', role: 'member' }, ['email']],
      [{ email: 42, role: 'member' }, ['email']],
      [{ email: `${'a'.repeat(250)}@example.org`, role: 'member' }, ['email']],
      [{ email: freshEmail(), role: 'overlord' }, ['role']],
      [{ email: freshEmail(), role: ['admin'] }, ['role']],
      [{ email: freshEmail(), role: 'member', coopId: ctx.other.id }, ['coopId']],
      [{ email: freshEmail(), role: 'member', invitedByUserId: ctx.users.outsider.id }, ['invitedByUserId']],
    ];
    for (const [body, fields] of cases) {
      const res = await ctx.agents.admin
        .post(url)
        .send(body as object)
        .expect(422);
      expect(Object.keys(res.body.fields).sort(), JSON.stringify(body).slice(0, 80)).toEqual(fields);
      for (const f of fields) expect(res.body.fields[f][0]).toEqual(expect.any(String));
    }
    expect(await countRows('invitations')).toBe(before);
  });

  it('accepting an invitation', async () => {
    const email = freshEmail();
    const created = await ctx.agents.admin
      .post(`/api/coops/${ctx.coop.slug}/invitations`)
      .send({ email, role: 'member' })
      .expect(201);
    const { token } = linkIn((await waitForMail(email)).text);
    const usersBefore = await countRows('users');
    const membershipsBefore = await countRows('memberships', 'coop_id = $1', [ctx.coop.id]);
    const cases: [unknown, string[], RegExp?][] = [
      [{}, ['name', 'password']],
      [{ name: 'Valid Name' }, ['password']],
      [{ password: NEW_PASSWORD }, ['name']],
      [{ name: 'Valid Name', password: 'too-short' }, ['password'], /at least 12/],
      [{ name: 'Valid Name', password: 'x'.repeat(129) }, ['password'], /at most 128/],
      [{ name: 'Valid Name', password: 'correcthorsebatterystaple' }, ['password'], /commonly used/],
      [{ name: 'x'.repeat(121), password: NEW_PASSWORD }, ['name'], /120/],
      [{ name: 12, password: NEW_PASSWORD }, ['name']],
      [{ name: 'Valid Name', password: NEW_PASSWORD, role: 'admin' }, ['role']],
      [{ name: 'Valid Name', password: NEW_PASSWORD, coopId: ctx.other.id }, ['coopId']],
    ];
    for (const [body, fields, reason] of cases) {
      const res = await api()
        .post(`/api/invitations/${token}`)
        .send(body as object)
        .expect(422);
      expect(Object.keys(res.body.fields).sort(), JSON.stringify(body).slice(0, 80)).toEqual(fields);
      if (reason) expect(res.body.fields[fields[0]!].join(' ')).toMatch(reason);
    }
    expect(await countRows('users')).toBe(usersBefore);
    expect(await countRows('memberships', 'coop_id = $1', [ctx.coop.id])).toBe(membershipsBefore);
    const [row] = await sql<{ status: string }>('SELECT status FROM invitations WHERE id = $1', [
      created.body.invitation.id,
    ]);
    expect(row!.status).toBe('pending');
    // The invited role is the one that counts: a good body still joins as a plain member.
    await api().post(`/api/invitations/${token}`).send({ name: 'Valid Name', password: NEW_PASSWORD }).expect(201);
    expect(
      await countRows(
        'memberships',
        "coop_id = $1 AND role = 'member' AND user_id = (SELECT id FROM users WHERE email = $2)",
        [ctx.coop.id, email],
      ),
    ).toBe(1);
  });
});
