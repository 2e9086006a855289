export { SAFETY_CAUTIONS, SAFETY_DEFERENCE, ALTITUDE_CAUTION, safetyCautionsFor } from './cautions';
export type { SafetyCaution, SafetyTopic } from './cautions';
export { RECALL_CAUTIONS, RECALL_DEFERENCE } from './recall';
