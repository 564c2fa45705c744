import { describe, expect, it } from 'vitest';
import { K_UNITS, kFromSi, kToSi } from '@shared/units/conductivity';

const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);

describe('hydraulic conductivity units', () => {
  it('converts gpd/ft² to m/s', () => {
    // NIST SP 811 factors (derived): 1 gpd/ft² = 4.715953e−7 m/s ±1e−6 relative
    expect(rel(kToSi(1, 'gpd/ft2'), 4.715953e-7)).toBeLessThan(1e-6);
  });

  it('converts ft/d to m/s', () => {
    // NIST SP 811 factors (derived): 1 ft/d = 3.527778e−6 m/s ±1e−6 relative
    expect(rel(kToSi(1, 'ft/d'), 3.527778e-6)).toBeLessThan(1e-6);
  });

  it('converts cm/s to ft/d', () => {
    // NIST SP 811 factors (derived): 1 cm/s = 2834.646 ft/d ±1e−6 relative
    expect(rel(kFromSi(kToSi(1, 'cm/s'), 'ft/d'), 2834.646)).toBeLessThan(1e-6);
  });

  it('converts m/d to m/s', () => {
    // NIST SP 811 factors (derived): 1 m/d = 1.157407e−5 m/s ±1e−6 relative
    expect(rel(kToSi(1, 'm/d'), 1.157407e-5)).toBeLessThan(1e-6);
  });

  it('labels gpd/ft² with a superscript for select boxes', () => {
    expect(K_UNITS.find((u) => u.id === 'gpd/ft2')?.label).toBe('gpd/ft²');
    expect(K_UNITS.map((u) => u.id)).toEqual(['m/s', 'cm/s', 'm/d', 'ft/d', 'gpd/ft2']);
  });

  it('returns the entered K after a round trip through m/s in every unit', () => {
    for (const { id } of K_UNITS) expect(rel(kFromSi(kToSi(74.6, id), id), 74.6)).toBeLessThan(1e-15);
  });
});
