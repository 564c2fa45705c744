import { describe, expect, it } from 'vitest';
import { displayValue, draftFromGeometry, geometryFieldOf, geometryFromDraft, geometryUnitsFor } from '@/features/fits/geometry-form';
import { formatK, formatQuantity, formatScientific } from '@/features/fits/format';

const well = { casingRadiusM: 0.0254, screenRadiusM: 0.0508, boreholeRadiusM: 0.1016, screenLengthM: 3.048, intake: 'screen' as const, anisotropyRatio: 1 };

describe('geometry fields in the site’s units', () => {
  it('shows a US site’s radii in inches and lengths in feet, without float noise', () => {
    const draft = draftFromGeometry(well, geometryUnitsFor('US'));
    expect(draft).toMatchObject({ casingRadius: '1', screenRadius: '2', boreholeRadius: '4', screenLength: '10', anisotropyRatio: '1', inFilterPack: false });
  });

  it('shows an SI site’s radii in centimetres and lengths in metres', () => {
    const draft = draftFromGeometry(well, geometryUnitsFor('SI'));
    expect(draft).toMatchObject({ casingRadius: '2.54', screenRadius: '5.08', boreholeRadius: '10.16', screenLength: '3.048' });
    expect(displayValue(0.1 + 0.2, 'm')).toBe('0.3');
  });

  it('converts what is typed back to metres exactly (1 in = 0.0254 m, 1 ft = 0.3048 m)', () => {
    const units = geometryUnitsFor('US');
    const draft = { ...draftFromGeometry(well, units), casingRadius: '2', screenLength: '5,5' };
    const { geometry, errors } = geometryFromDraft(draft, units, 'hvorslev');
    expect(errors).toEqual({});
    expect(geometry?.casingRadiusM).toBeCloseTo(0.0508, 12);
    expect(geometry?.screenLengthM).toBeCloseTo(1.6764, 12);
  });

  it('names the field that stops the engine, and asks Bouwer-Rice for Lw and D', () => {
    const units = geometryUnitsFor('SI');
    const draft = { ...draftFromGeometry(well, units), casingRadius: 'abc', screenRadius: '20' };
    const bad = geometryFromDraft(draft, units, 'hvorslev');
    expect(bad.geometry).toBeNull();
    expect(bad.errors.casingRadius).toBe('Casing radius must be a number');
    expect(bad.errors.boreholeRadius).toBe('Borehole radius must be at least the screen radius');
    const br = geometryFromDraft(draftFromGeometry(well, units), units, 'bouwer-rice');
    expect(br.errors).toEqual({ staticToScreenBottom: 'Static level to screen bottom is required', saturatedThickness: 'Saturated thickness is required' });
  });

  it('adds the filter-pack porosity only when the level moves within the pack', () => {
    const units = geometryUnitsFor('SI');
    const draft = { ...draftFromGeometry(well, units), inFilterPack: true, filterPackPorosity: '0.3' };
    expect(geometryFromDraft(draft, units, 'hvorslev').geometry?.filterPackPorosity).toBe(0.3);
    expect(geometryFromDraft({ ...draft, inFilterPack: false }, units, 'hvorslev').geometry?.filterPackPorosity).toBeUndefined();
  });

  it('maps server field names onto the fields', () => {
    expect(geometryFieldOf('geometry.screenRadiusM')).toBe('screenRadius');
    expect(geometryFieldOf('window')).toBeNull();
  });
});

describe('numbers as the workspace writes them', () => {
  it('writes K in m/s in scientific form and other units plainly (domain.md check value 9: 1 ft/d = 3.527778e−6 m/s)', () => {
    expect(formatScientific(8.64e-5)).toBe('8.64 × 10⁻⁵');
    expect(formatK(3.527778e-6, 'ft/d')).toBe('1 ft/d');
    expect(formatK(3.527778e-6, 'm/s')).toBe('3.53 × 10⁻⁶ m/s');
    expect(formatK(4.715953e-7, 'gpd/ft2')).toBe('1 gpd/ft²');
    expect(formatQuantity(0.00012)).toBe('1.20 × 10⁻⁴');
  });
});
