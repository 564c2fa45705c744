import { describe, expect, it } from 'vitest';
import { casingRadiusForFlow, effectiveCasingRadius } from '@shared/hydraulics/geometry';

describe('effective casing radius', () => {
  it('combines casing and filter pack by porosity', () => {
    // derived from Bouwer & Rice (1976); ASTM D5912: rc = 0.0254, rw = 0.1016 m, n = 0.30 → 0.05957 m ±5e−6 m
    const r = effectiveCasingRadius(0.0254, 0.1016, 0.3);
    expect(Math.abs(r.radiusM - 0.05957)).toBeLessThan(5e-6);
    expect(r.reference).toContain('(1 − n) rc² + n rw²');
  });

  it('is used only when a filter-pack porosity is given', () => {
    expect(casingRadiusForFlow({ casingRadiusM: 0.0254, screenRadiusM: 0.1016, screenLengthM: 3 })).toEqual({ radiusM: 0.0254, effective: false });
    const inPack = casingRadiusForFlow({ casingRadiusM: 0.0254, screenRadiusM: 0.0254, boreholeRadiusM: 0.1016, screenLengthM: 3, filterPackPorosity: 0.3 });
    expect(inPack.effective).toBe(true);
    expect(inPack.radiusM).toBeCloseTo(0.05957, 5);
  });

  it('refuses a porosity outside 0–1', () => {
    expect(() => effectiveCasingRadius(0.0254, 0.1016, 1.2)).toThrow('geometry.filterPackPorosity: must lie between 0 and 1, exclusive (got 1.2)');
  });
});
