import { z } from 'zod';
import { IMPORT_KINDS, importFileSchema } from '@/lib/validation/imports';
import { operation } from '../operation';
import {
  importDetailSchema,
  importPreviewSchema,
  importResultSchema,
  importSchema,
  importUndoneSchema,
} from '../schemas';

// Moving in from spreadsheets: bulk invitations and opening records from CSV.

const tags = ['Imports'];
const manage = { action: 'imports:manage' } as const;
const kind = z.object({ kind: z.enum(IMPORT_KINDS) });
const kindAndId = kind.extend({ id: z.string().regex(/^\d+$/) });
const csv = { file: 'text/csv' } as const;

export const operations = [
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/imports',
    summary: "The co-op's imports, newest first",
    access: manage,
    responses: { 200: z.object({ imports: z.array(importSchema) }) },
    tags,
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/imports/[kind]/preview',
    summary: "Each row's fate if the file were imported now (writes nothing)",
    access: manage,
    params: kind,
    body: importFileSchema,
    responses: { 200: importPreviewSchema },
    tags,
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/imports/[kind]',
    summary: 'Import the file, all or nothing',
    access: manage,
    params: kind,
    body: importFileSchema,
    responses: { 201: importResultSchema },
    errors: { 409: 'The same file was imported already.' },
    tags,
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/imports/[kind]/template',
    summary: "The CSV template for this kind, in the co-op's units and date format",
    access: manage,
    params: kind,
    responses: { 200: csv },
    tags,
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/imports/[kind]/[id]',
    summary: "One import with every row's fate and progress",
    access: manage,
    params: kindAndId,
    responses: { 200: importDetailSchema },
    tags,
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/imports/[kind]/[id]/result',
    summary: "The import's result as CSV",
    access: manage,
    params: kindAndId,
    responses: { 200: csv },
    tags,
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/imports/[kind]/[id]/undo',
    summary: 'Undo an opening import as a whole',
    access: manage,
    params: kindAndId,
    responses: { 200: importUndoneSchema },
    errors: { 409: 'Something builds on it already, or it is an invitations import.' },
    tags,
  }),
];
