import { describe, expect, it } from 'vitest';
import { LENGTH_UNITS, isLengthUnit, lengthFromSi, lengthSeriesToSi, lengthToSi } from '@shared/units/length';

describe('length units', () => {
  it('converts the foot and the inch with their exact definitions', () => {
    // NIST SP 811, B.8: 1 ft = 0.3048 m and 1 in = 0.0254 m exactly (common practice: exact)
    expect(lengthToSi(1, 'ft')).toBe(0.3048);
    expect(lengthToSi(1, 'in')).toBe(0.0254);
    // 12 in = 1 ft to the last binary digit of 0.3048 (exact definitions, ±1 ulp)
    expect(Math.abs(lengthToSi(12, 'in') - 0.3048)).toBeLessThanOrEqual(Number.EPSILON * 0.3048);
  });

  it('converts metric lengths by powers of ten', () => {
    expect(lengthToSi(254, 'cm')).toBeCloseTo(2.54, 15);
    expect(lengthToSi(25.4, 'mm')).toBeCloseTo(0.0254, 15);
  });

  it('returns the entered value after a round trip through SI in every unit', () => {
    for (const { id } of LENGTH_UNITS) expect(lengthFromSi(lengthToSi(13.99, id), id)).toBeCloseTo(13.99, 12);
  });

  it('converts a whole series into a Float64Array', () => {
    const out = lengthSeriesToSi([1, 2, 10], 'ft');
    expect(out).toBeInstanceOf(Float64Array);
    expect(Array.from(out)).toEqual([0.3048, 0.6096, 3.048]);
  });

  it('offers every unit to a select box and recognises its ids', () => {
    expect(LENGTH_UNITS.map((u) => u.id)).toEqual(['m', 'cm', 'mm', 'ft', 'in']);
    expect(isLengthUnit('ft')).toBe(true);
    expect(isLengthUnit('yd')).toBe(false);
  });

  it('refuses an unknown unit, naming it', () => {
    expect(() => lengthToSi(1, 'yd' as never)).toThrow('lengthUnit: unknown unit "yd"');
  });
});
