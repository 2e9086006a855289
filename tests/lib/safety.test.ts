import { describe, it, expect } from 'vitest';
import { ALTITUDE_CAUTION, SAFETY_CAUTIONS, SAFETY_DEFERENCE, safetyCautionsFor } from '@/lib/safety';

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

describe('material and altitude cautions (NREL Biodiesel Handling and Use Guide; common practice)', () => {
  it('no aluminium, tin or zinc/galvanised vessels for lye or methoxide (common practice: lye attacks them, giving off hydrogen)', () => {
    const c = SAFETY_CAUTIONS.find((x) => x.id === 'lye-vessel-metals');
    expect(c?.text).toMatch(/aluminium, tin or zinc \(galvanised\)/);
    expect(c?.text).toMatch(/lye or methoxide/);
  });

  it('B100 attacks copper, brass, bronze, lead, tin and zinc and some elastomers (NREL Biodiesel Handling and Use Guide)', () => {
    const c = SAFETY_CAUTIONS.find((x) => x.id === 'b100-materials');
    for (const m of ['copper', 'brass', 'bronze', 'lead', 'tin', 'zinc', 'elastomers']) expect(c?.text).toContain(m);
    expect(c?.source).toBe('NREL Biodiesel Handling and Use Guide');
  });

  it('the altitude note is added after the methanol cautions, before the local-rules line (NIST WebBook Antoine; barometric formula)', () => {
    const list = safetyCautionsFor(['methanol'], { altitudeText: 'At 1,600 m methanol boils at about 59.9 °C.' });
    expect(list.map((c) => c.id)).toEqual([
      'methanol-flammable',
      'methanol-toxic',
      'methanol-vapour',
      'altitude',
      'local-rules',
    ]);
    expect(ALTITUDE_CAUTION.text).toMatch(/boils below 64\.7 °C/);
  });
});
