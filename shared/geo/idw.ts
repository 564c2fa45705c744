/** Inverse distance weighting (Shepard 1968) of z = log10 K on projected metres. */

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
  /** Default Euclidean. Given only for reference comparisons (e.g. great-circle); slower path. */
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

export function cellCentre(grid: GridSpec, c: number, r: number): { x: number; y: number } {
  return { x: grid.minX + (c + 0.5) * grid.cellSizeM, y: grid.minY + (grid.rows - r - 0.5) * grid.cellSizeM };
}

export function idwAt(_points: IdwPoint[], _x: number, _y: number, _o?: IdwOptions): number {
  throw new Error('not implemented');
}

export function idwGrid(_points: IdwPoint[], _grid: GridSpec, _o?: IdwOptions, _mask?: Uint8Array): Float32Array {
  throw new Error('not implemented');
}

export function gridFor(
  _bounds: { minX: number; minY: number; maxX: number; maxY: number },
  _cellSizeM?: number,
  _targetCells = 200,
): GridSpec {
  throw new Error('not implemented');
}
