import { z } from 'zod';
import {
  batchAdvanceSchema,
  batchCreateSchema,
  batchListSchema,
  batchRejectSchema,
  batchReleaseSchema,
  batchUpdateSchema,
  chemicalLotCreateSchema,
  chemicalLotListSchema,
  oilLotCreateSchema,
  oilLotListSchema,
  plannerSchema,
  temperatureCreateSchema,
} from '@/lib/validation/brewing';
import { operation } from '../operation';
import { batchOrSummarySchema, batchRowSchema, batchSchema, chemicalLotSchema, oilLotSchema, pageOf, plannerResultSchema, stockSummarySchema, temperatureSchema } from '../schemas';

// Brewing: supplies, the planner and batches.

const tags = ['Brewing'];
const final = { 409: 'The batch is released or rejected, or not at a step that allows this.' };
const pdf = { file: 'application/pdf' } as const;

export const operations = [
  operation({ method: 'GET', path: '/api/coops/[coop]/supplies/chemicals', summary: 'Chemical lots (methanol, catalyst …)', access: { action: 'supplies:read' }, query: chemicalLotListSchema, responses: { 200: pageOf(chemicalLotSchema) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/supplies/chemicals', summary: 'Record a chemical purchase', access: { action: 'supplies:write' }, body: chemicalLotCreateSchema, responses: { 201: chemicalLotSchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/supplies/chemicals/[id]/sds', summary: 'Download a lot\'s safety data sheet', access: { action: 'supplies:read' }, responses: { 200: pdf }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/supplies/chemicals/[id]/sds', summary: 'Upload a lot\'s safety data sheet (multipart `file`, PDF)', access: { action: 'supplies:write' }, body: 'multipart', responses: { 201: chemicalLotSchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/supplies/oil', summary: 'Oil lots', access: { action: 'supplies:read' }, query: oilLotListSchema, responses: { 200: pageOf(oilLotSchema) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/supplies/oil', summary: 'Record collected oil', access: { action: 'supplies:write' }, body: oilLotCreateSchema, responses: { 201: oilLotSchema }, tags }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/supplies/stock',
    summary: 'Chemical stock on hand, committed and available',
    access: { action: 'supplies:read' },
    responses: { 200: stockSummarySchema },
    tags,
  }),
  operation({ method: 'POST', path: '/api/coops/[coop]/planner', summary: 'Plan a batch: methanol, catalyst and costs for an oil volume (writes nothing)', access: { action: 'batches:write' }, body: plannerSchema, responses: { 200: plannerResultSchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/batches', summary: 'Batches (members and treasurers see released ones)', access: { action: 'batches:read-released' }, query: batchListSchema, responses: { 200: pageOf(batchRowSchema) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches', summary: 'Plan a new batch', access: { action: 'batches:write' }, body: batchCreateSchema, responses: { 201: batchSchema }, errors: { 409: 'Not enough stock or oil.' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/batches/[id]', summary: 'One batch (a released batch\'s summary for members and treasurers)', access: { action: 'batches:read-released' }, responses: { 200: batchOrSummarySchema }, tags }),
  operation({ method: 'PATCH', path: '/api/coops/[coop]/batches/[id]', summary: 'Edit a batch\'s records', access: { action: 'batches:write' }, body: batchUpdateSchema, responses: { 200: batchSchema }, errors: final, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches/[id]/advance', summary: 'Move a batch to its next step', access: { action: 'batches:write' }, body: batchAdvanceSchema, responses: { 200: batchSchema }, errors: final, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches/[id]/release', summary: 'Release a batch\'s fuel into a tank', access: { action: 'batches:write' }, body: batchReleaseSchema, responses: { 200: batchSchema }, errors: final, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches/[id]/reject', summary: 'Reject a batch', access: { action: 'batches:write' }, body: batchRejectSchema, responses: { 200: batchSchema }, errors: final, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches/[id]/temperatures', summary: 'Log a temperature reading', access: { action: 'batches:write' }, body: temperatureCreateSchema, responses: { 201: temperatureSchema }, errors: final, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches/[id]/temperatures/acknowledge', summary: 'Acknowledge a temperature danger alert', access: { action: 'batches:write' }, responses: { 200: z.looseObject({ acknowledged: z.literal(true) }) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/batches/[id]/files', summary: 'Attach a photo or lab report (multipart `file` + `purpose`)', access: { action: 'batches:write' }, body: 'multipart', responses: { 201: z.looseObject({}) }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/batches/[id]/files/[fileId]', summary: 'Download a batch file', access: { action: 'batches:read-all' }, responses: { 200: [{ file: 'application/pdf' }, { file: 'image/jpeg' }, { file: 'image/png' }] }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/batches/[id]/certificate', summary: 'A released batch\'s certificate (PDF)', access: { action: 'batches:read-released' }, responses: { 200: pdf }, tags }),
];
