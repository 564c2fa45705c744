/// <reference lib="webworker" />
import { idwGrid, type GridSpec, type IdwOptions, type IdwPoint } from '@shared/geo/idw';
import { polygonMask } from '@shared/geo/polygon-mask';

export interface SurfaceRequest {
  id: number;
  points: IdwPoint[];
  grid: GridSpec;
  options: IdwOptions;
  /** MultiPolygon rings in the grid's metres; null: no outline. */
  rings: number[][][][] | null;
  /** Names the grid and outline, so a change of power reuses the mask. */
  maskKey: string;
}

export type SurfaceResponse = { id: number; values: Float32Array; ms: number } | { id: number; error: string };

declare const self: DedicatedWorkerGlobalScope;

let cached: { key: string; mask: Uint8Array | undefined } | null = null;

self.onmessage = (e: MessageEvent<SurfaceRequest>) => {
  const { id, points, grid, options, rings, maskKey } = e.data;
  try {
    const started = performance.now();
    if (cached?.key !== maskKey) cached = { key: maskKey, mask: rings ? polygonMask(grid, rings) : undefined };
    const mask = cached.mask;
    const values = idwGrid(points, grid, options, mask);
    if (mask) for (let i = 0; i < values.length; i++) if (!mask[i]) values[i] = NaN;
    const response: SurfaceResponse = { id, values, ms: performance.now() - started };
    self.postMessage(response, [values.buffer]);
  } catch (error) {
    self.postMessage({ id, error: error instanceof Error ? error.message : String(error) } satisfies SurfaceResponse);
  }
};
