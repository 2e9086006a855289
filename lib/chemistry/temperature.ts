import { cToF, fToC, formatTemp, type UnitSystem } from '../units';
import { METHANOL_BOILING_POINT_C } from './constants';

/** Usual reaction range, °F (≈ 55 °C). */
export const USUAL_REACTION_MIN_F = 130; // common practice
export const USUAL_REACTION_MAX_F = 135; // common practice
/** Below this the reaction is slow and may not complete, °F. */
export const COLD_BELOW_F = 120; // common practice
/** Above this the app warns, °F (many brewers keep a 145 °F ceiling). */
export const WARNING_ABOVE_F = 140; // common practice

/** Tolerance so that readings converted between °F and °C compare equal at the limits. */
const TEMP_EPSILON_C = 1e-9;

/** Level of a temperature reading. */
export type TemperatureLevel = 'cold' | 'ok' | 'warning' | 'danger';

/** Result of {@link temperatureCheck}. */
export interface TemperatureCheck {
  level: TemperatureLevel;
  /** True within the usual 130–135 °F (54.4–57.2 °C) range. */
  withinUsualRange: boolean;
  message: string;
}

/**
 * Compares a reaction temperature with the usual range. Never calls a reading safe:
 * - 'danger' at or above methanol's boiling point, 64.7 °C / 148.5 °F (CRC Handbook);
 * - 'warning' above 140 °F (60 °C) — 140 °F itself is not a warning;
 * - 'cold' below 120 °F (48.9 °C): the reaction is slow (common practice);
 * - 'ok' otherwise, with the message saying whether it is inside 130–135 °F.
 * @param tempC reaction temperature, °C
 * @param system unit system for the message text (default 'us')
 * @returns level, whether it is within the usual range, and a message
 */
export function temperatureCheck(tempC: number, system: UnitSystem = 'us'): TemperatureCheck {
  if (!Number.isFinite(tempC)) throw new RangeError(`Temperature must be a number, got ${tempC}`);
  const t = (c: number) => formatTemp(c, system, system === 'us' ? 0 : 1);
  const reading = formatTemp(tempC, system, 1);
  const usualMinC = fToC(USUAL_REACTION_MIN_F);
  const usualMaxC = fToC(USUAL_REACTION_MAX_F);
  const usual = `${t(usualMinC)}–${t(usualMaxC)}`;
  const boiling = formatTemp(METHANOL_BOILING_POINT_C, system, 1);
  const withinUsualRange = tempC >= usualMinC - TEMP_EPSILON_C && tempC <= usualMaxC + TEMP_EPSILON_C;

  if (tempC >= METHANOL_BOILING_POINT_C - TEMP_EPSILON_C) {
    return {
      level: 'danger',
      withinUsualRange,
      message: `${reading} is at or above methanol's boiling point (${boiling}): methanol boils off as flammable, toxic vapour. Far outside the usual range of ${usual}.`,
    };
  }
  if (tempC > fToC(WARNING_ABOVE_F) + TEMP_EPSILON_C) {
    return {
      level: 'warning',
      withinUsualRange,
      message: `${reading} is above ${t(fToC(WARNING_ABOVE_F))}, outside the usual range of ${usual} and close to methanol's boiling point (${boiling}).`,
    };
  }
  if (tempC < fToC(COLD_BELOW_F) - TEMP_EPSILON_C) {
    return {
      level: 'cold',
      withinUsualRange,
      message: `${reading} is below ${t(fToC(COLD_BELOW_F))}, outside the usual range of ${usual}: the reaction will be slow and may be incomplete.`,
    };
  }
  const where = withinUsualRange
    ? `within the usual range of ${usual}`
    : tempC < usualMinC
      ? `slightly below the usual range of ${usual}`
      : `slightly above the usual range of ${usual}`;
  return { level: 'ok', withinUsualRange, message: `${reading} is ${where}.` };
}

/** Methanol's boiling point in °F (148.46 °F), for display. */
export const METHANOL_BOILING_POINT_F = cToF(METHANOL_BOILING_POINT_C); // CRC Handbook, converted per NIST SP 811
