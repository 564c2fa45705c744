import type { GridSpec } from './idw';

/**
 * 1 where the cell centre lies inside the MultiPolygon (coordinates in the grid's projected metres), by
 * the even-odd rule over every ring, so holes and separate polygons come out right. One scanline per
 * row: the crossings of the row's centre line with each edge, sorted, fill between pairs.
 */
export function polygonMask(grid: GridSpec, rings: number[][][][]): Uint8Array {
  const { minX, minY, cellSizeM: cell, cols, rows } = grid;
  const mask = new Uint8Array(cols * rows);
  const ex1: number[] = [];
  const ey1: number[] = [];
  const ex2: number[] = [];
  const ey2: number[] = [];
  for (const polygon of rings) {
    for (const ring of polygon) {
      const n = ring.length;
      for (let i = 0; i < n; i++) {
        const p = ring[i];
        const q = ring[(i + 1) % n];
        if (p[1] === q[1]) continue;
        ex1.push(p[0]);
        ey1.push(p[1]);
        ex2.push(q[0]);
        ey2.push(q[1]);
      }
    }
  }
  const edges = ex1.length;
  if (!edges) return mask;
  // edges sorted by their lower y so each row only looks at edges that can cross it
  const order = Array.from({ length: edges }, (_, i) => i).sort((a, b) => Math.min(ey1[a], ey2[a]) - Math.min(ey1[b], ey2[b]));
  const xs = new Float64Array(edges);
  for (let r = rows - 1; r >= 0; r--) {
    const y = minY + (rows - r - 0.5) * cell;
    let count = 0;
    for (let k = 0; k < edges; k++) {
      const e = order[k];
      const y1 = ey1[e];
      const y2 = ey2[e];
      if (Math.min(y1, y2) > y) break;
      // half-open rule: a vertex on the scanline is counted once
      if (y1 > y !== y2 > y) xs[count++] = ex1[e] + ((y - y1) / (y2 - y1)) * (ex2[e] - ex1[e]);
    }
    if (count < 2) continue;
    const hits = xs.subarray(0, count).sort();
    const base = r * cols;
    for (let k = 0; k + 1 < count; k += 2) {
      // centres x_c = minX + (c + 0.5)·cell with hits[k] < x_c < hits[k + 1] (strict on the left, as a point test)
      const c0 = Math.max(0, Math.floor((hits[k] - minX) / cell - 0.5) + 1);
      const c1 = Math.min(cols - 1, Math.ceil((hits[k + 1] - minX) / cell - 0.5) - 1);
      for (let c = c0; c <= c1; c++) mask[base + c] = 1;
    }
  }
  return mask;
}
