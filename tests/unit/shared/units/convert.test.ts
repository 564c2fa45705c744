import { describe, expect, it } from 'vitest';
import { SI_UNIT, UNIT_OPTIONS, fromSi, toSi } from '@shared/units/convert';

describe('converting any quantity through one entry point', () => {
  it('converts each quantity with its own factors', () => {
    // NIST SP 811 (exact): 1 ft = 0.3048 m; (derived) 1 ft/d = 3.527778e−6 m/s ±1e−6 relative
    expect(toSi('length', 1, 'ft')).toBe(0.3048);
    expect(toSi('time', 2, 'h')).toBe(7200);
    expect(Math.abs(toSi('k', 1, 'ft/d') / 3.527778e-6 - 1)).toBeLessThan(1e-6);
    expect(toSi('rate', 1, 'L/s')).toBe(1e-3);
    expect(toSi('pressure', 1, 'mH2O', 1000)).toBeCloseTo(9806.65, 9);
  });

  it('returns the entered value after a round trip in every unit of every quantity', () => {
    for (const quantity of Object.keys(UNIT_OPTIONS) as (keyof typeof UNIT_OPTIONS)[]) {
      for (const { id } of UNIT_OPTIONS[quantity]) {
        const back = fromSi(quantity, toSi(quantity, 2.5, id as never, 1000), id as never, 1000);
        expect(Math.abs(back / 2.5 - 1)).toBeLessThan(1e-15);
      }
    }
  });

  it('offers each quantity’s SI unit among its options', () => {
    for (const quantity of Object.keys(SI_UNIT) as (keyof typeof SI_UNIT)[]) {
      expect(UNIT_OPTIONS[quantity].map((u) => u.id)).toContain(SI_UNIT[quantity]);
      expect(toSi(quantity, 3, SI_UNIT[quantity] as never)).toBe(3);
    }
  });
});
