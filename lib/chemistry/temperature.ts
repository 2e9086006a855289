import { cToF, fToC, formatTemp, type UnitSystem } from '../units';
import { METHANOL_BOILING_POINT_C } from './constants';
import { methanolBoilingPointC } from './boiling';

/** Usual reaction range at sea level, °F (≈ 55 °C). */
export const USUAL_REACTION_MIN_F = 130; // common practice
export const USUAL_REACTION_MAX_F = 135; // common practice
/**
 * Below this the reaction is slow and may not complete, °F (48.9 °C). Common practice, with its
 * reason: the usual one-hour mix assumes ≈ 55 °C, and conversion falls off as the oil cools —
 * Freedman, Pryde & Mounts, JAOCS 61 (1984) 1638 found conversion at 32 °C lagging that at
 * 45–60 °C (from memory). A caution about speed, not about safety.
 */
export const COLD_BELOW_F = 120; // common practice (reason above)
/** Above this the app warns at sea level, °F (many brewers keep a 145 °F ceiling; 140 °F leaves 8.5 °F below boiling). */
export const WARNING_ABOVE_F = 140; // common practice

/** Tolerance so that readings converted between °F and °C compare equal at the limits. */
const TEMP_EPSILON_C = 1e-9;

/** Level of a temperature reading. */
export type TemperatureLevel = 'cold' | 'ok' | 'warning' | 'danger';

/** The temperature bands in force at an elevation, °C. */
export interface TemperatureBands {
  elevationM: number;
  /** Methanol's boiling point there (danger at or above). */
  boilingC: number;
  /** How much lower than at sea level methanol boils there, °C (0 at sea level). */
  depressionC: number;
  /** Warning above this. */
  warningAboveC: number;
  usualMinC: number;
  usualMaxC: number;
  /** Cold below this. */
  coldBelowC: number;
}

/**
 * The bands at an elevation: methanol's boiling point from the NIST Antoine equation and the
 * barometric formula ({@link methanolBoilingPointC}); the warning ceiling and the usual range
 * keep the same margins below the boiling point as at sea level (common practice sets them
 * relative to methanol's 64.7 °C), so at altitude they move down by the boiling-point
 * depression. The cold threshold stays (it is about reaction speed) unless the usual range
 * falls below it.
 * @param elevationM co-op elevation above sea level, m (default 0)
 */
export function temperatureBands(elevationM = 0): TemperatureBands {
  const boilingC = methanolBoilingPointC(elevationM);
  const depressionC = Math.max(0, METHANOL_BOILING_POINT_C - boilingC);
  const usualMinC = fToC(USUAL_REACTION_MIN_F) - depressionC;
  return {
    elevationM,
    boilingC,
    depressionC,
    warningAboveC: fToC(WARNING_ABOVE_F) - depressionC,
    usualMinC,
    usualMaxC: fToC(USUAL_REACTION_MAX_F) - depressionC,
    coldBelowC: Math.min(fToC(COLD_BELOW_F), usualMinC),
  };
}

/** Result of {@link temperatureCheck}. */
export interface TemperatureCheck {
  level: TemperatureLevel;
  /** True within the usual range (130–135 °F at sea level). */
  withinUsualRange: boolean;
  /** Methanol's boiling point used, °C. */
  boilingC: number;
  message: string;
}

/** Options for {@link temperatureCheck}. */
export interface TemperatureOptions {
  /** The co-op's elevation, m; default 0 (sea level). */
  elevationM?: number;
}

/** Formats two temperatures with just enough decimals (up to 2) that they read differently. */
function distinct(aC: number, bC: number, system: UnitSystem): [string, string] {
  for (const digits of [1, 2]) {
    const a = formatTemp(aC, system, digits);
    const b = formatTemp(bC, system, digits);
    if (a !== b || digits === 2) return [a, b];
  }
  return [formatTemp(aC, system, 2), formatTemp(bC, system, 2)];
}

/**
 * The altitude caution, shown with the temperature bands and the safety notes.
 * @param elevationM the co-op's elevation, m
 * @param system units for the text (feet and °F for 'us')
 * @returns the note, or null at or near sea level (boiling point within 0.05 °C of 64.7 °C)
 */
export function altitudeNote(elevationM: number, system: UnitSystem): string | null {
  const bands = temperatureBands(elevationM);
  if (bands.depressionC < 0.05) return null;
  const elevation =
    system === 'us'
      ? `${Math.round(elevationM / 0.3048).toLocaleString('en-US')} ft`
      : `${Math.round(elevationM).toLocaleString('en-US')} m`;
  const drop = system === 'us' ? `${(bands.depressionC * 1.8).toFixed(1)} °F` : `${bands.depressionC.toFixed(1)} °C`; // a temperature difference: 1 °C = 1.8 °F (NIST SP 811)
  return `At ${elevation} methanol boils at about ${formatTemp(bands.boilingC, system, 1)}, not ${formatTemp(METHANOL_BOILING_POINT_C, system, 1)}: boiling starts lower at altitude, so the warning and usual ranges here are ${drop} lower than at sea level.`;
}

/**
 * Compares a reaction temperature with the bands at the co-op's elevation. Never calls a
 * reading safe:
 * - 'danger' at or above methanol's boiling point there (64.7 °C / 148.5 °F at sea level, CRC
 *   Handbook; lower at altitude, NIST Antoine equation with the barometric formula);
 * - 'warning' above 140 °F (60 °C) at sea level — 140 °F itself is not a warning;
 * - 'cold' below 120 °F (48.9 °C): the reaction is slow (common practice);
 * - 'ok' otherwise, with the message saying whether it is inside the usual range.
 * @param tempC reaction temperature, °C
 * @param system unit system for the message text (default 'us')
 * @param options the co-op's elevation
 * @returns level, whether it is within the usual range, the boiling point used and a message
 */
export function temperatureCheck(
  tempC: number,
  system: UnitSystem = 'us',
  options: TemperatureOptions = {},
): TemperatureCheck {
  if (!Number.isFinite(tempC)) throw new RangeError(`Temperature must be a number, got ${tempC}`);
  const bands = temperatureBands(options.elevationM ?? 0);
  const t = (c: number) => formatTemp(c, system, system === 'us' ? 0 : 1);
  const reading = formatTemp(tempC, system, 1);
  const usual = `${t(bands.usualMinC)}–${t(bands.usualMaxC)}`;
  const where = bands.depressionC >= 0.05 ? ' at this elevation' : '';
  const withinUsualRange = tempC >= bands.usualMinC - TEMP_EPSILON_C && tempC <= bands.usualMaxC + TEMP_EPSILON_C;
  const base = { withinUsualRange, boilingC: bands.boilingC };

  if (tempC >= bands.boilingC - TEMP_EPSILON_C) {
    const boiling = formatTemp(bands.boilingC, system, 1);
    return {
      ...base,
      level: 'danger',
      message: `${reading} is at or above methanol's boiling point${where} (${boiling}): methanol boils off as flammable, toxic vapour. Far outside the usual range of ${usual}.`,
    };
  }
  if (tempC > bands.warningAboveC + TEMP_EPSILON_C) {
    const [shown, boiling] = distinct(tempC, bands.boilingC, system);
    return {
      ...base,
      level: 'warning',
      message: `${shown} is above ${t(bands.warningAboveC)}, outside the usual range of ${usual} and close to methanol's boiling point${where} (${boiling}).`,
    };
  }
  if (tempC < bands.coldBelowC - TEMP_EPSILON_C) {
    return {
      ...base,
      level: 'cold',
      message: `${reading} is below ${t(bands.coldBelowC)}, outside the usual range of ${usual}: the reaction will be slow and may be incomplete.`,
    };
  }
  const place = withinUsualRange
    ? `within the usual range of ${usual}`
    : tempC < bands.usualMinC
      ? `slightly below the usual range of ${usual}`
      : `slightly above the usual range of ${usual}`;
  return { ...base, level: 'ok', message: `${reading} is ${place}${where}.` };
}

/** Methanol's boiling point in °F (148.46 °F), for display. */
export const METHANOL_BOILING_POINT_F = cToF(METHANOL_BOILING_POINT_C); // CRC Handbook, converted per NIST SP 811
