import { describe, it, expect } from 'vitest';
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE, safetyCautionsFor } from '@/lib/safety';

describe('safety cautions (REFERENCES.md "Safety cautions to show"; university extension safety guides)', () => {
  it('covers methanol, lye, protective equipment, rags and waste', () => {
    const text = SAFETY_CAUTIONS.map((c) => c.text).join(' ');
    for (const phrase of [
      'nearly invisible flame',
      'blindness',
      'heavier than air',
      'bond and ground',
      'caustic',
      'closed vessel',
      'face shield',
      'eyewash',
      'children and pets',
      'flammable liquids',
      'closed metal cans',
      'never pour them down drains',
    ]) {
      expect(text).toContain(phrase);
    }
  });

  it('ends with deference to local fire codes, chemical-storage rules and licensed practice', () => {
    expect(SAFETY_CAUTIONS.at(-1)?.text).toBe(SAFETY_DEFERENCE);
    expect(SAFETY_DEFERENCE).toContain('local fire codes, chemical-storage rules and licensed practice');
  });

  it('methanol figures match the NIOSH Pocket Guide / CRC Handbook (flash 11–12 °C; 6.0–36.5 % in air)', () => {
    const flammable = SAFETY_CAUTIONS.find((c) => c.id === 'methanol-flammable');
    expect(flammable?.text).toContain('11–12 °C');
    expect(flammable?.text).toContain('6.0–36.5 %');
  });

  it('never says "safe"', () => {
    for (const c of SAFETY_CAUTIONS) expect(c.text.toLowerCase()).not.toMatch(/\bsafe\b|safely/);
  });

  it('a topic subset always keeps the local-rules line last', () => {
    const lye = safetyCautionsFor(['lye']);
    expect(lye.map((c) => c.id)).toEqual(['lye-caustic', 'local-rules']);
    expect(safetyCautionsFor()).toHaveLength(SAFETY_CAUTIONS.length);
  });
});
