import { z } from 'zod';
import { QUALITY_PROPERTIES } from '@/lib/quality';
import { labValue } from './brewing';
import { idSchema } from './common';

// Batch reviews (recalls) and late lab results, shared by the forms and the route handlers.

const text = (max: number) => z.string({ error: 'Enter some text.' }).trim().max(max, `At most ${max} characters.`);

/** A late laboratory result on a released batch: one or more properties with their provenance. */
export const lateLabResultSchema = z.strictObject({
  labResults: z
    .partialRecord(z.enum(QUALITY_PROPERTIES), labValue.unwrap())
    .refine((r) => Object.keys(r).length > 0, 'Enter at least one result.'),
});

/** A brewer or admin puts a released batch under review with what was found. */
export const reviewOpenSchema = z.strictObject({
  finding: text(2000).min(5, 'Say what was found (at least 5 characters).'),
});

export const REVIEW_OUTCOMES = ['cleared', 'retreated', 'disposed'] as const;

/** The outcome that closes a review. A disposal names its method and an uploaded receipt; a re-treatment its new batch. */
export const reviewCloseSchema = z
  .strictObject({
    outcome: z.enum(REVIEW_OUTCOMES, { error: 'Choose cleared, re-treated or disposed of.' }),
    notes: text(2000).min(5, 'Say why (at least 5 characters), e.g. the re-test result.'),
    disposalMethod: text(500).optional(),
    receiptFileId: idSchema('Upload the disposal receipt and choose it.').optional(),
    retreatBatchId: idSchema('Choose the batch that re-treats the fuel.').optional(),
  })
  .superRefine((v, ctx) => {
    if (v.outcome === 'disposed' && !(v.disposalMethod && v.disposalMethod.length >= 3)) {
      ctx.addIssue({
        code: 'custom',
        path: ['disposalMethod'],
        message: 'Say how the fuel was disposed of (e.g. licensed waste-oil collector).',
      });
    }
    if (v.outcome === 'disposed' && v.receiptFileId === undefined)
      ctx.addIssue({ code: 'custom', path: ['receiptFileId'], message: 'Upload the disposal receipt and choose it.' });
    if (v.outcome === 'retreated' && v.retreatBatchId === undefined)
      ctx.addIssue({ code: 'custom', path: ['retreatBatchId'], message: 'Choose the batch that re-treats the fuel.' });
  });

/** Recall report format. */
export const recallReportQuerySchema = z.strictObject({ format: z.enum(['json', 'csv', 'pdf']).optional() });
