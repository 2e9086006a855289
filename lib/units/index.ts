export {
  LITERS_PER_US_GALLON,
  MJ_PER_KWH,
  KG_PER_LB,
  litersToGallons,
  gallonsToLiters,
  fToC,
  cToF,
  kwhToMj,
  mjToKwh,
  lbToKg,
  kgToLb,
  perGallonToPerLiter,
  perLiterToPerGallon,
} from './conversions';
export {
  UNIT_SYSTEMS,
  volumeFromLiters,
  volumeToLiters,
  tempFromC,
  tempToC,
  volumeLabel,
  tempLabel,
  formatVolume,
  formatTemp,
} from './unit-system';
export type { UnitSystem } from './unit-system';
