import { describe, expect, it } from 'vitest';
import { RATE_UNITS, rateFromSi, rateToSi } from '@shared/units/rate';

const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);

describe('pumping rate units', () => {
  it('converts US gpm with the exact US gallon of 231 in³', () => {
    // NIST SP 811, B.8: 1 US gal = 3.785411784e−3 m³ (exact), so 1 gpm = 6.30901964e−5 m³/s (derived) ±1e−12
    expect(rel(rateToSi(1, 'gpm'), 6.30901964e-5)).toBeLessThan(1e-12);
  });

  it('converts L/s and m³/d to m³/s', () => {
    expect(rateToSi(1, 'L/s')).toBe(1e-3);
    expect(rel(rateToSi(86400, 'm3/d'), 1)).toBeLessThan(1e-15);
  });

  it('returns the entered rate after a round trip in every unit', () => {
    for (const { id } of RATE_UNITS) expect(rel(rateFromSi(rateToSi(2.5, id), id), 2.5)).toBeLessThan(1e-15);
  });
});
