import type { FeatureCollection, Point } from 'geojson';
import type { MapWells, MapWellProperties } from '@shared/schemas/map';
import { unitLog10Offset, type DecadeDomain } from './colour';

export type MapWellFeature = MapWells['features'][number];

/** The wells source's properties: the API's plus the histogram bin (−1 without a Well K). */
export type SourceWellProperties = MapWellProperties & { bin: number };

/** Stands for "no hydrostratigraphic unit" in the unit filter. */
export const NO_UNIT = '';

export interface KMapFilter {
  /** Units shown (NO_UNIT for wells without one); null shows every unit. */
  units: readonly string[] | null;
  /** Screen-elevation range in metres; a well is shown when its screen overlaps it. */
  elevationMinM: number | null;
  elevationMaxM: number | null;
}

export const NO_FILTER: KMapFilter = { units: null, elevationMinM: null, elevationMaxM: null };

export function matchesFilter(p: MapWellProperties, f: KMapFilter): boolean {
  if (f.units !== null && !f.units.includes(p.hydroUnit ?? NO_UNIT)) return false;
  // Screen top is the higher elevation.
  if (f.elevationMinM !== null && p.screenTopElevationM < f.elevationMinM) return false;
  if (f.elevationMaxM !== null && p.screenBottomElevationM > f.elevationMaxM) return false;
  return true;
}

export function filterWells(features: readonly MapWellFeature[], f: KMapFilter): MapWellFeature[] {
  if (f.units === null && f.elevationMinM === null && f.elevationMaxM === null) return [...features];
  return features.filter((w) => matchesFilter(w.properties, f));
}

export function hasWellK(p: MapWellProperties): p is MapWellProperties & { log10K: number; wellK: number } {
  return p.log10K !== null && p.wellK !== null;
}

/** Histogram bins per decade of the legend's unit. */
export const BINS_PER_DECADE = 4;

export interface KBin {
  index: number;
  /** Bin edges as log10 K in the domain's unit (quarter decades). */
  fromLog10: number;
  toLog10: number;
  count: number;
}

/** The bin (0-based) of a log10 K in m/s; the top edge of the domain belongs to the last bin. */
export function binOf(domain: DecadeDomain, log10KSi: number, binsPerDecade = BINS_PER_DECADE): number {
  const n = (domain.toDecade - domain.fromDecade) * binsPerDecade;
  const x = (log10KSi + unitLog10Offset(domain.unit) - domain.fromDecade) * binsPerDecade;
  // Values a rounding error below an edge belong to the bin above it.
  const i = Math.floor(x + 1e-9);
  return Math.max(0, Math.min(n - 1, i));
}

export function histogram(features: readonly MapWellFeature[], domain: DecadeDomain, binsPerDecade = BINS_PER_DECADE): KBin[] {
  const n = (domain.toDecade - domain.fromDecade) * binsPerDecade;
  const bins: KBin[] = Array.from({ length: n }, (_, index) => ({
    index,
    fromLog10: domain.fromDecade + index / binsPerDecade,
    toLog10: domain.fromDecade + (index + 1) / binsPerDecade,
    count: 0,
  }));
  for (const w of features) {
    if (hasWellK(w.properties)) bins[binOf(domain, w.properties.log10K, binsPerDecade)].count++;
  }
  return bins;
}

/** The features the map draws: the filtered wells with their bin, as one GeoJSON source. */
export function sourceData(features: readonly MapWellFeature[], domain: DecadeDomain): FeatureCollection<Point, SourceWellProperties> {
  return {
    type: 'FeatureCollection',
    features: features.map((w) => ({
      type: 'Feature',
      id: w.id,
      geometry: w.geometry,
      properties: { ...w.properties, bin: hasWellK(w.properties) ? binOf(domain, w.properties.log10K) : -1 },
    })),
  };
}

/** [west, south, east, north] of some wells, or null for none. */
export function boundsOf(features: readonly MapWellFeature[]): [number, number, number, number] | null {
  if (features.length === 0) return null;
  let w = Infinity;
  let s = Infinity;
  let e = -Infinity;
  let n = -Infinity;
  for (const f of features) {
    const [lon, lat] = f.geometry.coordinates;
    if (lon < w) w = lon;
    if (lon > e) e = lon;
    if (lat < s) s = lat;
    if (lat > n) n = lat;
  }
  return [w, s, e, n];
}

/** The hydrostratigraphic units present among the wells, the site's list first, then any others. */
export function unitsPresent(features: readonly MapWellFeature[], siteUnits: readonly string[]): string[] {
  const seen = new Set<string>();
  for (const f of features) seen.add(f.properties.hydroUnit ?? NO_UNIT);
  const ordered = siteUnits.filter((u) => seen.has(u));
  for (const u of [...seen].sort()) if (u !== NO_UNIT && !ordered.includes(u)) ordered.push(u);
  if (seen.has(NO_UNIT)) ordered.push(NO_UNIT);
  return ordered;
}

/** Pixels between neighbouring wells at which their names can be written without running into each other. */
export const LABEL_SPACING_PX = 80;
const METRES_PER_PIXEL_AT_ZOOM_0 = 78271.517; // 512-pixel tiles at the equator (WGS 84 a = 6 378 137 m)
const METRES_PER_DEGREE_LAT = 111_320;

/** Screen pixels per metre on the ground at a zoom and latitude (web mercator, 512-pixel tiles). */
export function pixelsPerMetre(zoom: number, latDeg: number): number {
  return 2 ** zoom / (METRES_PER_PIXEL_AT_ZOOM_0 * Math.cos((latDeg * Math.PI) / 180));
}

export interface WellSpacing {
  /** The side of the square each well has to itself in the wells' bounding box. */
  spacingM: number;
  latDeg: number;
}

/** How far apart the wells typically are; null for fewer than two wells. */
export function wellSpacing(features: readonly MapWellFeature[]): WellSpacing | null {
  const b = boundsOf(features);
  if (!b || features.length < 2) return null;
  const latDeg = (b[1] + b[3]) / 2;
  const widthM = (b[2] - b[0]) * METRES_PER_DEGREE_LAT * Math.cos((latDeg * Math.PI) / 180);
  const heightM = (b[3] - b[1]) * METRES_PER_DEGREE_LAT;
  return { spacingM: Math.sqrt(Math.max(widthM * heightM, 1) / features.length), latDeg };
}

/**
 * The zoom from which well names are drawn: where the wells' typical spacing is LABEL_SPACING_PX
 * wide. A dense network gets its names only close up, which also keeps the label placement cheap.
 */
export function labelMinZoom(features: readonly MapWellFeature[]): number {
  const s = wellSpacing(features);
  if (!s) return 14;
  const zoom = Math.log2(LABEL_SPACING_PX / pixelsPerMetre(0, s.latDeg) / s.spacingM);
  return Math.min(19, Math.max(14, Math.round(zoom * 2) / 2));
}
