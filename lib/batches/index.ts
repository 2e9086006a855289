import 'server-only';
import { HttpError } from '@/lib/http';
// The batch record: plan → steps → release or reject, with its files and certificate.
export { STEPS, createBatch, updateBatch, advanceBatch, addTemperature } from './records';
export {
  getBatch, listBatches, todayIn, type BatchDto, type BatchSummaryDto, type BatchListRow, type BatchCosts, type TemperatureDto,
} from './read';
export { releaseBatch, rejectBatch } from './release';
export { planBatch, type PlannerResult, type ChemicalCoverage } from './planner';
export { addBatchFile, getBatchFile, BATCH_FILE_KINDS } from './files';
export { batchCertificate } from './certificate';
export { readUpload, fileResponse, type CheckedUpload } from './upload';
export type { ComputedPlan } from './plan';

/** A numeric id from the URL; anything else is a 404 (never a 500). */
export function idParam(value: string): number {
  const id = /^\d{1,9}$/.test(value) ? Number(value) : NaN;
  if (!Number.isSafeInteger(id) || id <= 0) throw new HttpError(404, 'Not found.');
  return id;
}
