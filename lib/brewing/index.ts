import 'server-only';
// The batch record: plan → steps → release or reject, with its files and certificate.
export { STEPS, createBatch, advanceBatch, addTemperature } from './records';
export { updateBatch } from './update';
export { getBatch, type BatchDto, type BatchSummaryDto, type BatchCosts, type TemperatureDto } from './read';
export { listBatches, type BatchListRow } from './list';
export { releaseBatch, rejectBatch } from './release';
export { planBatch, type PlannerResult, type ChemicalCoverage } from './planner';
export { addBatchFile, getBatchFile, BATCH_FILE_KINDS } from './files';
export { batchCertificate } from './certificate';
export { qualityOf, type BatchQuality } from './verdicts';
export { unacknowledgedDangers, acknowledgeDanger, type DangerAlert } from './danger';
export type { ComputedPlan } from './plan';
