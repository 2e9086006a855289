import 'server-only';
import type { Transaction } from 'sequelize';
import { requestContext } from '@/lib/request-context';
import { AuditEvent } from '@/models';

export interface AuditInput {
  coopId: number;
  actorUserId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  before?: unknown;
  after?: unknown;
}

/**
 * The personal access token the current request was authenticated by, or null (a session): what
 * every audit event records beside its actor, including those written by a statement of its own
 * (lib/tank/reservations/queries).
 */
export function auditApiTokenId(): number | null {
  return requestContext.getStore()?.apiTokenId ?? null;
}

/**
 * Appends one audit event (who, what, when, before/after) inside the caller's transaction. A
 * request authenticated by a personal access token records the token beside its creator.
 */
export async function audit(e: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEvent.create(
    {
      coopId: e.coopId,
      actorUserId: e.actorUserId,
      action: e.action,
      entityType: e.entityType,
      entityId: e.entityId == null ? null : String(e.entityId),
      before: e.before ?? null,
      after: e.after ?? null,
      apiTokenId: auditApiTokenId(),
    },
    { transaction },
  );
}
