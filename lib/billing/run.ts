import 'server-only';
import { after } from 'next/server';
import type { Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { HttpError } from '@/lib/http';
import { sequelize } from '@/models';
import { exec, select } from './db';
import { assertPeriodOpen, isPeriodClosed, lockCoopBilling, periodBounds, periodClosedError } from './locks';
import { currentPeriod, periodToDate } from './periods';

/** Members per chunk; each chunk is one transaction, so a crash loses at most one chunk's work. */
export const RUN_CHUNK = 500;
/** A run whose heartbeat is older than this is taken to have died with its server. */
const STALE_AFTER_MS = 60_000;

export interface RunDTO {
  id: number;
  period: string;
  status: 'running' | 'completed' | 'failed' | 'abandoned';
  totalMembers: number;
  doneMembers: number;
  drafts: number;
  limitedToMembers: number | null;
  error: string | null;
  startedAt: string;
  finishedAt: string | null;
}

interface RunRow {
  id: number; period: string; status: RunDTO['status']; total_members: number; done_members: number; drafts: number;
  member_ids: number[] | null; error: string | null; created_at: Date; finished_at: Date | null; heartbeat_at: Date; started_by_user_id: number | null;
}

const toDto = (r: RunRow): RunDTO => ({
  id: r.id,
  period: String(r.period).slice(0, 7),
  status: r.status,
  totalMembers: r.total_members,
  doneMembers: r.done_members,
  drafts: r.drafts,
  limitedToMembers: r.member_ids ? r.member_ids.length : null,
  error: r.error,
  startedAt: new Date(r.created_at).toISOString(),
  finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
});

interface Scope {
  coopId: number;
  period: string; // 'YYYY-MM-01'
  end: Date; // first instant of the next month in the co-op's time zone
  duesCents: number;
  only: number[] | null;
}

/**
 * Who gets an invoice for the month: active members owing dues, and anyone with unbilled draws
 * up to the month's end (late-recorded ones included) or unbilled adjustments — skipping members
 * whose invoice for the month is already issued. Keyset-paged by membership id.
 */
const MEMBERS_SQL = (count: boolean) => `
  SELECT ${count ? 'count(*)::int AS n' : 'm.id'} FROM memberships m
  WHERE m.coop_id = $coopId ${count ? '' : 'AND m.id > $after'}
    AND ($only::int[] IS NULL OR m.id = ANY($only::int[]))
    AND NOT EXISTS (SELECT 1 FROM invoices i WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date
                    AND i.kind = 'invoice' AND i.status NOT IN ('draft', 'void'))
    AND (
      ($dues::bigint > 0 AND m.status = 'active' AND m.joined_at < $end::timestamptz)
      OR EXISTS (SELECT 1 FROM invoices i WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date
                 AND i.kind = 'invoice' AND i.status = 'draft')
      OR EXISTS (SELECT 1 FROM draws d WHERE d.coop_id = $coopId AND d.membership_id = m.id AND d.occurred_at < $end::timestamptz
                 AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.draw_id = d.id AND NOT l.released))
      OR EXISTS (SELECT 1 FROM billing_adjustments a WHERE a.coop_id = $coopId AND a.membership_id = m.id AND a.period <= $period::date
                 AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.adjustment_id = a.id AND NOT l.released))
    )
  ${count ? '' : 'ORDER BY m.id LIMIT $limit'}`;

const scopeBind = (s: Scope) => ({ coopId: s.coopId, period: s.period, end: s.end, dues: s.duesCents, only: s.only });

/**
 * The credit line of each draft matched by `where` (on alias i): the member's credit balance
 * applied up to the invoice's subtotal.
 */
export const creditLinesSql = (where: string) => `
  WITH sub AS (
    SELECT i.id, i.membership_id, SUM(l.amount_cents) AS s
    FROM invoices i JOIN invoice_lines l ON l.invoice_id = i.id AND l.kind <> 'credit'
    WHERE ${where}
    GROUP BY i.id, i.membership_id
  ), bal AS (
    SELECT mc.membership_id, SUM(mc.amount_cents) AS b FROM member_credits mc
    WHERE mc.coop_id = $coopId AND mc.membership_id IN (SELECT membership_id FROM sub) GROUP BY mc.membership_id
  )
  INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, amount_cents)
  SELECT $coopId, sub.id, 990000, 'credit', 'Credit on your account applied', -LEAST(bal.b, sub.s)
  FROM sub JOIN bal ON bal.membership_id = sub.membership_id
  WHERE bal.b > 0 AND sub.s > 0`;

/** Sets each draft matched by `where` (on alias i2) to the exact sum of its lines. */
export const totalsSql = (where: string) => `
  UPDATE invoices i SET total_cents = s.total, updated_at = now()
  FROM (SELECT l.invoice_id, SUM(l.amount_cents) AS total FROM invoice_lines l JOIN invoices i2 ON i2.id = l.invoice_id
        WHERE ${where} GROUP BY l.invoice_id) s
  WHERE i.id = s.invoice_id AND i.total_cents IS DISTINCT FROM s.total`;

/**
 * Builds (or rebuilds) the draft invoices of one chunk of members with set-based SQL, inside the
 * caller's transaction. Idempotent: drafts of these members are rebuilt from scratch; issued
 * invoices are never touched; a draw or adjustment already on a live invoice is skipped.
 * Lines: one per draw (its locked fuel amount; reversals negative), dues, one surcharge and one
 * road-tax line summed from the draws' locked amounts, adjustments, then credit applied.
 * @returns the number of drafts that exist for the chunk afterwards
 */
async function buildDrafts(t: Transaction, s: Scope, runId: number, ids: number[]): Promise<number> {
  const b = { coopId: s.coopId, period: s.period, ids };
  await exec(
    `DELETE FROM invoices i USING unnest($ids::int[]) AS m(id)
     WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date AND i.kind = 'invoice' AND i.status = 'draft'`,
    b,
    t,
  );
  const created = await select<{ id: number }>(
    `INSERT INTO invoices (coop_id, membership_id, period, billing_run_id, created_at, updated_at)
     SELECT $coopId, m.id, $period::date, $runId, now(), now() FROM unnest($ids::int[]) AS m(id)
     WHERE NOT EXISTS (SELECT 1 FROM invoices i WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date
                       AND i.kind = 'invoice' AND i.status <> 'void')
     RETURNING id`,
    { ...b, runId },
    t,
  );
  if (created.length === 0) return 0;
  // Every statement below finds this chunk's drafts by primary key.
  const inv = { coopId: s.coopId, period: s.period, inv: created.map((r) => r.id) };
  const inChunk = `i.id = ANY($inv::int[]) AND i.coop_id = $coopId`;

  // A line per draw up to the month's end that is not on a live invoice yet, at its locked price.
  await exec(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, occurred_at, quantity_liters, unit_price_cents_per_gallon, amount_cents, draw_id)
     SELECT $coopId, i.id, 1000 + row_number() OVER (PARTITION BY i.id ORDER BY d.occurred_at, d.id),
       CASE WHEN d.reverses_draw_id IS NULL THEN 'draw' ELSE 'draw-reversal' END,
       CASE WHEN d.reverses_draw_id IS NULL THEN 'Fuel drawn, ' || d.declared_use || ' use'
            ELSE 'Correction: reverses the draw of ' || to_char(o.occurred_at AT TIME ZONE c.timezone, 'Mon DD, YYYY') END,
       d.occurred_at, d.quantity_liters, d.unit_price_cents_per_gallon, d.fuel_cents, d.id
     FROM invoices i
     JOIN coops c ON c.id = i.coop_id
     JOIN draws d ON d.coop_id = $coopId AND d.membership_id = i.membership_id AND d.occurred_at < $end::timestamptz
     LEFT JOIN draws o ON o.id = d.reverses_draw_id
     WHERE ${inChunk} AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.draw_id = d.id AND NOT l.released)`,
    { ...inv, end: s.end },
    t,
  );
  // Surcharge and road-fuel tax: the sums of the draws' locked amounts (never recomputed).
  await exec(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, quantity_liters, unit_price_cents_per_gallon, amount_cents)
     SELECT $coopId, x.invoice_id, x.sort_key, x.kind, x.description, x.q, x.rate, x.amount FROM (
       SELECT l.invoice_id, 900010 AS sort_key, 'surcharge' AS kind, 'Co-op surcharge on fuel drawn' AS description,
              SUM(l.quantity_liters) FILTER (WHERE d.surcharge_cents <> 0) AS q,
              CASE WHEN MIN(d.surcharge_cents_per_gallon) FILTER (WHERE d.surcharge_cents <> 0) = MAX(d.surcharge_cents_per_gallon) FILTER (WHERE d.surcharge_cents <> 0)
                   THEN MIN(d.surcharge_cents_per_gallon) FILTER (WHERE d.surcharge_cents <> 0) END AS rate,
              SUM(d.surcharge_cents) AS amount
       FROM invoice_lines l JOIN draws d ON d.id = l.draw_id JOIN invoices i ON i.id = l.invoice_id
       WHERE ${inChunk} GROUP BY l.invoice_id
       UNION ALL
       SELECT l.invoice_id, 900020, 'road-tax', 'Road-fuel tax on fuel declared for road use',
              SUM(l.quantity_liters) FILTER (WHERE d.tax_cents <> 0),
              CASE WHEN MIN(d.road_tax_cents_per_gallon) FILTER (WHERE d.tax_cents <> 0) = MAX(d.road_tax_cents_per_gallon) FILTER (WHERE d.tax_cents <> 0)
                   THEN MIN(d.road_tax_cents_per_gallon) FILTER (WHERE d.tax_cents <> 0) END,
              SUM(d.tax_cents)
       FROM invoice_lines l JOIN draws d ON d.id = l.draw_id JOIN invoices i ON i.id = l.invoice_id
       WHERE ${inChunk} GROUP BY l.invoice_id
     ) x WHERE x.amount <> 0`,
    inv,
    t,
  );
  if (s.duesCents > 0) {
    await exec(
      `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, amount_cents)
       SELECT $coopId, i.id, 900000, 'dues', 'Membership dues for ' || to_char($period::date, 'FMMonth YYYY'), $dues::bigint
       FROM invoices i JOIN memberships m ON m.id = i.membership_id
       WHERE ${inChunk} AND m.status = 'active' AND m.joined_at < $end::timestamptz`,
      { ...inv, dues: s.duesCents, end: s.end },
      t,
    );
  }
  await exec(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, occurred_at, amount_cents, adjustment_id)
     SELECT $coopId, i.id, 910000 + row_number() OVER (PARTITION BY i.id ORDER BY a.id), 'adjustment', a.description, a.created_at, a.amount_cents, a.id
     FROM invoices i JOIN billing_adjustments a ON a.coop_id = $coopId AND a.membership_id = i.membership_id AND a.period <= $period::date
     WHERE ${inChunk} AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.adjustment_id = a.id AND NOT l.released)`,
    inv,
    t,
  );
  await exec(creditLinesSql(inChunk), inv, t);
  // A member with nothing left to bill (e.g. their draws went onto another month's draft) gets no invoice.
  const empty = await exec(`DELETE FROM invoices i WHERE ${inChunk} AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.invoice_id = i.id)`, inv, t);
  await exec(totalsSql('i2.id = ANY($inv::int[]) AND i2.coop_id = $coopId'), inv, t);
  return created.length - empty;
}

async function loadScope(coopId: number, periodDate: string, only: number[] | null, t?: Transaction): Promise<Scope> {
  const [coop] = await select<{ timezone: string; settings: { monthlyDuesCents?: number } | null }>(
    'SELECT timezone, settings FROM coops WHERE id = $coopId',
    { coopId },
    t,
  );
  const { end } = await periodBounds(periodDate, coop!.timezone, t);
  const dues = Number(coop!.settings?.monthlyDuesCents ?? 0);
  return { coopId, period: periodDate, end, duesCents: Number.isSafeInteger(dues) && dues > 0 ? dues : 0, only };
}

/**
 * Starts (or joins) the invoicing run for a month. Drafts are built in the background in chunks
 * after the response; progress is on the run row. A run that is still alive is returned as is
 * (a double click does not start two); one whose server died is marked abandoned and replaced —
 * re-running is always safe because every chunk is idempotent.
 */
export async function startRun(actor: Actor, input: { period: string; memberIds?: number[] }): Promise<{ run: RunDTO; started: boolean }> {
  const periodDate = periodToDate(input.period);
  if (input.period > currentPeriod(actor.coop.timezone)) {
    throw new HttpError(422, 'Some fields need attention.', { period: ['That month has not started yet.'] });
  }
  const only = input.memberIds?.length ? [...new Set(input.memberIds)] : null;
  const result = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, actor.coop.id);
    await assertPeriodOpen(actor.coop.id, periodDate, t);
    if (only) {
      const found = await select<{ id: number }>('SELECT id FROM memberships WHERE coop_id = $coopId AND id = ANY($ids::int[])', { coopId: actor.coop.id, ids: only }, t);
      if (found.length !== only.length) throw new HttpError(422, 'Some fields need attention.', { memberIds: ['Choose members of this co-op.'] });
    }
    const [running] = await select<RunRow>(
      `SELECT * FROM billing_runs WHERE coop_id = $coopId AND period = $period::date AND status = 'running' FOR UPDATE`,
      { coopId: actor.coop.id, period: periodDate },
      t,
    );
    if (running) {
      if (Date.now() - new Date(running.heartbeat_at).getTime() < STALE_AFTER_MS) return { run: running, started: false };
      await exec(`UPDATE billing_runs SET status = 'abandoned', finished_at = now(), updated_at = now() WHERE id = $id`, { id: running.id }, t);
      await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'billing.run.abandon', entityType: 'billing_run', entityId: running.id, before: { status: 'running', doneMembers: running.done_members } }, t);
    }
    const scope = await loadScope(actor.coop.id, periodDate, only, t);
    const [count] = await select<{ n: number }>(MEMBERS_SQL(true), scopeBind(scope), t);
    const [run] = await select<RunRow>(
      `INSERT INTO billing_runs (coop_id, period, member_ids, total_members, started_by_user_id) VALUES ($coopId, $period::date, $only::int[], $total, $userId) RETURNING *`,
      { coopId: actor.coop.id, period: periodDate, only, total: count?.n ?? 0, userId: actor.user.id },
      t,
    );
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'billing.run.start', entityType: 'billing_run', entityId: run!.id, after: { period: input.period, totalMembers: run!.total_members, memberIds: only } }, t);
    return { run: run!, started: true };
  });
  if (result.started) after(() => processRun(actor.coop.id, result.run.id));
  return { run: toDto(result.run), started: result.started };
}

/**
 * Works through a run chunk by chunk (each chunk its own transaction under the co-op's billing
 * lock) until no member is left, then marks it completed. Any failure marks it failed with the
 * message; the treasurer may simply start it again.
 */
export async function processRun(coopId: number, runId: number): Promise<void> {
  let afterId = 0;
  try {
    for (;;) {
      const stop = await sequelize.transaction(async (t) => {
        await lockCoopBilling(t, coopId);
        const [run] = await select<RunRow>(`SELECT * FROM billing_runs WHERE id = $id AND coop_id = $coopId FOR UPDATE`, { id: runId, coopId }, t);
        if (!run || run.status !== 'running') return true;
        const periodDate = String(run.period).slice(0, 10);
        if (await isPeriodClosed(coopId, periodDate, t)) throw periodClosedError(periodDate);
        const scope = await loadScope(coopId, periodDate, run.member_ids, t);
        const ids = (await select<{ id: number }>(MEMBERS_SQL(false), { ...scopeBind(scope), after: afterId, limit: RUN_CHUNK }, t)).map((r) => r.id);
        if (ids.length === 0) {
          const [drafts] = await select<{ n: number }>(
            `SELECT count(*)::int AS n FROM invoices WHERE coop_id = $coopId AND period = $period::date AND kind = 'invoice' AND status = 'draft'`,
            { coopId, period: periodDate },
            t,
          );
          await exec(
            `UPDATE billing_runs SET status = 'completed', finished_at = now(), heartbeat_at = now(), updated_at = now(), drafts = $drafts,
               total_members = GREATEST(total_members, done_members), done_members = GREATEST(total_members, done_members) WHERE id = $id`,
            { id: runId, drafts: drafts?.n ?? 0 },
            t,
          );
          await audit({ coopId, actorUserId: run.started_by_user_id, action: 'billing.run.complete', entityType: 'billing_run', entityId: runId, after: { period: periodDate.slice(0, 7), members: run.done_members, drafts: drafts?.n ?? 0 } }, t);
          return true;
        }
        const drafts = await buildDrafts(t, scope, runId, ids);
        await exec(
          `UPDATE billing_runs SET done_members = done_members + $n, total_members = GREATEST(total_members, done_members + $n),
             drafts = drafts + $drafts, heartbeat_at = now(), updated_at = now() WHERE id = $id`,
          { id: runId, n: ids.length, drafts },
          t,
        );
        afterId = ids[ids.length - 1]!;
        return false;
      });
      if (stop) return;
    }
  } catch (e) {
    console.error(`[billing] run ${runId} failed:`, e);
    const message = e instanceof HttpError ? e.message : 'The run stopped on an unexpected error; start it again to continue (finished members are kept).';
    await exec(`UPDATE billing_runs SET status = 'failed', error = $message, finished_at = now(), updated_at = now() WHERE id = $id AND status = 'running'`, { id: runId, message }).catch(() => {});
  }
}

/** One run of the co-op (404 for another co-op's). */
export async function getRun(actor: Actor, runId: number): Promise<RunDTO> {
  const [run] = await select<RunRow>('SELECT * FROM billing_runs WHERE id = $id AND coop_id = $coopId', { id: runId, coopId: actor.coop.id });
  if (!run) throw new HttpError(404, 'Run not found.');
  return toDto(run);
}

/** The latest run of a month, if any. */
export async function latestRun(coopId: number, periodDate: string): Promise<RunDTO | null> {
  const [run] = await select<RunRow>(
    'SELECT * FROM billing_runs WHERE coop_id = $coopId AND period = $period::date ORDER BY id DESC LIMIT 1',
    { coopId, period: periodDate },
  );
  return run ? toDto(run) : null;
}

