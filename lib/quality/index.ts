export { QUALITY_LIMITS, limitsFor } from './limits';
export { ASTM_S500_SULFUR_MAX_PPM } from './astm-d6751';
export { QUALITY_PROPERTIES, FUEL_STANDARDS } from './standards';
export type { FuelStandard, QualityProperty, QualityLimit, AstmGrade } from './standards';
export { evaluateQuality, isLaboratoryResult, storedVerdictText, HOME_TEST_LABORATORY } from './evaluate';
export type {
  QualityEvaluation,
  QualityRowResult,
  QualityResults,
  QualityVerdict,
  QualityOptions,
  LabResult,
  StandardVerdict,
} from './evaluate';
export {
  SCREENING_CAUTION,
  SOAP_MOLAR_MASS_G_PER_MOL,
  SOAP_TITRANT_NORMALITY,
  SOAP_ATTENTION_PPM,
  ALKALI_METAL_MOLAR_MASS_G_PER_MOL,
  ASTM_NA_K_MAX_PPM,
  evaluateQuickTests,
  soapPpm,
} from './screening';
export type { QuickTestInput, QuickTestKey, QuickTestResult, QuickTestEvaluation, ScreeningStatus } from './screening';
export { formatQualityValue, formatQualityLimit } from './format';
