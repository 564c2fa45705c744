/** Inverse distance weighting (Shepard 1968) of z = log10 K on projected metres. */
import KDBush from 'kdbush';

export interface IdwPoint {
  x: number;
  y: number;
  z: number;
  id?: string;
}

export type DistanceFn = (x1: number, y1: number, x2: number, y2: number) => number;

export interface IdwOptions {
  /** Default 2. */
  power?: number;
  /** Nearest-k; null/undefined = all points. */
  neighbours?: number | null;
  searchRadiusM?: number | null;
  /** Default Euclidean. Given only for reference comparisons (e.g. great-circle); a slower path. */
  distance?: DistanceFn;
}

/** Cell centres at minX + (c + 0.5)·cell, y = minY + (rows − r − 0.5)·cell: row 0 is the northern row. */
export interface GridSpec {
  minX: number;
  minY: number;
  cellSizeM: number;
  cols: number;
  rows: number;
}

/** A grid larger than this (16 MB of Float32) is refused by gridFor. */
export const MAX_GRID_CELLS = 4_000_000;

export function cellCentre(grid: GridSpec, c: number, r: number): { x: number; y: number } {
  return { x: grid.minX + (c + 0.5) * grid.cellSizeM, y: grid.minY + (grid.rows - r - 0.5) * grid.cellSizeM };
}

interface Resolved {
  power: number;
  k: number;
  r2: number;
  distance: DistanceFn | undefined;
}

function resolve(o: IdwOptions | undefined, n: number): Resolved {
  const power = o?.power ?? 2;
  if (!(Number.isFinite(power) && power > 0)) throw new Error(`IDW power must be a positive number (got ${power})`);
  const nb = o?.neighbours;
  if (nb != null && !(Number.isInteger(nb) && nb >= 1)) throw new Error(`IDW neighbours must be a whole number ≥ 1 (got ${nb})`);
  const radius = o?.searchRadiusM;
  if (radius != null && !(radius > 0)) throw new Error(`IDW search radius must be greater than 0 (got ${radius})`);
  return { power, k: nb == null ? n : Math.min(nb, n), r2: radius == null ? Number.POSITIVE_INFINITY : radius * radius, distance: o?.distance };
}

function checkPoints(points: IdwPoint[]): void {
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    if (!(Number.isFinite(p.x) && Number.isFinite(p.y) && Number.isFinite(p.z))) {
      throw new Error(`IDW point ${p.id ?? `#${i}`} has a non-finite x, y or z (${p.x}, ${p.y}, ${p.z})`);
    }
  }
}

/** Weight from a squared distance: d^−p = (d²)^(−p/2), with the common powers spelled out (Math.pow is slow). */
function weightFn(power: number): (d2: number) => number {
  if (power === 2) return (d2) => 1 / d2;
  if (power === 1) return (d2) => 1 / Math.sqrt(d2);
  if (power === 3) return (d2) => 1 / (d2 * Math.sqrt(d2));
  if (power === 4) return (d2) => 1 / (d2 * d2);
  // Half-integer powers (the cross-validation set 1, 1.5, 2, 2.5, 3 and the like) with square roots
  // and products, several times faster than Math.pow.
  const twice = power * 2;
  if (Number.isInteger(twice) && twice <= 16) {
    const whole = Math.floor(power);
    const half = twice % 2 === 1;
    return (d2) => {
      const d = Math.sqrt(d2);
      let v = half ? Math.sqrt(d) : 1;
      for (let i = 0; i < whole; i++) v *= d;
      return 1 / v;
    };
  }
  const e = -power / 2;
  return (d2) => Math.pow(d2, e);
}

/** A bounded max-heap of (squared distance, index): the k nearest seen so far. */
export class KnnHeap {
  readonly d2: Float64Array;
  readonly idx: Int32Array;
  size = 0;
  constructor(readonly cap: number) {
    this.d2 = new Float64Array(Math.max(1, cap));
    this.idx = new Int32Array(Math.max(1, cap));
  }
  top(): number {
    return this.size < this.cap ? Number.POSITIVE_INFINITY : this.d2[0];
  }
  push(d: number, i: number): void {
    const { d2, idx } = this;
    if (this.size < this.cap) {
      let j = this.size++;
      while (j > 0) {
        const parent = (j - 1) >> 1;
        if (d2[parent] >= d) break;
        d2[j] = d2[parent];
        idx[j] = idx[parent];
        j = parent;
      }
      d2[j] = d;
      idx[j] = i;
    } else if (d < d2[0]) {
      const n = this.size;
      let j = 0;
      for (;;) {
        let child = 2 * j + 1;
        if (child >= n) break;
        if (child + 1 < n && d2[child + 1] > d2[child]) child++;
        if (d2[child] <= d) break;
        d2[j] = d2[child];
        idx[j] = idx[child];
        j = child;
      }
      d2[j] = d;
      idx[j] = i;
    }
  }
}

/** IDW from candidate squared distances already gathered (exact value where a distance is 0). */
function blend(heap: KnnHeap, z: ArrayLike<number>, weight: (d2: number) => number): number {
  if (heap.size === 0) return Number.NaN;
  let sw = 0;
  let szw = 0;
  let zeroN = 0;
  let zeroSum = 0;
  for (let j = 0; j < heap.size; j++) {
    const d2 = heap.d2[j];
    const zi = z[heap.idx[j]];
    if (d2 === 0) {
      zeroN++;
      zeroSum += zi;
    } else {
      const w = weight(d2);
      sw += w;
      szw += w * zi;
    }
  }
  return zeroN ? zeroSum / zeroN : szw / sw;
}

/**
 * Squared-distance scan of every point (or a custom distance, squared so one code path serves both);
 * `skip` leaves one point out (cross-validation).
 */
function estimateScan(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  zs: ArrayLike<number>,
  x: number,
  y: number,
  r: Resolved,
  weight: (d2: number) => number,
  heap: KnnHeap | null,
  skip = -1,
): number {
  const n = xs.length;
  const dist = r.distance;
  if (heap) {
    heap.size = 0;
    for (let i = 0; i < n; i++) {
      if (i === skip) continue;
      let d2: number;
      if (dist) {
        const d = dist(x, y, xs[i], ys[i]);
        d2 = d * d;
      } else {
        const dx = xs[i] - x;
        const dy = ys[i] - y;
        d2 = dx * dx + dy * dy;
      }
      if (d2 <= r.r2) heap.push(d2, i);
    }
    return blend(heap, zs, weight);
  }
  let sw = 0;
  let szw = 0;
  let used = 0;
  let zeroN = 0;
  let zeroSum = 0;
  for (let i = 0; i < n; i++) {
    if (i === skip) continue;
    let d2: number;
    if (dist) {
      const d = dist(x, y, xs[i], ys[i]);
      d2 = d * d;
    } else {
      const dx = xs[i] - x;
      const dy = ys[i] - y;
      d2 = dx * dx + dy * dy;
    }
    if (d2 > r.r2) continue;
    used++;
    if (d2 === 0) {
      zeroN++;
      zeroSum += zs[i];
    } else {
      const w = weight(d2);
      sw += w;
      szw += w * zs[i];
    }
  }
  if (!used) return Number.NaN;
  return zeroN ? zeroSum / zeroN : szw / sw;
}

/** @internal Leave-one-out support for cross-validation: IDW at point `skip`'s place from the others. */
export function idwLeaveOneOut(points: IdwPoint[], skip: number, o?: IdwOptions): number {
  checkPoints(points);
  const r = resolve(o, points.length - 1);
  const xs = points.map((p) => p.x);
  const ys = points.map((p) => p.y);
  const zs = points.map((p) => p.z);
  const heap = r.k < points.length - 1 ? new KnnHeap(r.k) : null;
  return estimateScan(xs, ys, zs, points[skip].x, points[skip].y, r, weightFn(r.power), heap, skip);
}

/** IDW estimate at (x, y): NaN when no point is in range, exactly z_i where the distance is 0. */
export function idwAt(points: IdwPoint[], x: number, y: number, o?: IdwOptions): number {
  checkPoints(points);
  const r = resolve(o, points.length);
  if (!points.length) return Number.NaN;
  const xs = points.map((p) => p.x);
  const ys = points.map((p) => p.y);
  const zs = points.map((p) => p.z);
  const heap = r.k < points.length ? new KnnHeap(r.k) : null;
  return estimateScan(xs, ys, zs, x, y, r, weightFn(r.power), heap);
}

/** A kd-tree over the points (kdbush's implicit tree) with k-nearest and within-radius walks of our own. */
export class PointIndex {
  readonly ids: Uint16Array | Uint32Array;
  readonly coords: Float64Array;
  readonly nodeSize: number;
  readonly n: number;
  private readonly stack: Float64Array;

  constructor(xs: ArrayLike<number>, ys: ArrayLike<number>, nodeSize = 16) {
    this.n = xs.length;
    const tree = new KDBush(Math.max(1, this.n), nodeSize, Float64Array);
    for (let i = 0; i < this.n; i++) tree.add(xs[i], ys[i]);
    if (!this.n) tree.add(Number.POSITIVE_INFINITY, Number.POSITIVE_INFINITY);
    tree.finish();
    this.ids = tree.ids;
    this.coords = tree.coords as Float64Array;
    this.nodeSize = tree.nodeSize;
    this.stack = new Float64Array(4 * 64);
  }

  /** Fills `heap` with the nearest points within squared radius r2 (heap capacity = k). */
  knn(qx: number, qy: number, r2: number, heap: KnnHeap): void {
    heap.size = 0;
    if (!this.n) return;
    const { ids, coords, nodeSize, stack } = this;
    let sp = 0;
    stack[sp++] = 0;
    stack[sp++] = this.n - 1;
    stack[sp++] = 0;
    stack[sp++] = 0;
    while (sp) {
      const bound = stack[--sp];
      const axis = stack[--sp];
      const right = stack[--sp];
      const left = stack[--sp];
      if (bound > r2 || bound >= heap.top()) continue;
      if (right - left <= nodeSize) {
        for (let i = left; i <= right; i++) {
          const dx = coords[2 * i] - qx;
          const dy = coords[2 * i + 1] - qy;
          const d2 = dx * dx + dy * dy;
          if (d2 <= r2) heap.push(d2, ids[i]);
        }
        continue;
      }
      const m = (left + right) >> 1;
      const mx = coords[2 * m];
      const my = coords[2 * m + 1];
      const dx = mx - qx;
      const dy = my - qy;
      const d2 = dx * dx + dy * dy;
      if (d2 <= r2) heap.push(d2, ids[m]);
      const split = axis === 0 ? qx - mx : qy - my;
      const far = Math.max(bound, split * split);
      // far side first so the near side is walked first
      if (split <= 0) {
        stack[sp++] = m + 1;
        stack[sp++] = right;
        stack[sp++] = 1 - axis;
        stack[sp++] = far;
        stack[sp++] = left;
        stack[sp++] = m - 1;
        stack[sp++] = 1 - axis;
        stack[sp++] = bound;
      } else {
        stack[sp++] = left;
        stack[sp++] = m - 1;
        stack[sp++] = 1 - axis;
        stack[sp++] = far;
        stack[sp++] = m + 1;
        stack[sp++] = right;
        stack[sp++] = 1 - axis;
        stack[sp++] = bound;
      }
    }
  }
}

function checkGrid(grid: GridSpec): void {
  const { minX, minY, cellSizeM, cols, rows } = grid;
  if (!(Number.isFinite(minX) && Number.isFinite(minY) && cellSizeM > 0 && Number.isFinite(cellSizeM))) {
    throw new Error('The grid needs a finite origin and a cell size greater than 0');
  }
  if (!(Number.isInteger(cols) && Number.isInteger(rows) && cols >= 1 && rows >= 1)) {
    throw new Error(`The grid needs whole, positive column and row counts (got ${cols} × ${rows})`);
  }
}

/**
 * IDW over the grid's cell centres, row-major from the north-west cell. NaN where the mask is 0 or no
 * point is in range. Values are stored as Float32 (a cell on a well holds Math.fround(z)).
 */
export function idwGrid(points: IdwPoint[], grid: GridSpec, o?: IdwOptions, mask?: Uint8Array): Float32Array {
  checkGrid(grid);
  checkPoints(points);
  const { minX, minY, cellSizeM: cell, cols, rows } = grid;
  const total = cols * rows;
  if (mask && mask.length !== total) throw new Error(`The mask has ${mask.length} cells; the grid has ${total}`);
  const out = new Float32Array(total).fill(Number.NaN);
  const n = points.length;
  if (!n) return out;
  const r = resolve(o, n);
  const weight = weightFn(r.power);
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  const zs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xs[i] = points[i].x;
    ys[i] = points[i].y;
    zs[i] = points[i].z;
  }

  if (r.distance) {
    const heap = r.k < n ? new KnnHeap(r.k) : null;
    for (let row = 0; row < rows; row++) {
      const y = minY + (rows - row - 0.5) * cell;
      for (let c = 0; c < cols; c++) {
        const i = row * cols + c;
        if (mask && !mask[i]) continue;
        out[i] = estimateScan(xs, ys, zs, minX + (c + 0.5) * cell, y, r, weight, heap);
      }
    }
    return out;
  }

  if (r.k >= n && r.r2 === Number.POSITIVE_INFINITY) {
    // every point: a plain loop over typed arrays, the power-2 case inlined
    const p2 = r.power === 2;
    for (let row = 0; row < rows; row++) {
      const y = minY + (rows - row - 0.5) * cell;
      for (let c = 0; c < cols; c++) {
        const idx = row * cols + c;
        if (mask && !mask[idx]) continue;
        const x = minX + (c + 0.5) * cell;
        let sw = 0;
        let szw = 0;
        let exact = Number.NaN;
        for (let i = 0; i < n; i++) {
          const dx = xs[i] - x;
          const dy = ys[i] - y;
          const d2 = dx * dx + dy * dy;
          if (d2 === 0) {
            exact = Number.isNaN(exact) ? zs[i] : exact;
            if (exact !== zs[i]) {
              exact = estimateScan(xs, ys, zs, x, y, r, weight, null);
              break;
            }
            continue;
          }
          const w = p2 ? 1 / d2 : weight(d2);
          sw += w;
          szw += w * zs[i];
        }
        out[idx] = Number.isNaN(exact) ? szw / sw : exact;
      }
    }
    return out;
  }

  const index = new PointIndex(xs, ys);
  const heap = new KnnHeap(r.k);
  for (let row = 0; row < rows; row++) {
    const y = minY + (rows - row - 0.5) * cell;
    for (let c = 0; c < cols; c++) {
      const idx = row * cols + c;
      if (mask && !mask[idx]) continue;
      index.knn(minX + (c + 0.5) * cell, y, r.r2, heap);
      out[idx] = blend(heap, zs, weight);
    }
  }
  return out;
}

/** About `targetCells` cells across the longer side of the bounds (or the given cell size), centred on them. */
export function gridFor(bounds: { minX: number; minY: number; maxX: number; maxY: number }, cellSizeM?: number, targetCells = 200): GridSpec {
  const { minX, minY, maxX, maxY } = bounds;
  if (![minX, minY, maxX, maxY].every(Number.isFinite) || maxX < minX || maxY < minY) {
    throw new Error('The grid bounds must be finite, with max ≥ min');
  }
  const width = maxX - minX;
  const height = maxY - minY;
  let cell = cellSizeM;
  if (cell === undefined) {
    if (!(width > 0 || height > 0)) throw new Error('The bounds have no extent (one well?): give a cell size');
    if (!(Number.isInteger(targetCells) && targetCells >= 1)) throw new Error('The target cell count must be a whole number ≥ 1');
    cell = Math.max(width, height) / targetCells;
  }
  if (!(Number.isFinite(cell) && cell > 0)) throw new Error(`The cell size must be greater than 0 (got ${cell})`);
  const count = (extent: number) => Math.max(1, Math.ceil(extent / cell - 1e-9));
  const cols = count(width);
  const rows = count(height);
  if (cols * rows > MAX_GRID_CELLS) {
    throw new Error(`A ${cell} m cell gives ${cols} × ${rows} cells, more than ${MAX_GRID_CELLS.toLocaleString('en-US')}: choose a larger cell size`);
  }
  return {
    minX: (minX + maxX) / 2 - (cols * cell) / 2,
    minY: (minY + maxY) / 2 - (rows * cell) / 2,
    cellSizeM: cell,
    cols,
    rows,
  };
}
