/** One audit event as shown to admins (a plain DTO; safe for client components). */
export interface AuditRow {
  id: string;
  at: string;
  actorName: string | null;
  actorEmail: string | null;
  action: string;
  entityType: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
}
