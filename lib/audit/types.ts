import type { z } from 'zod';
import type { auditEventSchema } from '@/lib/api/dto/core';

/** One audit event as shown to admins (a plain DTO; safe for client components): the API's AuditEvent. */
export type AuditEventDto = z.infer<typeof auditEventSchema>;
