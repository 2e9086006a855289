export * from './constants';
export { titrationAverage, OUTLIER_MIN_DIFFERENCE_ML, OUTLIER_RELATIVE_DIFFERENCE } from './titration';
export type { TitrationAverage } from './titration';
export { catalystGrams, convertCatalystGrams, assertPurityPct } from './catalyst';
export type { CatalystInput, CatalystResult, CatalystRule, TitrantSource } from './catalyst';
export {
  methanolLiters,
  methanolLitersByPercent,
  methanolLitersByMolarRatio,
  molarRatioFromPercent,
  percentFromMolarRatio,
  DEFAULT_METHANOL_PERCENT,
  UNKNOWN_FEEDSTOCK_METHANOL_PERCENT,
  STOICHIOMETRIC_MOLAR_RATIO,
  USUAL_MOLAR_RATIO,
} from './methanol';
export type { OilProperties } from './methanol';
export {
  acidNumber,
  ffaPercentFromAcidNumber,
  kohEquivalentTitrationMl,
  oilQualityBand,
  ACID_NUMBER_PER_FFA_PERCENT,
  MAX_FFA_PERCENT_SINGLE_STAGE,
  OIL_QUALITY_BAND_LIMITS_ML,
} from './acid-number';
export type { AcidNumberInput, OilQualityAssessment, OilQualityBand } from './acid-number';
export {
  temperatureCheck,
  USUAL_REACTION_MIN_F,
  USUAL_REACTION_MAX_F,
  COLD_BELOW_F,
  WARNING_ABOVE_F,
  METHANOL_BOILING_POINT_F,
} from './temperature';
export type { TemperatureCheck, TemperatureLevel } from './temperature';
export { expectedYields, YIELD_ASSUMPTIONS } from './yields';
export type { ExpectedYields } from './yields';
