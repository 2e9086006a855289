import 'server-only';
export {
  getBatchLineage,
  listTankLayers,
  drawBatches,
  recallNoticesFor,
  type BatchLineage,
  type LineageDraw,
  type LineageMember,
  type RecallNotice,
  type ReviewDto,
  type TankLayersDto,
} from './read';
export { flagBatch, recordLateLabResult, closeReview } from './reviews';
export { getRecallReport, recallCsv, recallPdf, type RecallReport } from './report';
