import fc from 'fast-check';
import { LTTB } from 'downsample';
import { describe, expect, it } from 'vitest';
import { lttbIndexes } from '../../../server/features/records/lttb';

/** The reference: the npm package "downsample", on [x, y] tuples; its kept points mapped back to indexes. */
function referenceIndexes(x: number[], y: number[], threshold: number): number[] {
  const points = x.map((xi, i) => [xi, y[i], i] as unknown as [number, number]);
  return (LTTB(points, threshold) as unknown as [number, number, number][]).map((p) => p[2]);
}

describe('LTTB downsampling of a series', () => {
  it('keeps the same points as the downsample package', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: 3, maxLength: 400 }), fc.integer({ min: 3, max: 120 }), (ys, threshold) => {
        const xs = ys.map((_, i) => i * 0.5 + (i % 3) * 0.01);
        expect(Array.from(lttbIndexes(xs, ys, xs.length, threshold))).toEqual(referenceIndexes(xs, ys, threshold));
      }),
      { numRuns: 300 },
    );
  });

  it('keeps the first and last points, in order, and the shape of a recovery curve on a log axis', () => {
    const n = 100_000;
    const t = Float64Array.from({ length: n }, (_, i) => i * 0.1);
    const log = Float64Array.from(t, (ti) => Math.log10(Math.exp(-ti / 3000) + 0.0002 * Math.sin(ti)));
    const keep = lttbIndexes(t, log, n, 500);
    expect(keep.length).toBe(500);
    expect(keep[0]).toBe(0);
    expect(keep[499]).toBe(n - 1);
    for (let k = 1; k < keep.length; k++) expect(keep[k]).toBeGreaterThan(keep[k - 1]);
    // Between kept points, the straight line stays within 0.02 decades of the full curve.
    let worst = 0;
    for (let k = 1; k < keep.length; k++) {
      const a = keep[k - 1];
      const b = keep[k];
      for (let i = a; i <= b; i++) {
        const line = log[a] + ((log[b] - log[a]) * (t[i] - t[a])) / (t[b] - t[a]);
        worst = Math.max(worst, Math.abs(line - log[i]));
      }
    }
    expect(worst).toBeLessThan(0.02);
  });

  it('returns every point when there are no more than asked for', () => {
    expect(Array.from(lttbIndexes([0, 1, 2], [1, 2, 3], 3, 10))).toEqual([0, 1, 2]);
    expect(() => lttbIndexes([0, 1, 2, 3], [0, 0, 0, 0], 4, 2)).toThrow(RangeError);
  });
});
