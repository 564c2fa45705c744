import { describe, expect, it } from 'vitest';
import { crossValidate, nextTestSpots } from '@shared/geo/cross-validation';
import { idwAt, type GridSpec, type IdwPoint } from '@shared/geo/idw';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296);
}

function wells(n: number, seed: number): IdwPoint[] {
  const rand = lcg(seed);
  return Array.from({ length: n }, (_, i) => {
    const x = rand() * 1000;
    const y = rand() * 1000;
    return { x, y, z: -6 + x / 1000 - y / 2000 + 0.3 * (rand() - 0.5), id: `MW-${i}` };
  });
}

describe('leave-one-out cross-validation', () => {
  it('predicts each well from the others and reports RMSE and mean error in log10 units', () => {
    const pts = wells(25, 1);
    const cv = crossValidate(pts, { power: 2 });
    expect(cv.power).toBe(2);
    expect(cv.n).toBe(25);
    expect(cv.wells).toHaveLength(25);
    for (let i = 0; i < pts.length; i++) {
      const others = pts.filter((_, j) => j !== i);
      const w = cv.wells[i];
      expect(w.id).toBe(pts[i].id);
      expect(w.observedLog10K).toBe(pts[i].z);
      expect(w.predictedLog10K).toBeCloseTo(idwAt(others, pts[i].x, pts[i].y, { power: 2 }), 12);
      // error = predicted − observed
      expect(w.errorLog10).toBeCloseTo(w.predictedLog10K - w.observedLog10K, 12);
    }
    const errors = cv.wells.map((w) => w.errorLog10);
    expect(cv.rmseLog10).toBeCloseTo(Math.sqrt(errors.reduce((s, e) => s + e * e, 0) / errors.length), 12);
    expect(cv.meanErrorLog10).toBeCloseTo(errors.reduce((s, e) => s + e, 0) / errors.length, 12);
  });

  it('scores every power and suggests the one with the lowest RMSE (common practice, domain.md §5)', () => {
    const cv = crossValidate(wells(30, 2), { neighbours: 8 });
    expect(cv.power).toBe(2);
    expect(cv.byPower.map((b) => b.power)).toEqual([1, 1.5, 2, 2.5, 3]);
    const best = cv.byPower.reduce((a, b) => (b.rmseLog10 < a.rmseLog10 ? b : a));
    expect(cv.suggestedPower).toBe(best.power);
    expect(cv.byPower.find((b) => b.power === 2)?.rmseLog10).toBeCloseTo(cv.rmseLog10, 12);
  });

  it('is exact for a constant field and leaves out wells with no other within the search radius', () => {
    const pts = [
      { x: 0, y: 0, z: -5, id: 'a' },
      { x: 10, y: 0, z: -5, id: 'b' },
      { x: 0, y: 10, z: -5, id: 'c' },
      { x: 5000, y: 5000, z: -3, id: 'far' },
    ];
    const cv = crossValidate(pts, { searchRadiusM: 100 });
    expect(cv.n).toBe(3);
    expect(cv.wells.map((w) => w.id)).toEqual(['a', 'b', 'c']);
    expect(cv.rmseLog10).toBeCloseTo(0, 12);
  });

  it('refuses fewer than three wells, and a set where no well can be predicted', () => {
    expect(() => crossValidate(wells(2, 3), {})).toThrow(/at least three/);
    const apart = [0, 1, 2].map((i) => ({ x: i * 1000, y: 0, z: -5, id: `w${i}` }));
    expect(() => crossValidate(apart, { searchRadiusM: 10 })).toThrow(/search radius/);
  });
});

describe('next test spots (Kfield heuristic)', () => {
  const grid: GridSpec = { minX: 0, minY: 0, cellSizeM: 20, cols: 50, rows: 50 };
  const all = new Uint8Array(2500).fill(1);

  it('returns spots inside the mask, best first, far from the wells and apart from each other', () => {
    const pts = wells(12, 4);
    const spots = nextTestSpots(pts, grid, all, 5);
    expect(spots).toHaveLength(5);
    for (let i = 1; i < spots.length; i++) expect(spots[i].score).toBeLessThanOrEqual(spots[i - 1].score);
    for (const s of spots) {
      const nearest = Math.min(...pts.map((p) => Math.hypot(p.x - s.x, p.y - s.y)));
      expect(s.nearestWellM).toBeCloseTo(nearest, 9);
      expect(s.nearestWellM).toBeGreaterThan(50);
    }
    for (let i = 0; i < spots.length; i++) {
      for (let j = i + 1; j < spots.length; j++) expect(Math.hypot(spots[i].x - spots[j].x, spots[i].y - spots[j].y)).toBeGreaterThan(100);
    }
  });

  it('keeps to the mask', () => {
    const mask = new Uint8Array(2500);
    for (let r = 0; r < 50; r++) for (let c = 0; c < 10; c++) mask[r * 50 + c] = 1;
    const spots = nextTestSpots(wells(12, 5), grid, mask, 3);
    expect(spots.length).toBeGreaterThan(0);
    for (const s of spots) expect(s.x).toBeLessThan(200);
  });

  it('prefers the place among wells that disagree, at equal distance', () => {
    // two rings of seven wells around empty centres 150 m from every well: agreeing on the west, disagreeing on the east
    const ring = (cx: number, z: (i: number) => number) =>
      Array.from({ length: 7 }, (_, i) => ({ x: cx + 150 * Math.cos((i * 2 * Math.PI) / 7), y: 500 + 150 * Math.sin((i * 2 * Math.PI) / 7), z: z(i) }));
    const pts = [...ring(250, () => -5), ...ring(750, (i) => (i % 2 ? -3 : -7))];
    const mask = new Uint8Array(2500);
    for (let r = 0; r < 50; r++) {
      for (let c = 0; c < 50; c++) {
        const x = (c + 0.5) * 20;
        const y = (50 - r - 0.5) * 20;
        if (Math.hypot(x - 250, y - 500) < 100 || Math.hypot(x - 750, y - 500) < 100) mask[r * 50 + c] = 1;
      }
    }
    const [best] = nextTestSpots(pts, grid, mask, 1);
    expect(best.x).toBeGreaterThan(500);
    expect(Math.hypot(best.x - 750, best.y - 500)).toBeLessThan(30);
  });

  it('gives no spot for an empty mask and refuses a set with no well', () => {
    expect(nextTestSpots(wells(5, 6), grid, new Uint8Array(2500), 5)).toEqual([]);
    expect(() => nextTestSpots([], grid, all, 5)).toThrow(/well/);
    expect(() => nextTestSpots(wells(5, 6), grid, new Uint8Array(4), 5)).toThrow(/mask/);
  });
});

describe('next test spots and the surface options', () => {
  it('rank the same whatever the surface’s neighbours and radius', () => {
    const grid: GridSpec = { minX: 0, minY: 0, cellSizeM: 20, cols: 50, rows: 50 };
    const mask = new Uint8Array(2500).fill(1);
    const pts = wells(15, 8);
    expect(nextTestSpots(pts, grid, mask, 4, { neighbours: 1, searchRadiusM: 10 })).toEqual(nextTestSpots(pts, grid, mask, 4));
  });
});
