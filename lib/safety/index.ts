export { SAFETY_CAUTIONS, SAFETY_DEFERENCE, safetyCautionsFor } from './cautions';
export type { SafetyCaution, SafetyTopic } from './cautions';
