import { describe, expect, it } from 'vitest';
import { distance, featureCollection, interpolate, point } from '@turf/turf';
import { gridFor, idwAt, idwGrid, type GridSpec, type IdwPoint } from '@shared/geo/idw';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

function randomWells(n: number, seed: number, size = 1000): IdwPoint[] {
  const rand = lcg(seed);
  return Array.from({ length: n }, (_, i) => ({ x: rand() * size, y: rand() * size, z: -8 + 4 * rand(), id: `w${i}` }));
}

function bruteIdw(points: IdwPoint[], x: number, y: number, power: number, k?: number, radius?: number): number {
  let near = points.map((p) => ({ p, d: Math.hypot(p.x - x, p.y - y) }));
  if (radius !== undefined) near = near.filter((n) => n.d <= radius);
  near.sort((a, b) => a.d - b.d);
  if (k !== undefined) near = near.slice(0, k);
  if (!near.length) return Number.NaN;
  if (near[0].d === 0) return near[0].p.z;
  let sw = 0;
  let szw = 0;
  for (const { p, d } of near) {
    const w = 1 / d ** power;
    sw += w;
    szw += w * p.z;
  }
  return szw / sw;
}

describe('IDW of log10 K', () => {
  // domain.md §7 item 10 (derived): K = 1e-4 and 1e-6 m/s, the midpoint gives 1e-5 m/s for any p
  it.each([0.5, 1, 2, 3, 6])('gives the geometric mean 1e-5 m/s at the midpoint of 1e-4 and 1e-6 m/s for p = %d', (power) => {
    const wells = [
      { x: 0, y: 0, z: Math.log10(1e-4) },
      { x: 100, y: 0, z: Math.log10(1e-6) },
    ];
    const k = 10 ** idwAt(wells, 50, 0, { power });
    expect(Math.abs(k - 1e-5) / 1e-5).toBeLessThan(1e-12);
    // linear IDW of K would give 5.05e-5 (domain.md §7 item 10)
    expect(Math.abs(k - 5.05e-5)).toBeGreaterThan(1e-5);
  });

  it('returns exactly the well value at a well, for every option', () => {
    const wells = randomWells(30, 7);
    const target = wells[11];
    for (const o of [{}, { power: 3 }, { neighbours: 4 }, { searchRadiusM: 50 }, { neighbours: 1, searchRadiusM: 1 }]) {
      expect(idwAt(wells, target.x, target.y, o)).toBe(target.z);
    }
  });

  it('matches a brute-force IDW for all neighbours, nearest-k and a search radius', () => {
    const wells = randomWells(80, 3);
    const rand = lcg(99);
    for (let i = 0; i < 50; i++) {
      const x = rand() * 1200 - 100;
      const y = rand() * 1200 - 100;
      expect(idwAt(wells, x, y)).toBeCloseTo(bruteIdw(wells, x, y, 2), 12);
      expect(idwAt(wells, x, y, { power: 1.5, neighbours: 6 })).toBeCloseTo(bruteIdw(wells, x, y, 1.5, 6), 12);
      const r = bruteIdw(wells, x, y, 2.5, undefined, 150);
      const got = idwAt(wells, x, y, { power: 2.5, searchRadiusM: 150 });
      if (Number.isNaN(r)) expect(got).toBeNaN();
      else expect(got).toBeCloseTo(r, 12);
    }
  });

  it('is NaN where no well lies within the search radius, and with no wells at all', () => {
    const wells = [{ x: 0, y: 0, z: -5 }];
    expect(idwAt(wells, 100, 0, { searchRadiusM: 99 })).toBeNaN();
    expect(idwAt(wells, 100, 0, { searchRadiusM: 100 })).toBe(-5);
    expect(idwAt([], 0, 0)).toBeNaN();
    expect(Array.from(idwGrid([], { minX: 0, minY: 0, cellSizeM: 1, cols: 2, rows: 2 })).every(Number.isNaN)).toBe(true);
  });

  it('gives one well a flat surface (a surface needs two wells; the server refuses fewer)', () => {
    const grid: GridSpec = { minX: 0, minY: 0, cellSizeM: 10, cols: 3, rows: 2 };
    expect(Array.from(idwGrid([{ x: 3, y: 4, z: -6 }], grid))).toEqual([-6, -6, -6, -6, -6, -6]);
  });

  it('refuses a well with a non-finite coordinate or value, naming it', () => {
    expect(() => idwAt([{ x: 0, y: 0, z: Number.NaN, id: 'MW-3' }], 1, 1)).toThrow(/MW-3/);
    expect(() => idwGrid([{ x: Number.POSITIVE_INFINITY, y: 0, z: -5 }], { minX: 0, minY: 0, cellSizeM: 1, cols: 1, rows: 1 })).toThrow(/finite/);
  });
});

describe('IDW grid', () => {
  const grid: GridSpec = { minX: -50, minY: 20, cellSizeM: 25, cols: 48, rows: 36 };

  it('lays row 0 out as the northern row, cell centres at half cells', () => {
    const wells = [
      { x: 0, y: 0, z: 0 },
      { x: 0, y: 1000, z: 1 },
    ];
    const g = idwGrid(wells, { minX: 0, minY: 0, cellSizeM: 500, cols: 1, rows: 2 });
    // centres (250, 750) in row 0 and (250, 250) in row 1
    expect(g[0]).toBeCloseTo(idwAt(wells, 250, 750), 6);
    expect(g[1]).toBeCloseTo(idwAt(wells, 250, 250), 6);
    expect(g[0]).toBeGreaterThan(g[1]);
  });

  it.each([
    ['all neighbours', {}],
    ['power 1.5', { power: 1.5 }],
    ['power 3, 12 nearest', { power: 3, neighbours: 12 }],
    ['power 2, radius 120 m', { searchRadiusM: 120 }],
    ['power 2.5, 5 nearest within 200 m', { power: 2.5, neighbours: 5, searchRadiusM: 200 }],
    ['more neighbours than wells', { neighbours: 500 }],
  ])('agrees cell by cell with idwAt (%s)', (_label, o) => {
    const wells = randomWells(120, 21);
    const g = idwGrid(wells, grid, o);
    expect(g).toBeInstanceOf(Float32Array);
    expect(g.length).toBe(grid.cols * grid.rows);
    for (let r = 0; r < grid.rows; r++) {
      for (let c = 0; c < grid.cols; c++) {
        const x = grid.minX + (c + 0.5) * grid.cellSizeM;
        const y = grid.minY + (grid.rows - r - 0.5) * grid.cellSizeM;
        const expected = idwAt(wells, x, y, o);
        const got = g[r * grid.cols + c];
        if (Number.isNaN(expected)) expect(got).toBeNaN();
        else expect(got).toBe(Math.fround(expected));
      }
    }
  });

  it('returns a well value exactly (as Float32) in a cell whose centre is on the well', () => {
    const wells = [...randomWells(40, 5), { x: -50 + 10.5 * 25, y: 20 + (36 - 4 - 0.5) * 25, z: -4.321 }];
    for (const o of [{}, { neighbours: 8 }, { searchRadiusM: 80 }]) {
      expect(idwGrid(wells, grid, o)[4 * grid.cols + 10]).toBe(Math.fround(-4.321));
    }
  });

  it('is NaN outside the mask and unchanged inside', () => {
    const wells = randomWells(30, 9);
    const mask = new Uint8Array(grid.cols * grid.rows);
    for (let i = 0; i < mask.length; i += 3) mask[i] = 1;
    const full = idwGrid(wells, grid, { neighbours: 6 });
    const masked = idwGrid(wells, grid, { neighbours: 6 }, mask);
    for (let i = 0; i < mask.length; i++) {
      if (mask[i]) expect(masked[i]).toBe(full[i]);
      else expect(masked[i]).toBeNaN();
    }
    expect(() => idwGrid(wells, grid, {}, new Uint8Array(3))).toThrow(/mask/i);
  });
});

describe('IDW against @turf/interpolate', () => {
  // domain.md §7 item 11: the same points and grid through @turf/interpolate (all neighbours, same
  // distance) agree to 1e-9 relative; turf measures great-circle distances, so Kfield is given the same one
  it.each([1, 2, 3])('agrees to 1e-9 relative on every cell of a point grid, power %d', (power) => {
    const rand = lcg(2024 + power);
    const wells = Array.from({ length: 25 }, () => ({ lon: 7.1 + rand() * 0.05, lat: 46.2 + rand() * 0.04, z: -7 + 3 * rand() }));
    const fc = featureCollection(wells.map((w) => point([w.lon, w.lat], { logK: w.z })));
    const turfGrid = interpolate(fc, 0.25, { gridType: 'point', property: 'logK', units: 'kilometers', weight: power });
    const km = (x1: number, y1: number, x2: number, y2: number) => distance([x1, y1], [x2, y2], { units: 'kilometers' });
    const points = wells.map((w) => ({ x: w.lon, y: w.lat, z: w.z }));
    expect(turfGrid.features.length).toBeGreaterThan(200);
    for (const f of turfGrid.features) {
      const [lon, lat] = f.geometry.coordinates;
      const expected = f.properties?.logK as number;
      const got = idwAt(points, lon, lat, { power, distance: km });
      expect(Math.abs(got - expected) / Math.abs(expected)).toBeLessThan(1e-9);
    }
  });

  it('uses a given distance function in idwGrid as in idwAt', () => {
    const wells = randomWells(20, 4);
    const manhattan = (x1: number, y1: number, x2: number, y2: number) => Math.abs(x1 - x2) + Math.abs(y1 - y2);
    const g: GridSpec = { minX: 0, minY: 0, cellSizeM: 100, cols: 10, rows: 10 };
    const out = idwGrid(wells, g, { distance: manhattan, neighbours: 5 });
    expect(out[23]).toBe(Math.fround(idwAt(wells, 350, 750, { distance: manhattan, neighbours: 5 })));
  });
});

describe('gridFor', () => {
  it('lays about 200 cells across the longer side of the bounds, covering them', () => {
    const g = gridFor({ minX: 1000, minY: 2000, maxX: 3000, maxY: 3000 });
    expect(g.cellSizeM).toBeCloseTo(10, 9);
    expect(g.cols).toBe(200);
    expect(g.rows).toBe(100);
    expect(g.minX).toBeLessThanOrEqual(1000);
    expect(g.minY).toBeLessThanOrEqual(2000);
    expect(g.minX + g.cols * g.cellSizeM).toBeGreaterThanOrEqual(3000);
    expect(g.minY + g.rows * g.cellSizeM).toBeGreaterThanOrEqual(3000);
  });

  it('takes a given cell size and rounds the cell count up', () => {
    const g = gridFor({ minX: 0, minY: 0, maxX: 105, maxY: 40 }, 10);
    expect(g).toMatchObject({ cellSizeM: 10, cols: 11, rows: 4 });
    expect(g.minX + g.cols * 10).toBeGreaterThanOrEqual(105);
  });

  it('refuses bounds with no extent without a cell size, and grids too large to hold', () => {
    expect(() => gridFor({ minX: 5, minY: 5, maxX: 5, maxY: 5 })).toThrow(/cell size/i);
    expect(gridFor({ minX: 5, minY: 5, maxX: 5, maxY: 5 }, 10)).toMatchObject({ cols: 1, rows: 1 });
    expect(() => gridFor({ minX: 0, minY: 0, maxX: 100_000, maxY: 100_000 }, 1)).toThrow(/cells/);
    expect(() => gridFor({ minX: 0, minY: 0, maxX: 10, maxY: 10 }, 0)).toThrow(/cell size/i);
  });
});
