import {
  lateLabResultSchema,
  recallReportQuerySchema,
  reviewCloseSchema,
  reviewOpenSchema,
} from '@/lib/validation/lineage';
import { operation } from '../operation';
import {
  batchLineageSchema,
  lateLabResultAnsweredSchema,
  recallReportSchema,
  reviewSchema,
  tankLayersSchema,
} from '../schemas';

// Lineage and recall: where a batch's fuel went, late lab results, reviews and their outcomes.

const tags = ['Lineage and recall'];

export const operations = [
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/batches/[id]/lineage',
    summary: "Where a batch's fuel went: tanks, draws, members, reviews",
    access: { action: 'lineage:read' },
    responses: { 200: batchLineageSchema },
    tags,
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/batches/[id]/recall-report',
    summary: "A batch's recall report (JSON, CSV or PDF by `format`)",
    access: { action: 'lineage:read' },
    query: recallReportQuerySchema,
    responses: { 200: [recallReportSchema, { file: 'text/csv' }, { file: 'application/pdf' }] },
    tags,
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/batches/[id]/lab-results',
    summary: 'Record lab results that arrived after release (a failing required property opens a review)',
    access: { action: 'batches:write' },
    body: lateLabResultSchema,
    responses: { 200: lateLabResultAnsweredSchema },
    errors: { 409: 'The batch is not released.' },
    tags,
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/batches/[id]/review',
    summary: 'Flag a released batch: its fuel is held and the members who drew it are told',
    access: { action: 'batches:write' },
    body: reviewOpenSchema,
    responses: { 201: reviewSchema },
    errors: { 409: 'The batch is not released, or already under review.' },
    tags,
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/batches/[id]/review/close',
    summary: "Close a batch's review: cleared, re-treated or disposed of",
    access: { action: 'batches:write' },
    body: reviewCloseSchema,
    responses: { 200: reviewSchema },
    errors: { 409: 'No open review, or the outcome cannot be recorded.' },
    tags,
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/tanks/[tankId]/layers',
    summary: "A tank's fuel by batch, its mixing model and what is held",
    access: { action: 'tank:read' },
    responses: { 200: tankLayersSchema },
    tags,
  }),
];
