import { cToF, fToC, gallonsToLiters, litersToGallons } from './conversions';
import { numberFormat } from '@/lib/intl';

/** The display units a co-op chooses: US gallons and °F, or litres and °C. Storage is always litres and °C. */
export type UnitSystem = 'us' | 'metric';

/** All unit systems, e.g. for a settings select. */
export const UNIT_SYSTEMS: readonly UnitSystem[] = ['us', 'metric'];

/**
 * Converts a stored volume (litres) to the co-op's display unit.
 * @param liters volume in litres
 * @param system the co-op's unit system
 * @returns US gallons for 'us', litres for 'metric'
 */
export function volumeFromLiters(liters: number, system: UnitSystem): number {
  return system === 'us' ? litersToGallons(liters) : liters;
}

/**
 * Converts a volume entered in the co-op's display unit back to litres for storage.
 * @param value volume in US gallons ('us') or litres ('metric')
 * @param system the co-op's unit system
 * @returns volume in litres
 */
export function volumeToLiters(value: number, system: UnitSystem): number {
  return system === 'us' ? gallonsToLiters(value) : value;
}

/**
 * Converts a stored temperature (°C) to the co-op's display unit.
 * @param tempC temperature in °C
 * @param system the co-op's unit system
 * @returns °F for 'us', °C for 'metric'
 */
export function tempFromC(tempC: number, system: UnitSystem): number {
  return system === 'us' ? cToF(tempC) : tempC;
}

/**
 * Converts a temperature entered in the co-op's display unit back to °C for storage.
 * @param value temperature in °F ('us') or °C ('metric')
 * @param system the co-op's unit system
 * @returns temperature in °C
 */
export function tempToC(value: number, system: UnitSystem): number {
  return system === 'us' ? fToC(value) : value;
}

/**
 * The short label of the volume unit.
 * @param system the co-op's unit system
 * @returns 'gal' or 'L'
 */
export function volumeLabel(system: UnitSystem): 'gal' | 'L' {
  return system === 'us' ? 'gal' : 'L';
}

/**
 * The short label of the temperature unit.
 * @param system the co-op's unit system
 * @returns '°F' or '°C'
 */
export function tempLabel(system: UnitSystem): '°F' | '°C' {
  return system === 'us' ? '°F' : '°C';
}

function formatNumber(value: number, digits: number, locale: string): string {
  // Avoid "-0" for small negative values that round to zero (e.g. −0.2 °C at 0 digits).
  const shown = Number(value.toFixed(digits)) === 0 ? 0 : value;
  return numberFormat(locale, {
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  }).format(shown);
}

/**
 * Formats a stored volume in the co-op's unit, e.g. "29.9 gal" or "113.0 L".
 * @param liters volume in litres
 * @param system the co-op's unit system
 * @param digits decimals shown (default 1)
 * @param locale BCP 47 locale for digit grouping (default 'en-US')
 * @returns the formatted volume with its unit label
 */
export function formatVolume(liters: number, system: UnitSystem, digits = 1, locale = 'en-US'): string {
  return `${formatNumber(volumeFromLiters(liters, system), digits, locale)} ${volumeLabel(system)}`;
}

/**
 * Formats a stored temperature in the co-op's unit, e.g. "131 °F" or "55 °C".
 * @param tempC temperature in °C
 * @param system the co-op's unit system
 * @param digits decimals shown (default 0)
 * @param locale BCP 47 locale (default 'en-US')
 * @returns the formatted temperature with its unit label
 */
export function formatTemp(tempC: number, system: UnitSystem, digits = 0, locale = 'en-US'): string {
  return `${formatNumber(tempFromC(tempC, system), digits, locale)} ${tempLabel(system)}`;
}
