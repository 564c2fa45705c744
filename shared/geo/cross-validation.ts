import { idwLeaveOneOut, KnnHeap, PointIndex, type GridSpec, type IdwOptions, type IdwPoint } from './idw';

export interface CrossValidationWell {
  id: string;
  observedLog10K: number;
  predictedLog10K: number;
  errorLog10: number;
}

export interface CrossValidationResult {
  power: number;
  n: number;
  rmseLog10: number;
  meanErrorLog10: number;
  byPower: { power: number; rmseLog10: number; meanErrorLog10: number }[];
  suggestedPower: number;
  wells: CrossValidationWell[];
}

/** Wells whose spread of log10 K scores a candidate spot (Kfield's choice). */
export const SPREAD_NEIGHBOURS = 6;

export interface TestSpot {
  x: number;
  y: number;
  score: number;
  nearestWellM: number;
}

function leaveOneOut(points: IdwPoint[], o: IdwOptions, power: number): CrossValidationWell[] {
  const wells: CrossValidationWell[] = [];
  for (let i = 0; i < points.length; i++) {
    const predicted = idwLeaveOneOut(points, i, { ...o, power });
    if (Number.isNaN(predicted)) continue;
    const observed = points[i].z;
    wells.push({ id: points[i].id ?? String(i), observedLog10K: observed, predictedLog10K: predicted, errorLog10: predicted - observed });
  }
  return wells;
}

function stats(wells: CrossValidationWell[]): { rmseLog10: number; meanErrorLog10: number } {
  let ss = 0;
  let s = 0;
  for (const w of wells) {
    ss += w.errorLog10 * w.errorLog10;
    s += w.errorLog10;
  }
  return { rmseLog10: Math.sqrt(ss / wells.length), meanErrorLog10: s / wells.length };
}

/**
 * Leave-one-out: each well predicted by IDW from the others (same options), errors predicted − observed
 * in log10 units. Wells with no other well within the search radius are left out (n counts the rest).
 * The suggested power is the one of `powers` with the lowest RMSE (common practice). Throws for fewer than
 * three wells, or when no well can be predicted.
 */
export function crossValidate(points: IdwPoint[], o: IdwOptions, powers: number[] = [1, 1.5, 2, 2.5, 3]): CrossValidationResult {
  if (points.length < 3) throw new Error(`Cross-validation needs at least three wells with K (got ${points.length})`);
  if (!powers.length) throw new Error('Cross-validation needs at least one power to try');
  const power = o.power ?? 2;
  const byPower = powers.map((p) => ({ power: p, ...stats(leaveOneOut(points, o, p)) }));
  const wells = leaveOneOut(points, o, power);
  if (!wells.length) {
    throw new Error(`No well has another within the search radius (${o.searchRadiusM} m): widen the search radius to cross-validate`);
  }
  let suggestedPower = byPower[0].power;
  let best = Number.POSITIVE_INFINITY;
  for (const b of byPower) {
    if (b.rmseLog10 < best) {
      best = b.rmseLog10;
      suggestedPower = b.power;
    }
  }
  return { power, n: wells.length, ...stats(wells), byPower, suggestedPower, wells };
}

/**
 * Places inside the mask where a new test would tell the most — Kfield's own heuristic, not a published
 * method: each cell scores (distance to the nearest well, m) × (1 + standard deviation of log10 K of its
 * 6 nearest wells), so spots far from any well and among wells that disagree come first. Spots are
 * taken greedily, best first, each at least max(2 cells, ½·√(mask area / count)) from those already
 * taken, so they spread over the outline instead of crowding one corner. Throws for no well.
 * The surface options are accepted for the caller's convenience but do not change the score: a surface
 * of one nearest neighbour, or a short search radius, should not blind the ranking to disagreement.
 */
export function nextTestSpots(points: IdwPoint[], grid: GridSpec, mask: Uint8Array, count = 5, _o?: IdwOptions): TestSpot[] {
  const { minX, minY, cellSizeM: cell, cols, rows } = grid;
  if (mask.length !== cols * rows) throw new Error(`The mask has ${mask.length} cells; the grid has ${cols * rows}`);
  if (!points.length) throw new Error('Next test spots need at least one well with K');
  const n = points.length;
  const k = Math.min(n, SPREAD_NEIGHBOURS);
  const xs = Float64Array.from(points, (p) => p.x);
  const ys = Float64Array.from(points, (p) => p.y);
  const zs = Float64Array.from(points, (p) => p.z);
  const index = new PointIndex(xs, ys);
  const heap = new KnnHeap(k);

  const cells: number[] = [];
  const score = new Float64Array(cols * rows);
  const nearest = new Float64Array(cols * rows);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const c = i % cols;
    const r = (i - c) / cols;
    index.knn(minX + (c + 0.5) * cell, minY + (rows - r - 0.5) * cell, Number.POSITIVE_INFINITY, heap);
    let d2min = Number.POSITIVE_INFINITY;
    let mean = 0;
    for (let j = 0; j < heap.size; j++) {
      d2min = Math.min(d2min, heap.d2[j]);
      mean += zs[heap.idx[j]] / heap.size;
    }
    let v = 0;
    for (let j = 0; j < heap.size; j++) v += (zs[heap.idx[j]] - mean) ** 2 / heap.size;
    nearest[i] = Math.sqrt(d2min);
    score[i] = nearest[i] * (1 + Math.sqrt(v));
    cells.push(i);
  }
  if (!cells.length || count < 1) return [];
  cells.sort((a, b) => score[b] - score[a]);
  const spacing = Math.max(2 * cell, 0.5 * Math.sqrt((cells.length * cell * cell) / count));
  const spots: TestSpot[] = [];
  for (const i of cells) {
    if (spots.length >= count) break;
    const c = i % cols;
    const r = (i - c) / cols;
    const x = minX + (c + 0.5) * cell;
    const y = minY + (rows - r - 0.5) * cell;
    if (spots.some((s) => Math.hypot(s.x - x, s.y - y) < spacing)) continue;
    spots.push({ x, y, score: score[i], nearestWellM: nearest[i] });
  }
  return spots;
}
