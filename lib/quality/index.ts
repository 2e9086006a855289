export { QUALITY_LIMITS, FUEL_STANDARDS, ASTM_S500_SULFUR_MAX_PPM, limitsFor } from './limits';
export type { FuelStandard, QualityProperty, QualityLimit } from './limits';
export { evaluateQuality } from './evaluate';
export type { QualityEvaluation, QualityRowResult, QualityResults, QualityVerdict, QualityOptions } from './evaluate';
export {
  SCREENING_CAUTION,
  SOAP_MOLAR_MASS_G_PER_MOL,
  SOAP_TITRANT_NORMALITY,
  evaluateQuickTests,
  soapPpm,
} from './screening';
export type {
  QuickTestInput,
  QuickTestKey,
  QuickTestResult,
  QuickTestEvaluation,
  ScreeningStatus,
} from './screening';
