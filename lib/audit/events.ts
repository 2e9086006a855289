import 'server-only';
import { cast, col, fn, Op, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import type { Actor } from '@/lib/auth';
import { requireCan } from '@/lib/auth/require';
import { addDays } from '@/lib/billing/periods';
import { invalidFields } from '@/lib/http';
import type { auditQuerySchema } from '@/lib/validation/audit';
import { AuditEvent, User } from '@/models';
import type { AuditEventDto } from './types';

export type { AuditEventDto };

type AuditQuery = z.infer<typeof auditQuerySchema>;

/** The instant a calendar day starts in a time zone, computed by PostgreSQL (daylight-saving aware). */
const dayStartIn = (day: string, timeZone: string) => fn('timezone', timeZone, cast(day, 'timestamp'));

/** A 'YYYY-MM-DD' the form sent that is not a day on the calendar (2026-02-31) is a 422, not a database error. */
function checkDay(field: 'from' | 'to', day: string | undefined): void {
  if (day !== undefined && addDays(day, 0) !== day)
    throw invalidFields({ [field]: ['That day is not on the calendar.'] });
}

/** The co-op's audit events matching the filters: who (user id), what (action or entity prefix), when (days in the co-op's zone). */
function eventFilter(actor: Actor, q: AuditQuery): WhereOptions<AuditEvent> {
  checkDay('from', q.from);
  checkDay('to', q.to);
  const tz = actor.coop.timezone;
  const prefix = q.action ? `${q.action.replace(/[%_\\]/g, (c) => `\\${c}`)}%` : null;
  const createdAt = {
    ...(q.from ? { [Op.gte]: dayStartIn(q.from, tz) } : {}),
    ...(q.to ? { [Op.lt]: dayStartIn(addDays(q.to, 1), tz) } : {}),
  };
  return {
    coopId: actor.coop.id,
    ...(q.actor ? { actorUserId: q.actor } : {}),
    ...(prefix ? { [Op.or]: [{ action: { [Op.iLike]: prefix } }, { entityType: { [Op.iLike]: prefix } }] } : {}),
    ...(q.from || q.to ? { createdAt } : {}),
  };
}

/**
 * The co-op's audit events, newest first, filtered by who, what and when. Dates are calendar
 * days in the co-op's time zone.
 */
export async function listAuditEvents(actor: Actor, q: AuditQuery) {
  requireCan(actor, 'audit:read');
  const where = eventFilter(actor, q);
  const [events, total] = await Promise.all([
    AuditEvent.findAll({
      attributes: ['id', 'createdAt', 'action', 'entityType', 'entityId', 'before', 'after'],
      where,
      include: [{ association: 'actor', attributes: ['name', 'email'] }],
      order: [
        ['createdAt', 'DESC'],
        ['id', 'DESC'],
      ],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
    }),
    AuditEvent.count({ where }),
  ]);
  return {
    rows: events.map<AuditEventDto>((e) => ({
      id: String(e.id),
      at: e.createdAt.toISOString(),
      actorName: e.actor?.name ?? null,
      actorEmail: e.actor?.email ?? null,
      action: e.action,
      entityType: e.entityType,
      entityId: e.entityId,
      before: e.before,
      after: e.after,
    })),
    page: q.page,
    pageSize: q.pageSize,
    total,
  };
}

/** People who appear in the co-op's audit log, for the "who" filter, by name. */
export async function listAuditActors(actor: Actor): Promise<{ id: number; name: string }[]> {
  requireCan(actor, 'audit:read');
  const people = await User.findAll({
    attributes: ['id', 'name'],
    include: [{ association: 'auditEvents', attributes: [], where: { coopId: actor.coop.id }, required: true }],
    group: [col('User.id')],
    order: [['name', 'ASC']],
    raw: true,
  });
  return people.map(({ id, name }) => ({ id, name }));
}
