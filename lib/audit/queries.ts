import 'server-only';
import { QueryTypes } from 'sequelize';
import type { z } from 'zod';
import type { Actor } from '@/lib/auth';
import { requireCan } from '@/lib/auth/require';
import { sequelize } from '@/lib/db';
import type { auditQuerySchema } from '@/lib/validation/audit';
import type { AuditRow } from './types';

export type { AuditRow };


/**
 * The co-op's audit events, newest first, filtered by who, what and when. Dates are calendar
 * days in the co-op's time zone.
 */
export async function listAuditEvents(actor: Actor, q: z.infer<typeof auditQuerySchema>) {
  requireCan(actor, 'audit:read');
  const where = ['e.coop_id = :coopId'];
  const r: Record<string, unknown> = { coopId: actor.coop.id, tz: actor.coop.timezone };
  if (q.actor) {
    where.push('e.actor_user_id = :actorId');
    r.actorId = q.actor;
  }
  if (q.action) {
    where.push(`(e.action ILIKE :action OR e.entity_type ILIKE :action)`);
    r.action = `${q.action.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
  }
  if (q.from) {
    where.push(`e.created_at >= (CAST(:from AS date)::timestamp AT TIME ZONE :tz)`);
    r.from = q.from;
  }
  if (q.to) {
    where.push(`e.created_at < ((CAST(:to AS date) + 1)::timestamp AT TIME ZONE :tz)`);
    r.to = q.to;
  }
  const whereSql = where.join(' AND ');
  const [rows, [count]] = await Promise.all([
    sequelize.query<{ id: string; created_at: Date; actor_name: string | null; actor_email: string | null; action: string; entity_type: string; entity_id: string | null; before: unknown; after: unknown }>(
      `SELECT e.id, e.created_at, u.name AS actor_name, u.email AS actor_email, e.action, e.entity_type, e.entity_id, e.before, e.after
       FROM audit_events e LEFT JOIN users u ON u.id = e.actor_user_id
       WHERE ${whereSql} ORDER BY e.created_at DESC, e.id DESC LIMIT :limit OFFSET :offset`,
      { replacements: { ...r, limit: q.pageSize, offset: (q.page - 1) * q.pageSize }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: string }>(`SELECT count(*)::text AS n FROM audit_events e WHERE ${whereSql}`, { replacements: r, type: QueryTypes.SELECT }),
  ]);
  return {
    rows: rows.map<AuditRow>((e) => ({
      id: String(e.id), at: new Date(e.created_at).toISOString(), actorName: e.actor_name, actorEmail: e.actor_email,
      action: e.action, entityType: e.entity_type, entityId: e.entity_id, before: e.before, after: e.after,
    })),
    page: q.page,
    pageSize: q.pageSize,
    total: Number(count?.n ?? 0),
  };
}

/** People who appear in the co-op's audit log, for the "who" filter. */
export async function listAuditActors(actor: Actor) {
  requireCan(actor, 'audit:read');
  return sequelize.query<{ id: number; name: string }>(
    `SELECT DISTINCT u.id, u.name FROM audit_events e JOIN users u ON u.id = e.actor_user_id WHERE e.coop_id = :coopId ORDER BY u.name`,
    { replacements: { coopId: actor.coop.id }, type: QueryTypes.SELECT },
  );
}
