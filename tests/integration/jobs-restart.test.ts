// The job worker can die at any moment and lose nothing: a billing run whose worker is killed
// (SIGKILL) mid-run finishes after a new worker starts, with one draft per member and, once
// issued, consecutive numbers with no gap or duplicate; invoice e-mails queued when the worker is
// killed are all delivered after the restart, each exactly once (counted in the SMTP catcher).
import { describe, expect, it } from 'vitest';
import { caughtMail, sql } from '../support/api';
import { invoicesOf, issueMonth, makeBillingCoop, monthsAgo, waitForRun } from '../support/billing';
import { killWorker, startWorker } from '../support/worker';

/** Adds `n` active members to a co-op in two statements (users, then memberships); returns their e-mails. */
async function addMembers(coopId: number, n: number, tag: string): Promise<string[]> {
  const users = await sql<{ id: number; email: string }>(
    `INSERT INTO users (email, name, password_hash)
     SELECT 'bulk-' || $2 || '-' || g || '@example.test', 'Member ' || lpad(g::text, 5, '0'), 'x' FROM generate_series(1, $1::int) g
     RETURNING id, email`,
    [n, tag],
  );
  await sql(
    `INSERT INTO memberships (coop_id, user_id, role, status, joined_at) SELECT $1, id, 'member', 'active', '2020-01-01' FROM unnest($2::int[]) id`,
    [coopId, users.map((u) => u.id)],
  );
  return users.map((u) => u.email);
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitUntil(what: string, check: () => Promise<boolean>, timeoutMs: number) {
  const end = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await sleep(50);
  }
}

describe('the worker killed mid-queue', () => {
  it('a billing run killed between chunks resumes: one draft per member, consecutive numbers after issuing', async () => {
    const c = await makeBillingCoop({ dues: 700, members: [] });
    const tag = Date.now().toString(36);
    const MEMBERS = 1100; // three chunks of 500
    await addMembers(c.coop.id, MEMBERS, tag);
    const period = monthsAgo(1);
    const start = await c.treasurerAgent.post(`/api/coops/${c.coop.slug}/billing/runs`).send({ period });
    expect([200, 202], JSON.stringify(start.body)).toContain(start.status);
    const runId = start.body.run.id as number;
    const progress = async () =>
      (
        await sql<{ done_members: number; status: string }>(
          'SELECT done_members, status FROM billing_runs WHERE id = $1',
          [runId],
        )
      )[0]!;

    await waitUntil('the first chunk', async () => (await progress()).done_members > 0, 60_000);
    await killWorker();
    const atKill = await progress();
    expect(atKill.status).toBe('running');
    expect(atKill.done_members).toBeLessThan(MEMBERS);
    // With no worker, nothing moves.
    await sleep(1500);
    expect((await progress()).done_members).toBe(atKill.done_members);

    await startWorker();
    const run = await waitForRun(c.treasurerAgent, c.coop.slug, runId);
    // Everyone is billed (monthly dues): the bulk members and the treasurer.
    const billed = Number(
      (await sql<{ n: string }>('SELECT count(*) AS n FROM memberships WHERE coop_id = $1', [c.coop.id]))[0]!.n,
    );
    expect(billed).toBe(MEMBERS + 1);
    expect(run).toMatchObject({ totalMembers: billed, doneMembers: billed, drafts: billed });
    const [{ n, members }] = (await sql<{ n: string; members: string }>(
      `SELECT count(*) AS n, count(DISTINCT membership_id) AS members FROM invoices WHERE coop_id = $1 AND status = 'draft'`,
      [c.coop.id],
    )) as [{ n: string; members: string }];
    expect(Number(n)).toBe(billed);
    expect(Number(members)).toBe(billed);

    const issued = await issueMonth(c.treasurerAgent, c.coop.slug, period);
    expect(issued.issued).toBe(billed);
    const numbers = (await invoicesOf(c.coop.id, period)).map((i) => i.number);
    expect(numbers).toEqual(Array.from({ length: billed }, (_, i) => i + 1));
    // Let the worker drain this co-op's mail before the next test counts the catcher.
    await waitUntil(
      'the e-mails of the issued month',
      async () =>
        Number(
          (
            await sql<{ n: string }>(
              `SELECT count(*) AS n FROM invoices WHERE coop_id = $1 AND email_status <> 'sent'`,
              [c.coop.id],
            )
          )[0]!.n,
        ) === 0,
      240_000,
    );
  }, 420_000);

  it('invoice e-mails queued when the worker is killed are all delivered after it restarts; a repeat is only an ambiguous send, with the same Message-ID', async () => {
    const c = await makeBillingCoop({ dues: 900, members: [] });
    const tag = `m${Date.now().toString(36)}`;
    const MEMBERS = 150;
    const emails = await addMembers(c.coop.id, MEMBERS, tag);
    const period = monthsAgo(1);
    const start = await c.treasurerAgent.post(`/api/coops/${c.coop.slug}/billing/runs`).send({ period });
    await waitForRun(c.treasurerAgent, c.coop.slug, start.body.run.id as number);
    await issueMonth(c.treasurerAgent, c.coop.slug, period);
    const sent = async () =>
      Number(
        (
          await sql<{ n: string }>(`SELECT count(*) AS n FROM invoices WHERE coop_id = $1 AND email_status = 'sent'`, [
            c.coop.id,
          ])
        )[0]!.n,
      );

    await waitUntil('the first e-mails', async () => (await sent()) >= 10, 60_000);
    await killWorker();
    expect(await sent()).toBeLessThan(MEMBERS + 1);
    // What the kill left in flight: claimed, not known to be sent.
    const inFlight = await sql<{ subject: string }>(
      `SELECT subject FROM mail_sends WHERE coop_id = $1 AND state = 'sending'`,
      [c.coop.id],
    );

    await startWorker();
    await waitUntil('every e-mail', async () => (await sent()) === MEMBERS + 1, 180_000);
    const mine = (await caughtMail(`bulk-${tag}-`)).filter((m) => m.subject.includes('invoice'));
    const byAddress = new Map<string, string[]>();
    for (const m of mine) {
      const to = (m.to.match(/[^<\s]+@[^>\s]+/)?.[0] ?? m.to).toLowerCase();
      byAddress.set(to, [...(byAddress.get(to) ?? []), m.messageId]);
    }
    // Every member got their invoice, each invoice's message has its own Message-ID, and a copy
    // that arrived twice carries the same Message-ID both times (a receiver drops the repeat).
    expect(emails.filter((e) => !byAddress.has(e.toLowerCase()))).toEqual([]);
    const ids = mine.map((m) => m.messageId);
    expect(
      ids.every((id) => /^<invoice\.\d+\.g1\.[0-9a-z]+@/.test(id)),
      ids.join(' '),
    ).toBe(true);
    expect(new Set(ids).size).toBe(MEMBERS);
    for (const [to, got] of byAddress) expect(new Set(got).size, to).toBe(1);
    // The ledger: one row per invoice, all sent; a repeat happens only for a send the kill left
    // ambiguous (claimed, no "sent" recorded), and only once for each.
    const ledger = await sql<{ subject: string; state: string; tries: number }>(
      `SELECT subject, state, tries FROM mail_sends WHERE coop_id = $1 AND subject LIKE 'invoice.%'`,
      [c.coop.id],
    );
    expect(ledger.length).toBe(MEMBERS + 1);
    expect(ledger.filter((r) => r.state !== 'sent')).toEqual([]);
    const repeats = mine.length - MEMBERS;
    const retried = ledger.filter((r) => r.tries > 1).map((r) => r.subject);
    console.log(
      `[jobs-restart] ${inFlight.length} sends in flight at the kill, ${retried.length} sent again, ${repeats} repeated copies in the catcher`,
    );
    expect(retried.every((s) => inFlight.some((f) => f.subject === s))).toBe(true);
    expect(repeats).toBeLessThanOrEqual(retried.length);
    for (const [to, got] of byAddress) expect(got.length, to).toBeLessThanOrEqual(2);
  }, 300_000);
});
