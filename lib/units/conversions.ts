/** Litres in one US liquid gallon (231 in³), exact by definition. */
export const LITERS_PER_US_GALLON = 3.785411784; // NIST SP 811 / NIST Handbook 44 (exact)

/** Megajoules in one kilowatt-hour, exact by definition. */
export const MJ_PER_KWH = 3.6; // NIST SP 811 (exact)

/** Kilograms in one avoirdupois pound, exact by definition. */
export const KG_PER_LB = 0.45359237; // NIST SP 811 (exact)

/** Size of one Fahrenheit degree in kelvins/Celsius degrees: °C = (°F − 32) / 1.8. */
const F_PER_C_DEGREE = 1.8; // NIST SP 811 (exact)
/** Offset of the Fahrenheit scale at the ice point. */
const F_AT_ICE_POINT = 32; // NIST SP 811 (exact)

/**
 * Converts litres to US gallons.
 * @param liters volume in litres
 * @returns volume in US gallons
 */
export function litersToGallons(liters: number): number {
  return liters / LITERS_PER_US_GALLON;
}

/**
 * Converts US gallons to litres.
 * @param gallons volume in US gallons
 * @returns volume in litres
 */
export function gallonsToLiters(gallons: number): number {
  return gallons * LITERS_PER_US_GALLON;
}

/**
 * Converts degrees Fahrenheit to degrees Celsius: °C = (°F − 32) / 1.8.
 * @param tempF temperature in °F
 * @returns temperature in °C
 */
export function fToC(tempF: number): number {
  return (tempF - F_AT_ICE_POINT) / F_PER_C_DEGREE;
}

/**
 * Converts degrees Celsius to degrees Fahrenheit: °F = °C × 1.8 + 32.
 * @param tempC temperature in °C
 * @returns temperature in °F
 */
export function cToF(tempC: number): number {
  return tempC * F_PER_C_DEGREE + F_AT_ICE_POINT;
}

/**
 * Converts kilowatt-hours to megajoules.
 * @param kwh energy in kWh
 * @returns energy in MJ
 */
export function kwhToMj(kwh: number): number {
  return kwh * MJ_PER_KWH;
}

/**
 * Converts megajoules to kilowatt-hours.
 * @param mj energy in MJ
 * @returns energy in kWh
 */
export function mjToKwh(mj: number): number {
  return mj / MJ_PER_KWH;
}

/**
 * Converts pounds (avoirdupois) to kilograms.
 * @param lb mass in lb
 * @returns mass in kg
 */
export function lbToKg(lb: number): number {
  return lb * KG_PER_LB;
}

/**
 * Converts kilograms to pounds (avoirdupois).
 * @param kg mass in kg
 * @returns mass in lb
 */
export function kgToLb(kg: number): number {
  return kg / KG_PER_LB;
}

/**
 * Converts a rate per US gallon (e.g. cents per gallon) to the same rate per litre.
 * @param valuePerGallon any quantity per US gallon
 * @returns the quantity per litre (not rounded)
 */
export function perGallonToPerLiter(valuePerGallon: number): number {
  return valuePerGallon / LITERS_PER_US_GALLON;
}

/**
 * Converts a rate per litre (e.g. cents per litre) to the same rate per US gallon.
 * @param valuePerLiter any quantity per litre
 * @returns the quantity per US gallon (not rounded)
 */
export function perLiterToPerGallon(valuePerLiter: number): number {
  return valuePerLiter * LITERS_PER_US_GALLON;
}
