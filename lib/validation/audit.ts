import { z } from 'zod';
import { idSchema } from './common';

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-12-01.');

/** Filters for the audit log: who (user id), what (action prefix or entity), when (from/to dates). */
export const auditQuerySchema = z
  .object({
    actor: idSchema('Choose a person.').optional(),
    action: z.string().trim().max(60, 'At most 60 characters.').optional(),
    from: day.optional(),
    to: day.optional(),
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(50),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, {
    path: ['to'],
    message: 'The end date is before the start date.',
  });
