import { describe, expect, it } from 'vitest';
import { guessMapping, parseCellNumber, requiredImportFields, rowToWellInput, importSettingsSchema } from '@shared/schemas/well-import';
import {
  displayLengthUnit,
  roundForInput,
  wellConstructionToSi,
  wellFormSchemaFor,
  wellInputSchema,
  wellPatchSchema,
  type WellFields,
} from '@shared/schemas/wells';

const m = (value: number) => ({ value, unit: 'm' as const });
const valid: WellFields = {
  name: 'MW-1',
  coordinates: { kind: 'epsg', epsg: 32632, x: 512000, y: 5290000 },
  groundElevation: m(100),
  measuringPointElevation: m(100.75),
  screenReference: 'depth',
  screenTop: m(3),
  screenBottom: m(6),
  casingRadius: m(0.0254),
  screenRadius: m(0.0254),
  boreholeRadius: m(0.1016),
  filterPackPorosity: 0.3,
  hydroUnit: 'Sand',
  aquiferCondition: 'unconfined',
  saturatedThickness: m(10),
  staticWaterDepth: m(2.75),
  staticToScreenBottom: null,
};

const fieldsOf = (input: unknown, schema: typeof wellInputSchema = wellInputSchema) => {
  const r = schema.safeParse(input);
  return r.success ? {} : Object.fromEntries(r.error.issues.map((i) => [i.path.join('.'), i.message]));
};

describe('well input schema', () => {
  it('accepts a plausible 2-inch well and fills status and notes', () => {
    const r = wellInputSchema.parse(valid);
    expect(r.status).toBe('active');
    expect(r.notes).toBe('');
  });

  it('converts to SI with both depths and elevations of the screen, and derives Lw', () => {
    const c = wellConstructionToSi(wellInputSchema.parse({ ...valid, screenTop: { value: 10, unit: 'ft' }, screenBottom: { value: 20, unit: 'ft' } }));
    // 1 ft = 0.3048 m exactly (NIST SP 811).
    expect(c.screenTopDepthM).toBe(3.048);
    expect(c.screenBottomDepthM).toBe(6.096);
    expect(c.screenTopElevationM).toBeCloseTo(96.952, 12);
    expect(c.screenBottomElevationM).toBeCloseTo(93.904, 12);
    // Water at 100.75 − 2.75 = 98 m, screen bottom at 93.904 m: Lw = 4.096 m.
    expect(c.staticToScreenBottomM).toBeCloseTo(4.096, 12);
  });

  it.each([
    [{ screenBottom: m(2) }, 'screenBottom', 'Screen bottom must be below the screen top (a greater depth)'],
    [{ casingRadius: m(0) }, 'casingRadius', 'Casing radius must be greater than zero'],
    [{ boreholeRadius: m(0.02) }, 'boreholeRadius', 'Borehole radius must be at least the screen radius'],
    [{ filterPackPorosity: 1.2 }, 'filterPackPorosity', 'Filter-pack porosity must be between 0 and 1 (exclusive)'],
    [{ measuringPointElevation: m(96) }, 'measuringPointElevation', 'Measuring point (top of casing) must be within 1 m below to 3 m above the ground surface; it is 4 m below it'],
    [{ screenReference: 'elevation', screenTop: m(100.5), screenBottom: m(95) }, 'screenTop', 'Screen top must be at or below the ground surface (0.5 m above it)'],
    [{ staticWaterDepth: m(7) }, 'staticWaterDepth', 'Static water level must be above the screen bottom (the screen would be dry)'],
    [{ saturatedThickness: m(2) }, 'saturatedThickness', 'Saturated thickness must be at least the static level to screen bottom distance (4 m)'],
    [{ groundElevation: { value: Number.NaN, unit: 'm' } }, 'groundElevation.value', 'Ground elevation must be a number'],
    [{ casingRadius: { value: 1, unit: 'furlong' } }, 'casingRadius.unit', 'Choose a length unit: m, cm, mm, ft or in'],
  ])('refuses %o with a message naming the field', (over, field, message) => {
    expect(fieldsOf({ ...valid, ...over })[field]).toBe(message);
  });

  it('lets a confined well have a saturated thickness below Lw (Bouwer-Rice’s Lw ≤ D is for unconfined wells)', () => {
    expect(fieldsOf({ ...valid, aquiferCondition: 'confined', saturatedThickness: m(2) })).toEqual({});
  });

  it("checks the hydrostratigraphic unit against the site's list in the form schema, without regard to case", () => {
    const form = wellFormSchemaFor(['Sand', 'Silt']);
    expect(fieldsOf({ ...valid, hydroUnit: 'silt' }, form)).toEqual({});
    expect(fieldsOf({ ...valid, hydroUnit: 'Clay' }, form).hydroUnit).toBe('Hydrostratigraphic unit "Clay" is not one of this site\'s: Sand, Silt');
    expect(fieldsOf({ ...valid, hydroUnit: 'Clay' }, wellFormSchemaFor([])).hydroUnit).toMatch(/this site has no units yet/);
  });

  it('leaves status and notes out of a change that does not name them', () => {
    expect(wellPatchSchema.parse({ screenTop: m(2) })).toEqual({ screenTop: m(2) });
  });

  it('shows SI sites in metres and US sites in feet with radii in inches', () => {
    expect(['elevation', 'depth', 'radius'].map((g) => displayLengthUnit('SI', g as 'depth'))).toEqual(['m', 'm', 'm']);
    expect(['elevation', 'depth', 'radius'].map((g) => displayLengthUnit('US', g as 'depth'))).toEqual(['ft', 'ft', 'in']);
    expect(roundForInput(0.0508 / 0.0254)).toBe(2);
    expect(roundForInput(3.048 / 0.3048)).toBe(10);
  });
});

describe('CSV import helpers', () => {
  const fixtureHeader = 'Well,Latitude,Longitude,Ground elevation (ft),TOC elevation (ft),Screen top (ft bgs),Screen bottom (ft bgs),Casing radius (in),Screen radius (in),Borehole radius (in),Porosity,Unit,Condition,Saturated thickness (ft),DTW (ft below TOC),Status,Notes'.split(',');

  it('prefills the mapping from header names, each column once, lat/lon or x/y as chosen', () => {
    const latlon = guessMapping(fixtureHeader, 'latlon');
    expect(latlon).toMatchObject({ name: 'Well', lat: 'Latitude', lon: 'Longitude', groundElevation: 'Ground elevation (ft)', measuringPointElevation: 'TOC elevation (ft)', screenTop: 'Screen top (ft bgs)', staticWaterDepth: 'DTW (ft below TOC)', hydroUnit: 'Unit' });
    for (const f of requiredImportFields('latlon')) expect(latlon[f], f).toBeDefined();
    expect(guessMapping(fixtureHeader, 'epsg').lat).toBeUndefined();
    const both = ['name', 'screen top depth (m)', 'screen top elevation (m)'];
    expect(guessMapping(both, 'epsg', 'depth').screenTop).toBe('screen top depth (m)');
    expect(guessMapping(both, 'epsg', 'elevation').screenTop).toBe('screen top elevation (m)');
  });

  it('reads numbers, decimal commas only where the delimiter is not a comma, and flags text', () => {
    expect(parseCellNumber(' 12.5 ', ',')).toBe(12.5);
    expect(parseCellNumber('1e-3', ',')).toBe(0.001);
    expect(parseCellNumber('12,5', ';')).toBe(12.5);
    expect(parseCellNumber('12,5', ',')).toBeNaN();
    expect(parseCellNumber('12 m', ',')).toBeNaN();
    expect(parseCellNumber('', ',')).toBeNull();
  });

  it('turns a row into well input with the chosen units, or names the cells that cannot be read', () => {
    const settings = importSettingsSchema.parse({ mapping: {}, units: { elevation: 'ft', depth: 'ft', radius: 'in' }, screenReference: 'depth', coordinates: { kind: 'latlon' } });
    const cells = { name: 'MW-1', lat: '47.7', lon: '9.1', groundElevation: '466', measuringPointElevation: '468', screenTop: '5', screenBottom: '15', casingRadius: '1', screenRadius: '1', boreholeRadius: '4', aquiferCondition: 'Confined', status: '' };
    const ok = rowToWellInput(cells, settings, ',');
    expect(ok.problems).toEqual([]);
    expect(ok.input).toMatchObject({ coordinates: { kind: 'latlon', lat: 47.7, lon: 9.1 }, screenTop: { value: 5, unit: 'ft' }, casingRadius: { value: 1, unit: 'in' }, aquiferCondition: 'confined', status: 'active' });
    const bad = rowToWellInput({ ...cells, groundElevation: 'n/a', status: 'gone', screenTop: '' }, settings, ',');
    expect(bad.input).toBeNull();
    expect(bad.problems).toEqual([
      { field: 'groundElevation', message: 'Ground elevation: "n/a" is not a number' },
      { field: 'screenTop', message: 'Screen top is required' },
      { field: 'status', message: 'Status: "gone" is not one of active, inactive, decommissioned' },
    ]);
  });
});
