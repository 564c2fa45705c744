import { describe, expect, it } from 'vitest';
import proj4 from 'proj4';
import { gridFor, cellCentre } from '@shared/geo/idw';
import { decadeDomain, kColourScale, parseColour } from '@/features/kmap/colour';
import { colourTable, formatArea, gridCorners, highKZones, paintSurface, pointsBounds, surfaceStats, valueAt } from '@/features/kmap/surface/model';
import { decades, FAR_PAD, plotFrame, spreadLabels, toPixelX, toPixelY, worstPredicted } from '@/features/kmap/surface/plot-math';
import { surfaceQueryString } from '@/features/kmap/surface/api';

const UTM32N = '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs';
const toLonLat = (x: number, y: number) => proj4(UTM32N, 'WGS84', [x, y]) as [number, number];

describe('the K surface painted in the browser', () => {
  const scale = kColourScale(decadeDomain([-7, -2.3], 'm/s'));
  const table = colourTable(scale);

  it('paints each cell in the K map scale’s colour for its value and leaves empty cells transparent', () => {
    const values = new Float32Array([-7, -6.5, -5.2, -4.01, NaN, -3.3, -2.5, -2]);
    const pixels = paintSurface(values, table);
    values.forEach((v, i) => {
      if (Number.isNaN(v)) {
        expect(pixels[i * 4 + 3]).toBe(0);
        return;
      }
      const expected = parseColour(scale(v));
      // 1,024 steps of the table against d3's continuous scale: viridis moves at most ~1 of 255 per step.
      for (let c = 0; c < 3; c++) expect(Math.abs(pixels[i * 4 + c] - expected[c])).toBeLessThanOrEqual(2);
      expect(pixels[i * 4 + 3]).toBe(255);
    });
  });

  it('clamps values beyond the legend to its end colours', () => {
    const pixels = paintSurface(new Float32Array([-12, 3]), table);
    expect(Array.from(pixels.slice(0, 3))).toEqual(parseColour(scale(-7)).map((v) => expect.closeTo(v, -0.5)));
    expect(Math.abs(pixels[4] - parseColour(scale(-2))[0])).toBeLessThanOrEqual(2);
  });

  it('reads the cell under a point, row 0 being the northern row, NaN outside the grid', () => {
    const grid = gridFor({ minX: 1000, minY: 5000, maxX: 1400, maxY: 5300 }, 10);
    const values = Float32Array.from({ length: grid.cols * grid.rows }, (_, i) => i);
    for (const [c, r] of [
      [0, 0],
      [grid.cols - 1, 0],
      [3, grid.rows - 1],
      [17, 11],
    ]) {
      const { x, y } = cellCentre(grid, c, r);
      expect(valueAt(grid, values, x, y)).toBe(r * grid.cols + c);
    }
    expect(valueAt(grid, values, grid.minX + 5, grid.minY + grid.rows * 10 - 1)).toBe(0);
    expect(valueAt(grid, values, grid.minX - 1, 5100)).toBeNaN();
    expect(valueAt(grid, values, 1100, grid.minY + grid.rows * 10 + 1)).toBeNaN();
    expect(gridCorners(grid)[0]).toEqual([grid.minX, grid.minY + grid.rows * 10]);
  });

  it('gives the geometric mean of the filled cells', () => {
    const s = surfaceStats(new Float32Array([-3, -5, NaN, -4]));
    expect(s.cells).toBe(3);
    expect(s.geometricMeanK).toBeCloseTo(1e-4, 12);
    expect([s.minLog10, s.maxLog10]).toEqual([-5, -3]);
  });

  it('adds a margin of a tenth of the wells’ extent around them when there is no outline', () => {
    expect(pointsBounds([{ x: 0, y: 0, z: 0 }, { x: 100, y: 50, z: 0 }])).toEqual({ minX: -10, minY: -10, maxX: 110, maxY: 60 });
    expect(pointsBounds([])).toBeNull();
  });
});

describe('high-permeability zones', () => {
  // A 30 × 30 grid of 10 m cells on UTM 32N with a 10 × 10 block of high K in it.
  const grid = { minX: 512_000, minY: 5_289_000, cellSizeM: 10, cols: 30, rows: 30 };
  const values = new Float32Array(900).fill(-6);
  for (let r = 10; r < 20; r++) for (let c = 5; c < 15; c++) values[r * 30 + c] = -3;

  it('outlines the cells above the threshold, with the area and the geometric mean K inside', () => {
    const zones = highKZones(grid, values, -4.5, toLonLat);
    expect(zones.features).toHaveLength(1);
    const zone = zones.features[0];
    expect(zone.geometry.type).toBe('MultiPolygon');
    expect(zone.properties.cells).toBe(100);
    expect(zone.properties.geometricMeanK).toBeCloseTo(1e-3, 12);
    // Traced halfway between cell centres: 100 m × 100 m less the four corners marching squares cuts (¼ cell² each half).
    expect(zone.properties.areaM2).toBeGreaterThan(9_900 * 0.99);
    expect(zone.properties.areaM2).toBeLessThan(10_000 * 1.01);
    const [lon, lat] = zone.geometry.coordinates[0][0][0];
    expect(lon).toBeGreaterThan(9);
    expect(lat).toBeGreaterThan(47);
  });

  it('finds no zone above the highest value, and never counts empty cells', () => {
    expect(highKZones(grid, values, -2, toLonLat).features).toHaveLength(0);
    const holed = values.slice();
    holed.fill(NaN, 0, 300);
    expect(highKZones(grid, holed, -7, toLonLat).features[0].properties.cells).toBe(600);
  });

  it('writes areas in hectares or acres', () => {
    expect(formatArea(12_100, 'SI')).toBe('1.21 ha');
    expect(formatArea(950, 'SI')).toBe('950 m²');
    expect(formatArea(4046.8564224, 'US')).toBe('1.00 acres');
  });
});

describe('the observed-versus-predicted plot', () => {
  it('spans whole decades on both axes, with y upward', () => {
    const f = plotFrame([-4.2, -6.7, -5.1], 260);
    expect([f.from, f.to]).toEqual([-7, -4]);
    expect(decades(f)).toEqual([-7, -6, -5, -4]);
    expect(toPixelX(f, -7)).toBe(f.margin);
    expect(toPixelY(f, -7)).toBe(260 - f.margin);
    expect(toPixelX(f, -4)).toBe(260 - FAR_PAD);
    expect(toPixelY(f, -4)).toBe(FAR_PAD);
  });

  it('keeps the worst wells’ names at least a line apart', () => {
    expect(spreadLabels([50, 52, 120, 49])).toEqual([60, 71, 120, 49]);
  });

  it('names the worst-predicted wells by the size of their error, whatever its sign', () => {
    const worst = worstPredicted([{ errorLog10: 0.2 }, { errorLog10: -1.1 }, { errorLog10: 0.9 }, { errorLog10: -0.1 }], 2);
    expect(worst.map((w) => w.errorLog10)).toEqual([-1.1, 0.9]);
  });
});

describe('the surface settings on the wire', () => {
  it('sends the same settings and map filters as the browser used', () => {
    const q = surfaceQueryString(
      { outlineId: 'o1', power: 2.5, neighbours: 8, searchRadiusM: null, cellSizeM: 4, units: ['Sand and gravel', 'Silt'], screenElevationMinM: 120, screenElevationMaxM: null },
      { x: 512_000.5, y: 5_289_000 },
    );
    expect(Object.fromEntries(new URLSearchParams(q))).toEqual({
      outlineId: 'o1',
      power: '2.5',
      neighbours: '8',
      cellSizeM: '4',
      units: 'Sand and gravel,Silt',
      screenElevationMinM: '120',
      x: '512000.5',
      y: '5289000',
    });
  });
});
