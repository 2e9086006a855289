import { z } from 'zod';
import { IMPORT_KINDS } from '@/lib/validation/imports';
import { date, int, str } from './common';

// Imports from spreadsheets as the API sends them: the history, one import with its rows, the
// previews (invitations and opening records) and the answers to confirm and undo. lib/imports'
// DTO types are inferred from these (one definition).

export const importKind = z.enum(IMPORT_KINDS);

export const importSchema = z
  .object({
    id: int(),
    kind: importKind,
    fileName: str(),
    status: z.enum(['done', 'undone']),
    rowsTotal: int(),
    rowsImported: int(),
    rowsSkipped: int(),
    createdAt: date(),
    createdBy: str().nullable().describe('Who imported it (null once that account is gone)'),
    undoneAt: date().nullable(),
  })
  .meta({ id: 'Import', description: 'One confirmed import: who, when, file name and row counts.' });

export const importRowSchema = z.object({
  line: int().describe('The line in the file (1 = the header)'),
  fate: str().describe(
    'What became of the row (invitations: invite, member, invited, duplicate, bad-…; opening records: imported)',
  ),
  values: z.record(z.string(), z.string()).describe("The row's values as read (and `message`: what importing it did)"),
  entityId: int().nullable().describe('The record the row became, if it became one'),
  delivery: str().nullable().describe("Invitations: the e-mail's delivery now (queued, sent, not-sent)"),
  invitationStatus: str().nullable().describe('Invitations: pending, accepted or revoked'),
});

export const importDetailSchema = z
  .object({
    import: importSchema,
    rows: z.array(importRowSchema),
    progress: z
      .object({ queued: int(), sent: int(), notSent: int() })
      .nullable()
      .describe('Invitations: how many e-mails are waiting, sent, or failed every try; null for other kinds'),
  })
  .meta({ id: 'ImportDetail', description: "One import with each row's fate (invitations: delivery per row)." });

/** The standing import of the very same file (a confirm would be refused with 409). */
export const earlierImportSchema = z.object({ id: int(), createdAt: date(), createdBy: str().nullable() });

const previewFields = {
  fileName: str(),
  fileHash: str().describe("The file's SHA-256 (the same file is imported once)"),
  ignoredHeadings: z.array(str()).describe('Columns the import does not read'),
  earlierImport: earlierImportSchema.nullable().describe('This very file was imported before'),
};

export const INVITATION_FATES = [
  'invite',
  'member',
  'invited',
  'duplicate',
  'bad-email',
  'bad-role',
  'bad-name',
] as const;
export const invitationFate = z.enum(INVITATION_FATES);

export const invitationPreviewRowSchema = z.object({
  line: int(),
  name: str(),
  email: str(),
  role: str(),
  fate: invitationFate.describe('Only `invite` rows become invitations'),
  field: z.enum(['name', 'email', 'role']).nullable().describe('The field the problem is in, for refused rows'),
  message: str(),
});

export const invitationImportPreviewSchema = z
  .object({
    ...previewFields,
    rows: z.array(invitationPreviewRowSchema),
    counts: z.record(invitationFate, int()).describe('Rows per fate'),
  })
  .meta({ id: 'InvitationImportPreview' });

export const openingRowSchema = z.object({
  line: int(),
  values: z.record(z.string(), z.string()),
  errors: z.array(z.object({ field: str(), message: str() })).describe('None: the row is ready'),
  note: str().describe('What importing this row does, in words'),
});

export const openingImportPreviewSchema = z
  .object({
    ...previewFields,
    rows: z.array(openingRowSchema),
    counts: z.object({ ready: int(), errors: int() }),
  })
  .meta({ id: 'OpeningImportPreview' });

export const importPreviewSchema = z.union([invitationImportPreviewSchema, openingImportPreviewSchema]);

export const invitationImportResultSchema = z.object({ importId: int(), invited: int(), skipped: int() });
export const openingImportResultSchema = z.object({ importId: int(), imported: int() });
export const importResultSchema = z.union([invitationImportResultSchema, openingImportResultSchema]).meta({
  id: 'ImportResult',
  description: 'The import recorded: invitations sent and rows skipped, or rows imported.',
});

export const importUndoneSchema = z.object({ undone: z.literal(true), id: int() });
