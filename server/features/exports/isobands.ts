import { area, featureCollection, isobands, point } from '@turf/turf';
import type { Feature, MultiPolygon, Point } from 'geojson';
import type { GridSpec } from '@shared/geo/idw';

export interface BandProperties {
  lowerLog10K: number;
  upperLog10K: number;
  lowerKMetersPerSecond: number;
  upperKMetersPerSecond: number;
  /** Geodesic area of the band, m². */
  areaM2: number;
}

/** Below every real log10 K: empty cells (outside the outline, beyond the search radius) join no band. */
const EMPTY = -99;

/**
 * Bands of log10 K every `stepLog10`: each band's outline goes halfway between the cell centres in
 * the band and those outside it. turf's isobands is planar, so it runs in the grid's metres and
 * only its rings are turned into WGS84.
 */
export function surfaceIsobands(
  grid: GridSpec,
  values: Float32Array,
  stepLog10: number,
  toWgs84: (x: number, y: number) => [number, number],
): Feature<MultiPolygon, BandProperties>[] {
  let min = Infinity;
  let max = -Infinity;
  const points: Feature<Point, { z: number }>[] = [];
  const zs: number[] = [];
  for (let r = 0; r < grid.rows; r++)
    for (let c = 0; c < grid.cols; c++) {
      const v = values[r * grid.cols + c];
      const z = Number.isFinite(v) ? v : EMPTY;
      if (z !== EMPTY) {
        if (v < min) min = v;
        if (v > max) max = v;
      }
      zs.push(z);
      points.push(point([grid.minX + (c + 0.5) * grid.cellSizeM, grid.minY + (grid.rows - r - 0.5) * grid.cellSizeM], { z }));
    }
  if (!Number.isFinite(min) || grid.rows < 2 || grid.cols < 2) return [];
  // Whole steps (rounded so that 0.1 steps stay on round numbers) from below the lowest cell to above the highest.
  const snap = (v: number) => Math.round(v * 1e9) / 1e9;
  const breaks: number[] = [];
  for (let b = Math.floor(min / stepLog10) * stepLog10; b <= max + stepLog10 * 1e-9; b += stepLog10) breaks.push(snap(b));
  if (breaks[breaks.length - 1] <= max) breaks.push(snap(breaks[breaks.length - 1] + stepLog10));
  // One band at a time, traced on an indicator of its cells (1 inside the range, 0 elsewhere) at 0.5:
  // turf's multi-break isobands can leave a lower band's area inside a higher one without a hole.
  const out: Feature<MultiPolygon, BandProperties>[] = [];
  for (let i = 0; i + 1 < breaks.length; i++) {
    const lower = breaks[i];
    const upper = breaks[i + 1];
    let any = false;
    // 2 in the band, 1 elsewhere (turf skips a z of 0).
    points.forEach((p, j) => {
      const inBand = zs[j] >= lower && zs[j] < upper;
      p.properties.z = inBand ? 2 : 1;
      any ||= inBand;
    });
    if (!any) continue;
    const [band] = isobands(featureCollection(points), [1.5, 3], { zProperty: 'z' }).features;
    if (!band || !band.geometry.coordinates.length) continue;
    const coordinates = regroup(band.geometry.coordinates.flat() as [number, number][][]).map((poly) => poly.map((ring) => ring.map(([x, y]) => toWgs84(x, y))));
    const f: Feature<MultiPolygon, BandProperties> = {
      type: 'Feature',
      geometry: { type: 'MultiPolygon', coordinates },
      properties: { lowerLog10K: lower, upperLog10K: upper, lowerKMetersPerSecond: 10 ** lower, upperKMetersPerSecond: 10 ** upper, areaM2: 0 },
    };
    f.properties.areaM2 = area(f);
    out.push(f);
  }
  return out;
}

function inside([x, y]: [number, number], ring: [number, number][]): boolean {
  let c = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) c = !c;
  }
  return c;
}

const ringArea = (ring: [number, number][]) => {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  return Math.abs(a / 2);
};

/**
 * Polygons from non-crossing rings by nesting depth: a ring inside an even number of others is an
 * outer ring, one inside an odd number is a hole of the smallest ring around it. turf's isobands
 * groups rings itself, but leaves a hole out where the band has an island inside a hole.
 */
export function regroup(rings: [number, number][][]): [number, number][][][] {
  const areas = rings.map(ringArea);
  const parents = rings.map((r, i) => rings.map((o, j) => j).filter((j) => j !== i && areas[j] > areas[i] && inside(r[0], rings[j])));
  const polygons = new Map<number, [number, number][][]>();
  rings.forEach((r, i) => {
    if (parents[i].length % 2 === 0) polygons.set(i, [r]);
  });
  rings.forEach((r, i) => {
    if (parents[i].length % 2 === 0) return;
    const parent = parents[i].reduce((best, j) => (areas[j] < areas[best] ? j : best));
    polygons.get(parent)?.push(r);
  });
  return [...polygons.values()];
}
