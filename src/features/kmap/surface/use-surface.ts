import { useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import proj4 from 'proj4';
import { gridFor, type GridSpec, type IdwOptions, type IdwPoint } from '@shared/geo/idw';
import { localProjection } from '@shared/geo/local-crs';
import { loadCrs, WGS84 } from '../crs';
import type { Project } from './model';
import type { SurfaceRequest, SurfaceResponse } from './surface.worker';

export interface GridCrs {
  label: string;
  project: Project;
  unproject: (x: number, y: number) => [number, number];
}

/**
 * The metres the grid is laid out in: the site's own system when it is projected in metres (as
 * the server does), else a local system centred on the wells.
 */
export function useGridCrs(epsgCode: number, crsUnit: string | null, centre: [number, number] | null): GridCrs | null {
  const [siteCrs, setSiteCrs] = useState<{ code: number; name: string | null } | null>(null);
  const metric = epsgCode !== 4326 && crsUnit === 'metre';
  useEffect(() => {
    if (!metric) return;
    let live = true;
    loadCrs(epsgCode).then(
      (name) => live && setSiteCrs({ code: epsgCode, name }),
      () => live && setSiteCrs({ code: epsgCode, name: null }),
    );
    return () => {
      live = false;
    };
  }, [epsgCode, metric]);
  const centreKey = centre ? `${centre[0].toFixed(4)},${centre[1].toFixed(4)}` : '';
  return useMemo(() => {
    let def: string | null = null;
    let label = '';
    if (metric && siteCrs?.code === epsgCode && siteCrs.name) {
      def = siteCrs.name;
      label = `EPSG:${epsgCode}`;
    } else if (metric && siteCrs?.code !== epsgCode) {
      return null;
    } else if (centreKey) {
      const [lon, lat] = centreKey.split(',').map(Number);
      def = localProjection(lon, lat);
      label = 'a local metric system centred on the wells';
    }
    if (!def) return null;
    const converter = proj4(WGS84, def);
    return {
      label,
      project: (lon, lat) => converter.forward([lon, lat]) as [number, number],
      unproject: (x, y) => converter.inverse([x, y]) as [number, number],
    };
  }, [metric, siteCrs, epsgCode, centreKey]);
}

export interface SurfaceInput {
  points: IdwPoint[];
  /** Where the grid goes, in grid metres. */
  bounds: { minX: number; minY: number; maxX: number; maxY: number };
  cellSizeM: number | null;
  options: IdwOptions;
  rings: number[][][][] | null;
  /** Names the outline (and CRS), for the worker's mask cache. */
  outlineKey: string;
}

export type SurfaceState =
  | { status: 'idle' }
  | { status: 'running'; previous: SurfaceResult | null }
  | { status: 'ready'; result: SurfaceResult }
  | { status: 'error'; message: string };

export interface SurfaceResult {
  grid: GridSpec;
  values: Float32Array;
  /** Time in the worker. */
  computeMs: number;
  /** From the settings' change to the values back in the page. */
  totalMs: number;
  power: number;
}

/** The IDW grid computed in a Web Worker from the inputs; a newer input makes an older answer moot. */
export function useSurface(input: SurfaceInput | null): SurfaceState {
  const [state, setState] = useState<SurfaceState>({ status: 'idle' });
  const workerRef = useRef<Worker | null>(null);
  const seq = useRef(0);
  const lastResult = useRef<SurfaceResult | null>(null);

  useEffect(
    () => () => {
      workerRef.current?.terminate();
      workerRef.current = null;
    },
    [],
  );

  // Posted before the browser paints: a slow frame of the map does not delay the worker.
  useLayoutEffect(() => {
    if (!input) {
      setState({ status: 'idle' });
      return;
    }
    let grid: GridSpec;
    try {
      grid = gridFor(input.bounds, input.cellSizeM ?? undefined);
    } catch (error) {
      setState({ status: 'error', message: error instanceof Error ? error.message : String(error) });
      return;
    }
    if (grid.cols * grid.rows > 4_000_000) {
      setState({ status: 'error', message: `That cell size makes ${(grid.cols * grid.rows).toLocaleString('en')} cells; choose a larger one (at most 4 million cells).` });
      return;
    }
    const worker = (workerRef.current ??= new Worker(new URL('./surface.worker.ts', import.meta.url), { type: 'module' }));
    const id = ++seq.current;
    const started = performance.now();
    setState({ status: 'running', previous: lastResult.current });
    const onMessage = (e: MessageEvent<SurfaceResponse>) => {
      if (e.data.id !== id) return;
      worker.removeEventListener('message', onMessage);
      if ('error' in e.data) {
        setState({ status: 'error', message: e.data.error });
        return;
      }
      const result: SurfaceResult = { grid, values: e.data.values, computeMs: e.data.ms, totalMs: performance.now() - started, power: input.options.power ?? 2 };
      lastResult.current = result;
      setState({ status: 'ready', result });
    };
    worker.addEventListener('message', onMessage);
    const maskKey = `${input.outlineKey}|${grid.minX},${grid.minY},${grid.cellSizeM},${grid.cols},${grid.rows}`;
    const request: SurfaceRequest = { id, points: input.points, grid, options: input.options, rings: input.rings, maskKey };
    worker.postMessage(request);
    return () => worker.removeEventListener('message', onMessage);
  }, [input]);

  return state;
}
