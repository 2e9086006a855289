import type { InferAttributes } from 'sequelize';
import type { AuditEvent } from '@/models/AuditEvent';

/** One audit event as shown to admins (a plain DTO; safe for client components). */
export type AuditEventDto = Pick<InferAttributes<AuditEvent>, 'action' | 'entityType' | 'entityId' | 'before' | 'after'> & {
  /** The BIGINT id, as the string it arrives as. */
  id: string;
  /** When, as an ISO instant. */
  at: string;
  actorName: string | null;
  actorEmail: string | null;
};
