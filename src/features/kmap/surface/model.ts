import { area as turfArea, featureCollection, isobands, point } from '@turf/turf';
import type { Feature, FeatureCollection, MultiPolygon, Point, Polygon } from 'geojson';
import type { GridSpec, IdwPoint } from '@shared/geo/idw';
import { parseColour, type KColourScale } from '../colour';
import type { MapWellFeature } from '../model';

/*
 * The K surface in the browser: the wells and the outline projected onto the grid's metres, the
 * grid painted with the K map's colour scale, the value under the pointer, and the zones above a
 * threshold. The IDW itself is shared/geo/idw.ts, the same code the server runs (in a worker).
 */

export type Project = (lon: number, lat: number) => [number, number];

/** The wells with a Well K as IDW points (x/y in the grid's metres, z = log10 K in m/s). */
export function surfacePoints(wells: readonly MapWellFeature[], project: Project): IdwPoint[] {
  const points: IdwPoint[] = [];
  for (const w of wells) {
    const z = w.properties.log10K;
    if (z === null || !Number.isFinite(z)) continue;
    const [x, y] = project(w.geometry.coordinates[0], w.geometry.coordinates[1]);
    points.push({ x, y, z, id: w.id });
  }
  return points;
}

/** An outline's polygons (WGS84) as rings in the grid's metres: MultiPolygon coordinates. */
export function projectRings(geometry: Polygon | MultiPolygon, project: Project): number[][][][] {
  const polygons = geometry.type === 'Polygon' ? [geometry.coordinates] : geometry.coordinates;
  return polygons.map((rings) => rings.map((ring) => ring.map(([lon, lat]) => project(lon, lat))));
}

export interface Bounds {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

export function ringsBounds(rings: number[][][][]): Bounds {
  const b = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
  for (const polygon of rings)
    for (const ring of polygon)
      for (const [x, y] of ring) {
        b.minX = Math.min(b.minX, x);
        b.minY = Math.min(b.minY, y);
        b.maxX = Math.max(b.maxX, x);
        b.maxY = Math.max(b.maxY, y);
      }
  return b;
}

/** The wells' extent with a margin of a tenth of its size on each side (no outline chosen). */
export function pointsBounds(points: readonly IdwPoint[]): Bounds | null {
  if (points.length === 0) return null;
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const p of points) {
    minX = Math.min(minX, p.x);
    minY = Math.min(minY, p.y);
    maxX = Math.max(maxX, p.x);
    maxY = Math.max(maxY, p.y);
  }
  const m = Math.max(maxX - minX, maxY - minY, 10) / 10;
  return { minX: minX - m, minY: minY - m, maxX: maxX + m, maxY: maxY + m };
}

/** The grid's corners, top-left, top-right, bottom-right, bottom-left, in the grid's metres. */
export function gridCorners(grid: GridSpec): [number, number][] {
  const maxX = grid.minX + grid.cols * grid.cellSizeM;
  const maxY = grid.minY + grid.rows * grid.cellSizeM;
  return [
    [grid.minX, maxY],
    [maxX, maxY],
    [maxX, grid.minY],
    [grid.minX, grid.minY],
  ];
}

/** A lookup table of the scale's colours across its domain: painting 40,000 cells calls no d3. */
export interface ColourTable {
  lo: number;
  hi: number;
  rgb: Uint8Array;
  size: number;
}

export function colourTable(scale: KColourScale, size = 1024): ColourTable {
  const [lo, hi] = scale.domain();
  const rgb = new Uint8Array(size * 3);
  for (let i = 0; i < size; i++) {
    const [r, g, b] = parseColour(scale(lo + ((hi - lo) * (i + 0.5)) / size));
    rgb.set([r, g, b], i * 3);
  }
  return { lo, hi, rgb, size };
}

/** The colour of log10 K (m/s) from the table, clamped to the scale's ends. */
export function tableColour(table: ColourTable, log10K: number): [number, number, number] {
  const i = Math.max(0, Math.min(table.size - 1, Math.floor(((log10K - table.lo) / (table.hi - table.lo)) * table.size)));
  return [table.rgb[i * 3], table.rgb[i * 3 + 1], table.rgb[i * 3 + 2]];
}

/** RGBA pixels of the grid (row 0 north, as an image's top row); empty cells are transparent. */
export function paintSurface(values: Float32Array, table: ColourTable): Uint8ClampedArray<ArrayBuffer> {
  const out = new Uint8ClampedArray(values.length * 4);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    const [r, g, b] = tableColour(table, v);
    out[i * 4] = r;
    out[i * 4 + 1] = g;
    out[i * 4 + 2] = b;
    out[i * 4 + 3] = 255;
  }
  return out;
}

/** The grid's value at x/y (grid metres): the cell holding the point, NaN outside. */
export function valueAt(grid: GridSpec, values: Float32Array, x: number, y: number): number {
  const c = Math.floor((x - grid.minX) / grid.cellSizeM);
  const r = grid.rows - 1 - Math.floor((y - grid.minY) / grid.cellSizeM);
  if (c < 0 || r < 0 || c >= grid.cols || r >= grid.rows) return NaN;
  return values[r * grid.cols + c];
}

export interface SurfaceStats {
  cells: number;
  /** Geometric mean of K over the filled cells, m/s. */
  geometricMeanK: number | null;
  minLog10: number;
  maxLog10: number;
}

export function surfaceStats(values: Float32Array): SurfaceStats {
  let n = 0;
  let sum = 0;
  let minLog10 = Infinity;
  let maxLog10 = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    n++;
    sum += v;
    if (v < minLog10) minLog10 = v;
    if (v > maxLog10) maxLog10 = v;
  }
  return { cells: n, geometricMeanK: n ? 10 ** (sum / n) : null, minLog10, maxLog10 };
}

export interface ZoneProperties {
  thresholdKMetersPerSecond: number;
  areaM2: number;
  cells: number;
  /** Geometric mean of K over the cells above the threshold, m/s. */
  geometricMeanK: number | null;
}

/** Below every real log10 K: empty cells never join a zone. */
const EMPTY = -99;

/**
 * The high-permeability zones: isobands of log10 K from the threshold up, traced on the cell
 * centres in the grid's metres and returned in WGS84 with their area. turf's isobands is planar,
 * so it runs on projected metres and only its output is unprojected.
 */
export function highKZones(
  grid: GridSpec,
  values: Float32Array,
  thresholdLog10: number,
  unproject: (x: number, y: number) => [number, number],
): FeatureCollection<MultiPolygon, ZoneProperties> {
  const points: Feature<Point, { z: number }>[] = [];
  let n = 0;
  let sum = 0;
  let top = thresholdLog10;
  for (let r = 0; r < grid.rows; r++)
    for (let c = 0; c < grid.cols; c++) {
      const v = values[r * grid.cols + c];
      const z = Number.isFinite(v) ? v : EMPTY;
      if (z >= thresholdLog10) {
        n++;
        sum += z;
        if (z > top) top = z;
      }
      points.push(point([grid.minX + (c + 0.5) * grid.cellSizeM, grid.minY + (grid.rows - r - 0.5) * grid.cellSizeM], { z }));
    }
  const properties: ZoneProperties = { thresholdKMetersPerSecond: 10 ** thresholdLog10, areaM2: 0, cells: n, geometricMeanK: n ? 10 ** (sum / n) : null };
  if (n === 0) return featureCollection([]);
  const bands = isobands(featureCollection(points), [thresholdLog10, top + 1], { zProperty: 'z' });
  const features: Feature<MultiPolygon, ZoneProperties>[] = [];
  for (const band of bands.features) {
    const coordinates = band.geometry.coordinates.map((poly) => poly.map((ring) => ring.map(([x, y]) => unproject(x, y))));
    if (coordinates.length === 0) continue;
    const feature: Feature<MultiPolygon, ZoneProperties> = { type: 'Feature', geometry: { type: 'MultiPolygon', coordinates }, properties: { ...properties } };
    feature.properties.areaM2 = turfArea(feature);
    features.push(feature);
  }
  return featureCollection(features);
}

/** An area in m² written in the site's units: m² or hectares, ft² or acres. */
export function formatArea(areaM2: number, units: 'SI' | 'US'): string {
  if (units === 'US') {
    const ft2 = areaM2 / 0.09290304;
    return ft2 >= 43_560 ? `${(ft2 / 43_560).toFixed(2)} acres` : `${Math.round(ft2).toLocaleString('en')} ft²`;
  }
  return areaM2 >= 10_000 ? `${(areaM2 / 10_000).toFixed(2)} ha` : `${Math.round(areaM2).toLocaleString('en')} m²`;
}
