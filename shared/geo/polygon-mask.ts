import type { GridSpec } from './idw';

/** 1 where the cell centre lies inside the MultiPolygon (coordinates in the grid's projected metres). */
export function polygonMask(_grid: GridSpec, _rings: number[][][][]): Uint8Array {
  throw new Error('not implemented');
}
