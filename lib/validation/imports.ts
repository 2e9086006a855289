import { z } from 'zod';
import { textSchema } from './common';

// Imports from spreadsheets (CSV). Shared by the import screen and the route handlers.

/** The kinds of import, as they appear in the URL (/imports/[kind]). */
export const IMPORT_KINDS = [
  'invitations',
  'opening-balances',
  'opening-tank',
  'opening-supplies',
  'past-batches',
] as const;
export type ImportKindName = (typeof IMPORT_KINDS)[number];
export const importKindSchema = z.enum(IMPORT_KINDS, { error: 'Unknown kind of import.' });

/** The most text one upload may hold (the JSON body limit is 256 kB). */
export const MAX_CSV_CHARS = 200_000;

/**
 * A file to preview or import: its name (for the audit and the history) and its text, read in the
 * browser from a chosen file or pasted rows. The same body previews (writes nothing) and confirms.
 */
export const importFileSchema = z.strictObject({
  fileName: textSchema(255, { min: 1, what: 'a file name' }),
  csv: z
    .string({ error: 'Choose a CSV file or paste rows.' })
    .min(1, 'Choose a CSV file or paste rows.')
    .max(MAX_CSV_CHARS, `At most ${MAX_CSV_CHARS.toLocaleString('en-US')} characters: split the file.`),
});
export type ImportFileInput = z.infer<typeof importFileSchema>;
