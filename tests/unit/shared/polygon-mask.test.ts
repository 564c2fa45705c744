import { describe, expect, it } from 'vitest';
import { polygonMask } from '@shared/geo/polygon-mask';
import type { GridSpec } from '@shared/geo/idw';

function pointInRing(x: number, y: number, ring: number[][]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

const grid: GridSpec = { minX: 0, minY: 0, cellSizeM: 10, cols: 10, rows: 10 };

describe('polygon mask', () => {
  it('marks the cells whose centres lie inside a square, row 0 in the north', () => {
    const m = polygonMask(grid, [[[[0, 50], [50, 50], [50, 100], [0, 100], [0, 50]]]]);
    expect(m.length).toBe(100);
    for (let r = 0; r < 10; r++) for (let c = 0; c < 10; c++) expect(m[r * 10 + c]).toBe(r < 5 && c < 5 ? 1 : 0);
  });

  it('leaves holes out and takes every polygon of a MultiPolygon', () => {
    const outer = [[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]];
    const hole = [[30, 30], [30, 70], [70, 70], [70, 30], [30, 30]];
    const m = polygonMask({ ...grid, cols: 20, minX: 0 }, [[outer, hole], [[[150, 0], [200, 0], [200, 20], [150, 20]]]]);
    const at = (x: number, y: number) => m[(9 - Math.floor(y / 10)) * 20 + Math.floor(x / 10)];
    expect(at(15, 15)).toBe(1);
    expect(at(55, 55)).toBe(0);
    expect(at(35, 65)).toBe(0);
    expect(at(25, 65)).toBe(1);
    expect(at(155, 5)).toBe(1);
    expect(at(155, 25)).toBe(0);
    expect(at(125, 5)).toBe(0);
  });

  it('agrees with a plain even-odd test on a concave random polygon, cell by cell', () => {
    let s = 17;
    const rand = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296);
    const ring: number[][] = [];
    for (let i = 0; i < 40; i++) {
      const a = (i / 40) * 2 * Math.PI;
      const radius = 150 + 250 * rand();
      ring.push([500 + radius * Math.cos(a), 500 + radius * Math.sin(a)]);
    }
    const g: GridSpec = { minX: 0, minY: 0, cellSizeM: 7, cols: 150, rows: 143 };
    const m = polygonMask(g, [[ring]]);
    let inside = 0;
    for (let r = 0; r < g.rows; r++) {
      for (let c = 0; c < g.cols; c++) {
        const x = g.minX + (c + 0.5) * g.cellSizeM;
        const y = g.minY + (g.rows - r - 0.5) * g.cellSizeM;
        const expected = pointInRing(x, y, ring) ? 1 : 0;
        expect(m[r * g.cols + c]).toBe(expected);
        inside += expected;
      }
    }
    expect(inside).toBeGreaterThan(1000);
  });

  it('gives an empty mask for no polygon and for a polygon off the grid', () => {
    expect(polygonMask(grid, []).every((v) => v === 0)).toBe(true);
    expect(polygonMask(grid, [[[[500, 500], [600, 500], [600, 600]]]]).every((v) => v === 0)).toBe(true);
  });
});
