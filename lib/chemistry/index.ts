export * from './constants';
export { titrationAverage, trialsPhrase, DIXON_Q90, SPREAD_RETITRATE_ML } from './titration';
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
export {
  expectedYields,
  projectedFuelYield,
  YIELD_ASSUMPTIONS,
  CRUDE_GLYCERIN_FRACTION,
  IDEAL_FUEL_PER_OIL,
  YIELD_HISTORY_BATCHES,
} from './yields';
export type { ExpectedYields, FuelYieldProjection, YieldHistoryBatch } from './yields';
export { temperatureBands, altitudeNote } from './temperature';
export type { TemperatureBands, TemperatureOptions } from './temperature';
export {
  methanolBoilingPointC,
  methanolAntoineBoilingC,
  pressureAtElevationPa,
  METHANOL_ANTOINE,
  STANDARD_ATMOSPHERE,
  MAX_ELEVATION_M,
  MIN_ELEVATION_M,
} from './boiling';
