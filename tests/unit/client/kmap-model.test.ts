import { describe, expect, it } from 'vitest';
import { decadeDomain } from '@/features/kmap/colour';
import { NO_FILTER, NO_UNIT, binOf, boundsOf, filterWells, histogram, labelMinZoom, sourceData, unitsPresent, type MapWellFeature } from '@/features/kmap/model';

let n = 0;
function well(o: { k?: number | null; unit?: string | null; top?: number; bottom?: number; lon?: number; lat?: number }): MapWellFeature {
  const id = `w${++n}`;
  const k = o.k === undefined ? 1e-4 : o.k;
  return {
    type: 'Feature',
    id,
    geometry: { type: 'Point', coordinates: [o.lon ?? 9.15, o.lat ?? 47.76] },
    properties: {
      id,
      name: id.toUpperCase(),
      status: 'active',
      hydroUnit: o.unit === undefined ? 'Sand and gravel' : o.unit,
      wellK: k,
      log10K: k === null ? null : Math.log10(k),
      count: k === null ? 0 : 1,
      log10StdDev: k === null ? null : 0,
      groundElevationM: 142,
      screenTopDepthM: 142 - (o.top ?? 138),
      screenBottomDepthM: 142 - (o.bottom ?? 133),
      screenTopElevationM: o.top ?? 138,
      screenBottomElevationM: o.bottom ?? 133,
    },
  };
}

describe('K histogram', () => {
  it('puts wells in quarter-decade bins of the legend’s unit', () => {
    const domain = decadeDomain([-6, -3], 'm/s');
    const bins = histogram([well({ k: 1e-6 }), well({ k: 1.7e-6 }), well({ k: 1.8e-6 }), well({ k: 5e-5 }), well({ k: 1e-3 }), well({ k: null })], domain);
    expect(bins).toHaveLength(12);
    expect(bins[0]).toMatchObject({ fromLog10: -6, toLog10: -5.75, count: 2 });
    // 1.8e-6 is above 10^-5.75 = 1.778e-6
    expect(bins[1].count).toBe(1);
    expect(bins[6]).toMatchObject({ fromLog10: -4.5, toLog10: -4.25, count: 1 });
    // The top edge of the domain is in the last bin; wells without a Well K are in none.
    expect(bins[11].count).toBe(1);
    expect(bins.reduce((s, b) => s + b.count, 0)).toBe(5);
  });

  it('bins by decades of the chosen unit (1 m/d is the low edge of the first bin)', () => {
    const domain = decadeDomain([Math.log10(1 / 86400), Math.log10(50 / 86400)], 'm/d');
    expect(domain).toMatchObject({ fromDecade: 0, toDecade: 2 });
    expect(binOf(domain, Math.log10(1 / 86400))).toBe(0);
    expect(binOf(domain, Math.log10(10 / 86400))).toBe(4);
  });

  it('gives each drawn well its bin, and −1 to a well without a Well K', () => {
    const domain = decadeDomain([-5, -3], 'm/s');
    const data = sourceData([well({ k: 2e-4 }), well({ k: null })], domain);
    expect(data.features.map((f) => f.properties.bin)).toEqual([5, -1]);
  });
});

describe('K map filters', () => {
  const wells = [
    well({ unit: 'Sand and gravel', top: 138, bottom: 133 }),
    well({ unit: 'Silt', top: 128, bottom: 125 }),
    well({ unit: null, top: 140, bottom: 136 }),
  ];

  it('shows every well without a filter', () => {
    expect(filterWells(wells, NO_FILTER)).toHaveLength(3);
  });

  it('keeps the chosen units, with “no unit” as a choice of its own', () => {
    expect(filterWells(wells, { ...NO_FILTER, units: ['Silt'] }).map((w) => w.properties.hydroUnit)).toEqual(['Silt']);
    expect(filterWells(wells, { ...NO_FILTER, units: [NO_UNIT, 'Silt'] })).toHaveLength(2);
    expect(filterWells(wells, { ...NO_FILTER, units: [] })).toHaveLength(0);
  });

  it('keeps wells whose screen overlaps the elevation range', () => {
    const names = (f: Parameters<typeof filterWells>[1]) => filterWells(wells, f).map((w) => w.properties.screenTopElevationM);
    expect(names({ ...NO_FILTER, elevationMinM: 130 })).toEqual([138, 140]);
    expect(names({ ...NO_FILTER, elevationMaxM: 134 })).toEqual([138, 128]);
    expect(names({ ...NO_FILTER, elevationMinM: 126, elevationMaxM: 127 })).toEqual([128]);
  });

  it('lists the units present, the site’s order first and “no unit” last', () => {
    expect(unitsPresent(wells, ['Buried channel gravel', 'Silt', 'Sand and gravel'])).toEqual(['Silt', 'Sand and gravel', NO_UNIT]);
  });

  it('bounds the wells it is given', () => {
    expect(boundsOf([well({ lon: 9.1, lat: 47.7 }), well({ lon: 9.2, lat: 47.8 })])).toEqual([9.1, 47.7, 9.2, 47.8]);
    expect(boundsOf([])).toBeNull();
  });
});

describe('well names', () => {
  const grid = (n: number, stepDeg: number) =>
    Array.from({ length: n }, (_, i) => well({ lon: 9.15 + (i % Math.ceil(Math.sqrt(n))) * stepDeg, lat: 47.76 + Math.floor(i / Math.ceil(Math.sqrt(n))) * stepDeg }));

  it('are drawn from a closer zoom the denser the network', () => {
    // 25 wells about 75 m apart: names from about zoom 15.5; 20 000 wells 7.5 m apart: only close up.
    const sparse = labelMinZoom(grid(25, 0.001));
    const dense = labelMinZoom(grid(20_000, 0.0001));
    expect(sparse).toBeGreaterThanOrEqual(15);
    expect(sparse).toBeLessThanOrEqual(16);
    expect(dense).toBeGreaterThanOrEqual(18.5);
    // Ten times closer is log2(10) ≈ 3.3 zoom levels later.
    expect(dense - sparse).toBeCloseTo(Math.log2(10), 0);
  });

  it('start at zoom 14 for a single well', () => {
    expect(labelMinZoom([well({})])).toBe(14);
  });
});
