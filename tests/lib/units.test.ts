import { describe, it, expect } from 'vitest';
import {
  LITERS_PER_US_GALLON,
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
  volumeFromLiters,
  volumeToLiters,
  tempFromC,
  tempToC,
  volumeLabel,
  tempLabel,
  formatVolume,
  formatTemp,
} from '@/lib/units';

describe('lib/units conversions', () => {
  it('US gallon is 3.785411784 L exactly (NIST SP 811 / NIST Handbook 44)', () => {
    expect(LITERS_PER_US_GALLON).toBe(3.785411784);
    expect(gallonsToLiters(1)).toBe(3.785411784);
    expect(litersToGallons(3.785411784)).toBe(1);
  });

  it('231 in³ = 1 US gallon: 231 × 2.54³ cm³ = 3785.411784 mL (NIST SP 811)', () => {
    expect((231 * 2.54 ** 3) / 1000).toBeCloseTo(LITERS_PER_US_GALLON, 12);
  });

  it('W1 oil: 113 L ≈ 29.85 US gal (NIST SP 811)', () => {
    expect(litersToGallons(113)).toBeCloseTo(29.85144, 5);
    expect(gallonsToLiters(litersToGallons(113))).toBeCloseTo(113, 12);
  });

  it('W7: 55 °C → 131 °F; 130 °F → 54.44 °C; 64.7 °C → 148.46 °F (NIST SP 811)', () => {
    expect(cToF(55)).toBeCloseTo(131, 10);
    expect(fToC(130)).toBeCloseTo(54.444, 3);
    expect(cToF(64.7)).toBeCloseTo(148.46, 2);
  });

  it('fixed points: 32 °F = 0 °C, 212 °F = 100 °C, −40 °F = −40 °C (NIST SP 811)', () => {
    expect(fToC(32)).toBe(0);
    expect(fToC(212)).toBeCloseTo(100, 12);
    expect(fToC(-40)).toBeCloseTo(-40, 12);
    expect(cToF(fToC(140))).toBeCloseTo(140, 12);
  });

  it('1 kWh = 3.6 MJ exactly (NIST SP 811)', () => {
    expect(kwhToMj(1)).toBe(3.6);
    expect(mjToKwh(3.6)).toBe(1);
    expect(mjToKwh(kwhToMj(12.5))).toBeCloseTo(12.5, 12);
  });

  it('1 lb = 0.45359237 kg exactly (NIST SP 811)', () => {
    expect(lbToKg(1)).toBe(0.45359237);
    expect(kgToLb(0.45359237)).toBe(1);
    // B100 7.3 lb/gal ≈ 0.88 kg/L (US DOE AFDC)
    expect(lbToKg(7.3) / LITERS_PER_US_GALLON).toBeCloseTo(0.875, 3);
  });

  it('rates: 100 ¢/L = 378.54 ¢/gal (NIST SP 811)', () => {
    expect(perLiterToPerGallon(100)).toBeCloseTo(378.5411784, 9);
    expect(perGallonToPerLiter(378.5411784)).toBeCloseTo(100, 9);
  });
});

describe('lib/units unit systems (US and metric)', () => {
  it('volume round-trips in both systems (NIST SP 811)', () => {
    expect(volumeFromLiters(3.785411784, 'us')).toBe(1);
    expect(volumeFromLiters(10, 'metric')).toBe(10);
    expect(volumeToLiters(1, 'us')).toBe(3.785411784);
    expect(volumeToLiters(10, 'metric')).toBe(10);
  });

  it('temperature round-trips in both systems (W7, NIST SP 811)', () => {
    expect(tempFromC(55, 'us')).toBeCloseTo(131, 10);
    expect(tempFromC(55, 'metric')).toBe(55);
    expect(tempToC(130, 'us')).toBeCloseTo(54.444, 3);
    expect(tempToC(55, 'metric')).toBe(55);
  });

  it('labels', () => {
    expect(volumeLabel('us')).toBe('gal');
    expect(volumeLabel('metric')).toBe('L');
    expect(tempLabel('us')).toBe('°F');
    expect(tempLabel('metric')).toBe('°C');
  });

  it('formatVolume and formatTemp show the co-op unit', () => {
    expect(formatVolume(113, 'us')).toBe('29.9 gal');
    expect(formatVolume(113, 'metric')).toBe('113.0 L');
    expect(formatVolume(3785.411784, 'metric', 0)).toBe('3,785 L');
    expect(formatVolume(378.5411784, 'us', 2)).toBe('100.00 gal');
    expect(formatTemp(55, 'us')).toBe('131 °F');
    expect(formatTemp(55, 'metric')).toBe('55 °C');
    expect(formatTemp(64.7, 'us', 1)).toBe('148.5 °F');
    expect(formatTemp(-0.2, 'metric')).toBe('0 °C');
  });
});
