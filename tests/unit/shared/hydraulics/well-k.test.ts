import { describe, expect, it } from 'vitest';
import { wellK } from '@shared/hydraulics/well-k';

describe('Well K', () => {
  it('is the geometric mean of the fits with count and log10 spread', () => {
    // Freeze (1975): K is log-normal, so the mean is taken of log10 K (derived: 1e−4 and 1e−6 → 1e−5 m/s ±1e−12 relative)
    const w = wellK([1e-4, 1e-6]);
    expect(Math.abs(w.kMetersPerSecond / 1e-5 - 1)).toBeLessThan(1e-12);
    expect(w.count).toBe(2);
    expect(w.log10Mean).toBeCloseTo(-5, 12);
    // sample standard deviation of −4 and −6 is √2 (derived)
    expect(w.log10StdDev).toBeCloseTo(Math.SQRT2, 12);
    expect(w.reference).toContain('Freeze (1975)');
  });

  it('reports no spread for a single fit', () => {
    const w = wellK(Float64Array.of(3.2e-6));
    expect(w.kMetersPerSecond).toBeCloseTo(3.2e-6, 18);
    expect(w.log10StdDev).toBeNull();
  });

  it('refuses an empty set and a non-positive K', () => {
    expect(() => wellK([])).toThrow('kValues: is empty; Well K needs at least one fit');
    expect(() => wellK([1e-5, 0])).toThrow('kValues: value 2 (0) must be a positive K in m/s');
  });
});
