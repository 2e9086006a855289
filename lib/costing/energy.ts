import { roundHalfUp } from '../money';
import { OIL_DENSITY_G_PER_ML } from '../chemistry/constants';

/** Energy input as metered kWh. */
export interface MeteredEnergy {
  kwh: number;
  /** Electricity tariff, cents per kWh (may be fractional, e.g. 14.7). */
  tariffCentsPerKwh: number;
}

/** Energy input as heater power × time. */
export interface HeaterEnergy {
  heaterKw: number;
  hours: number;
  tariffCentsPerKwh: number;
}

export type EnergyInput = MeteredEnergy | HeaterEnergy;

/** Specific heat of vegetable oil, kJ/(kg·K) (1.7–2.2 by oil and temperature). */
export const OIL_SPECIFIC_HEAT_KJ_PER_KG_K = 2.0; // Int. J. Food Properties 11 (2008) 738–746
/** kJ in one kWh. */
const KJ_PER_KWH = 3600; // NIST SP 811 (1 kWh = 3.6 MJ exactly)

function nonNegative(value: number, name: string): number {
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be ≥ 0, got ${value}`);
  return value;
}

/**
 * Energy in kWh for either form of input (heater kW × hours, or metered kWh).
 * @param input metered kWh, or heater kW and hours
 * @returns kWh
 */
export function energyKwh(input: EnergyInput): number {
  return 'kwh' in input
    ? nonNegative(input.kwh, 'kWh')
    : nonNegative(input.heaterKw, 'Heater kW') * nonNegative(input.hours, 'Hours');
}

/**
 * Cost of the energy used by a batch: kWh × tariff, rounded to the cent (lib/money rule).
 * @param input `{ kwh, tariffCentsPerKwh }` or `{ heaterKw, hours, tariffCentsPerKwh }`
 * @returns integer cents
 */
export function energyCostCents(input: EnergyInput): number {
  return roundHalfUp(energyKwh(input) * nonNegative(input.tariffCentsPerKwh, 'Tariff'));
}

/**
 * Estimated electrical energy to heat oil (no losses counted — real heaters use more):
 * kWh = litres × 0.92 kg/L × 2.0 kJ/(kg·K) × ΔT ÷ 3600.
 * @param oilLiters oil volume, L
 * @param fromTempC starting temperature, °C
 * @param toTempC target temperature, °C
 * @returns kWh (0 when no heating is needed)
 */
export function estimateHeatingKwh(oilLiters: number, fromTempC: number, toTempC: number): number {
  nonNegative(oilLiters, 'Oil volume');
  if (!Number.isFinite(fromTempC) || !Number.isFinite(toTempC)) throw new RangeError('Temperatures must be numbers');
  const oilKg = oilLiters * OIL_DENSITY_G_PER_ML; // g/mL equals kg/L
  return (oilKg * OIL_SPECIFIC_HEAT_KJ_PER_KG_K * Math.max(0, toTempC - fromTempC)) / KJ_PER_KWH;
}
