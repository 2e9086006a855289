// Bulk invitations from a CSV file: preview (row and field named, nothing written), confirm (one
// transaction, e-mails through the job worker exactly once each), result with delivery status and
// a CSV download, the same file refused a second time, and nobody invited twice.
import { beforeAll, describe, expect, it } from 'vitest';
import { caughtMail, countRows, makeCoopWithRoles, makeUser, sql } from '../support/api';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;

let seq = 0;
const tag = () => `bulk${Date.now().toString(36)}${seq++}`;

/** Rows that leave a mark anywhere an import writes. */
async function footprint(coopId: number) {
  return {
    invitations: await countRows('invitations', 'coop_id = $1', [coopId]),
    imports: await countRows('imports', 'coop_id = $1', [coopId]),
    audit: await countRows('audit_events', 'coop_id = $1', [coopId]),
    jobs: Number(
      (
        await sql<{ n: string }>(
          `SELECT count(*)::text AS n FROM pgboss.job WHERE name = 'mail-invitation' AND (data->>'coopId')::int = $1`,
          [coopId],
        )
      )[0]!.n,
    ),
  };
}

/** Polls the import until no e-mail is waiting (the worker sends them). */
async function waitUntilSent(agent: Ctx['agents']['admin'], url: string, timeoutMs = 90_000) {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const res = await agent.get(url).expect(200);
    if (res.body.progress.queued === 0) return res.body;
    if (Date.now() > end) throw new Error(`still ${res.body.progress.queued} e-mails waiting`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

describe('bulk invitations from a CSV file', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });
  const base = () => `/api/coops/${ctx.coop.slug}/imports/invitations`;

  it('the preview names the row and the field of every kind of bad row, and writes nothing', async () => {
    const t = tag();
    // An address with a pending invitation, and an expired one (which the import renews).
    await ctx.agents.admin
      .post(`/api/coops/${ctx.coop.slug}/invitations`)
      .send({ email: `${t}-pending@example.org`, role: 'member' })
      .expect(201);
    await sql(
      `INSERT INTO invitations (coop_id, email, role, token_hash, delivery, expires_at) VALUES ($1, $2, 'member', repeat('e', 64), 'sent', now() - interval '1 day')`,
      [ctx.coop.id, `${t}-expired@example.org`],
    );
    const csv = [
      '\uFEFFName;E-mail;Role',
      `"Quist, Marta";${t}-a@example.org;Brewer`,
      `Nell Abara;not-an-address;member`,
      `Rolf Tamm;${t}-b@example.org;captain`,
      '',
      `Ines Duarte;${ctx.users.member.email.toUpperCase()};member`,
      `Pia Lund;${t}-pending@example.org;admin`,
      `Marta again;${t}-A@example.org;member`,
      `${'x'.repeat(130)};${t}-c@example.org;`,
      `Oskar Vey;${t}-expired@example.org;treasurer`,
      `;${t}-d@example.org;`,
    ].join('\r\n');
    const before = await footprint(ctx.coop.id);
    const res = await ctx.agents.admin.post(`${base()}/preview`).send({ fileName: 'members.csv', csv }).expect(200);
    const fates = res.body.rows.map((r: { line: number; fate: string; field: string | null }) => [
      r.line,
      r.fate,
      r.field,
    ]);
    expect(fates).toEqual([
      [2, 'invite', null],
      [3, 'bad-email', 'email'],
      [4, 'bad-role', 'role'],
      [6, 'member', null],
      [7, 'invited', null],
      [8, 'duplicate', 'email'],
      [9, 'bad-name', 'name'],
      [10, 'invite', null],
      [11, 'invite', null],
    ]);
    expect(res.body.rows[0]).toMatchObject({ name: 'Quist, Marta', email: `${t}-a@example.org`, role: 'brewer' });
    expect(res.body.rows[5].message).toMatch(/row 2/);
    expect(res.body.rows[8]).toMatchObject({ role: 'member', message: 'Will invite.' });
    expect(res.body.counts).toMatchObject({
      invite: 3,
      member: 1,
      invited: 1,
      duplicate: 1,
      'bad-email': 1,
      'bad-role': 1,
      'bad-name': 1,
    });
    expect(res.body.earlierImport).toBeNull();
    expect(await footprint(ctx.coop.id)).toEqual(before);

    // Confirm: the three `invite` rows become invitations (the expired one renewed in place), one job each.
    const done = await ctx.agents.admin.post(base()).send({ fileName: 'members.csv', csv }).expect(201);
    expect(done.body).toMatchObject({ invited: 3, skipped: 6 });
    const after = await footprint(ctx.coop.id);
    expect(after).toMatchObject({
      invitations: before.invitations + 2,
      imports: before.imports + 1,
      audit: before.audit + 1,
      jobs: before.jobs + 3,
    });
    const [event] = await sql<{ after: Record<string, unknown>; actor_user_id: number }>(
      `SELECT after, actor_user_id FROM audit_events WHERE coop_id = $1 AND action = 'import.create' AND entity_id = $2`,
      [ctx.coop.id, String(done.body.importId)],
    );
    expect(event).toMatchObject({
      actor_user_id: ctx.users.admin.id,
      after: { kind: 'invitations', fileName: 'members.csv', rowsTotal: 9, rowsImported: 3, rowsSkipped: 6 },
    });
    const renewed = await sql<{ role: string; name: string; import_id: number }>(
      `SELECT role, name, import_id FROM invitations WHERE coop_id = $1 AND email = $2`,
      [ctx.coop.id, `${t}-expired@example.org`],
    );
    expect(renewed).toEqual([{ role: 'treasurer', name: 'Oskar Vey', import_id: done.body.importId }]);

    const status = await waitUntilSent(ctx.agents.admin, `${base()}/${done.body.importId}`);
    expect(status.progress).toEqual({ queued: 0, sent: 3, notSent: 0 });
    const greeting = (await caughtMail(`${t}-a@example.org`))[0]!;
    expect(greeting.text).toMatch(/^Hello Quist, Marta,/);
    expect(greeting.text).toMatch(/as a brewer/);
  });

  it('refuses bad input with 422 naming the field, an unknown kind with 404, and writes nothing', async () => {
    const before = await footprint(ctx.coop.id);
    const noCsv = await ctx.agents.admin.post(`${base()}/preview`).send({ fileName: 'x.csv' }).expect(422);
    expect(noCsv.body.fields.csv).toBeDefined();
    const noEmail = await ctx.agents.admin
      .post(`${base()}/preview`)
      .send({ fileName: 'x.csv', csv: 'Name,Role\nA,member\n' })
      .expect(422);
    expect(noEmail.body.fields.csv[0]).toMatch(/E-mail/);
    const empty = await ctx.agents.admin.post(base()).send({ fileName: 'x.csv', csv: '\r\n\r\n' }).expect(422);
    expect(empty.body.fields.csv[0]).toMatch(/empty/);
    const smuggled = await ctx.agents.admin
      .post(base())
      .send({ fileName: 'x.csv', csv: 'email\na@example.org', coopId: ctx.other.id })
      .expect(422);
    expect(smuggled.body.fields.coopId).toBeDefined();
    await ctx.agents.admin
      .post(`/api/coops/${ctx.coop.slug}/imports/nonsense/preview`)
      .send({ fileName: 'x.csv', csv: 'email\na@example.org' })
      .expect(404);
    await ctx.agents.admin.get(`${base()}/999999/result`).expect(404);
    expect(await footprint(ctx.coop.id)).toEqual(before);
  });

  it('a confirm that fails writes nothing: a file that would invite nobody', async () => {
    const csv = `email,role\n${ctx.users.brewer.email},member\nbad@,member\n`;
    const before = await footprint(ctx.coop.id);
    const res = await ctx.agents.admin.post(base()).send({ fileName: 'nobody.csv', csv }).expect(422);
    expect(res.body.fields.csv).toEqual(['Nothing to invite.']);
    expect(await footprint(ctx.coop.id)).toEqual(before);
  });

  it('300 invitations from one file are e-mailed exactly once each; the same file again, or its people in another file, invites no one twice', async () => {
    const t = tag();
    const people = Array.from({ length: 300 }, (_, i) => ({
      name: `Member ${i + 1}`,
      email: `${t}-${i + 1}@example.org`,
    }));
    const csv =
      ['Name,E-mail,Role', ...people.map((p, i) => `${p.name},${p.email},${i % 10 === 0 ? 'brewer' : ''}`)].join('\n') +
      '\n';
    const started = Date.now();
    const done = await ctx.agents.admin.post(base()).send({ fileName: 'everyone.csv', csv }).expect(201);
    expect(done.body).toMatchObject({ invited: 300, skipped: 0 });
    const confirmMs = Date.now() - started;
    const status = await waitUntilSent(ctx.agents.admin, `${base()}/${done.body.importId}`);
    console.log(`[bench] 300 invitations: confirm ${confirmMs} ms, all e-mailed after ${Date.now() - started} ms`);
    expect(status.progress).toEqual({ queued: 0, sent: 300, notSent: 0 });
    expect(status.rows.every((r: { delivery: string }) => r.delivery === 'sent')).toBe(true);

    // Re-uploading the same file (saved again with a BOM and CRLF line ends): refused, nothing written.
    const before = await footprint(ctx.coop.id);
    const again = '\uFEFF' + csv.replace(/\n/g, '\r\n');
    const preview = await ctx.agents.admin
      .post(`${base()}/preview`)
      .send({ fileName: 'everyone (1).csv', csv: again })
      .expect(200);
    expect(preview.body.earlierImport).toMatchObject({ id: done.body.importId, createdBy: expect.any(String) });
    expect(preview.body.counts).toMatchObject({ invite: 0, invited: 300 });
    const refused = await ctx.agents.admin.post(base()).send({ fileName: 'everyone (1).csv', csv: again }).expect(409);
    expect(refused.body).toMatchObject({
      importId: done.body.importId,
      error: expect.stringMatching(/already imported/),
    });
    // The same people in a different file: everyone already invited, nothing to do.
    await ctx.agents.admin
      .post(base())
      .send({ fileName: 'edited.csv', csv: csv + `Newcomer,bad-address,member\n` })
      .expect(422);
    expect(await footprint(ctx.coop.id)).toEqual(before);

    // A moment for any second copy to arrive; then each address has exactly one e-mail.
    await new Promise((r) => setTimeout(r, 2000));
    const mail = (await caughtMail()).filter((m) => m.to.includes(`${t}-`));
    const perAddress = new Map<string, number>();
    for (const m of mail) perAddress.set(m.to.toLowerCase(), (perAddress.get(m.to.toLowerCase()) ?? 0) + 1);
    expect(perAddress.size).toBe(300);
    expect([...perAddress.values()].every((n) => n === 1)).toBe(true);

    // The result download: every row with its fate and delivery, formulas neutralised.
    const result = await ctx.agents.admin.get(`${base()}/${done.body.importId}/result`).expect(200);
    expect(result.headers['content-type']).toMatch(/text\/csv/);
    expect(result.headers['content-disposition']).toMatch(/everyone-result\.csv/);
    const lines = result.text.trim().split('\r\n');
    expect(lines[0]).toBe('Row,Name,E-mail,Role,Result,Note,E-mail delivery,Invitation');
    expect(lines).toHaveLength(301);
    expect(lines[1]).toBe(`2,Member 1,${t}-1@example.org,brewer,Invited,Will invite.,Sent,pending`);
  }, 150_000);

  it('another co-op’s import is a 404; the history lists this co-op’s imports only; the template downloads', async () => {
    const [mine] = await sql<{ id: number }>(`SELECT id FROM imports WHERE coop_id = $1 LIMIT 1`, [ctx.coop.id]);
    const outsiderAdmin = await makeUser({ coopId: ctx.other.id, role: 'admin' });
    void outsiderAdmin;
    await ctx.agents.outsider.get(`/api/coops/${ctx.other.slug}/imports/invitations/${mine!.id}`).expect(404);
    await ctx.agents.outsider.get(`/api/coops/${ctx.other.slug}/imports/invitations/${mine!.id}/result`).expect(404);
    const list = await ctx.agents.outsider.get(`/api/coops/${ctx.other.slug}/imports`).expect(200);
    expect(list.body.imports).toEqual([]);
    const mineList = await ctx.agents.admin.get(`/api/coops/${ctx.coop.slug}/imports`).expect(200);
    expect(mineList.body.imports.length).toBeGreaterThanOrEqual(2);
    const template = await ctx.agents.admin.get(`${base()}/template`).expect(200);
    expect(template.text.split('\r\n')[0]).toBe('Name,E-mail,Role');
  });
});
