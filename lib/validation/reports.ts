import { z } from 'zod';

/** A calendar quarter: ?year=2026&quarter=4 */
export const quarterQuerySchema = z.object({
  year: z.coerce
    .number({ error: 'Give a year.' })
    .int('A whole year.')
    .min(2000, 'From 2000.')
    .max(2100, 'Up to 2100.'),
  quarter: z.coerce.number({ error: 'Give a quarter.' }).int().min(1, 'Quarter 1 to 4.').max(4, 'Quarter 1 to 4.'),
});

/** The quarterly report's query: the quarter and the answer's format. */
export const quarterlyReportQuerySchema = quarterQuerySchema.extend({
  format: z.enum(['json', 'csv', 'pdf']).default('json'),
});
