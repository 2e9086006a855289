import { z } from 'zod';
import { textSchema } from './common';

/** What a token may do: read only (GET), or read and write with its creator's role. */
export const API_TOKEN_ACCESS = ['read', 'write'] as const;

/** A new personal access token: a name to recognise it by, and its access. */
export const apiTokenCreateSchema = z.strictObject({
  name: textSchema(80, { min: 1, what: 'a name for the token' }),
  access: z.enum(API_TOKEN_ACCESS, { error: 'Choose read-only or read and write.' }),
});
