import { area as turfArea, kinks, multiPolygon } from '@turf/turf';
import type { OutlineGeometry } from '@shared/schemas/ksurface';
import { badRequest } from '../../lib/errors';
import type { GridCrs } from './grid-crs';

export const MAX_OUTLINE_VERTICES = 10_000;
/** How far an outline may reach beyond the box around the site's wells. */
export const MAX_DISTANCE_FROM_WELLS_M = 20_000;

type Ring = [number, number][];
type Polygons = Ring[][];

const refuse = (message: string) => badRequest(message, { geometry: message });
const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** A Feature or a FeatureCollection of one feature is taken for its geometry. */
function unwrap(input: unknown): unknown {
  if (!isObject(input)) return input;
  if (input.type === 'Feature') return input.geometry;
  if (input.type === 'FeatureCollection') {
    const features = Array.isArray(input.features) ? input.features : [];
    if (features.length !== 1) throw refuse(`A FeatureCollection must hold exactly one polygon feature; this one holds ${features.length}`);
    return isObject(features[0]) ? features[0].geometry : undefined;
  }
  return input;
}

const nth = (i: number) => i + 1;

function readPolygons(input: unknown): { type: 'Polygon' | 'MultiPolygon'; polygons: Polygons } {
  const g = unwrap(input);
  const type = isObject(g) ? g.type : undefined;
  if (!isObject(g) || (type !== 'Polygon' && type !== 'MultiPolygon')) {
    throw refuse(`The outline must be a GeoJSON Polygon or MultiPolygon${typeof type === 'string' ? ` (this is a ${type.slice(0, 40)})` : ''}`);
  }
  if (!Array.isArray(g.coordinates)) throw refuse(`The ${type}'s coordinates must be an array`);
  const raw = (type === 'Polygon' ? [g.coordinates] : g.coordinates) as unknown[];
  let vertices = 0;
  for (const p of raw) if (Array.isArray(p)) for (const r of p) if (Array.isArray(r)) vertices += r.length;
  if (vertices > MAX_OUTLINE_VERTICES) throw refuse(`The outline has ${vertices.toLocaleString('en')} vertices; at most 10,000 vertices are taken (simplify it first)`);
  if (!raw.length) throw refuse('The outline has no polygon');
  const polygons: Polygons = raw.map((p, pi) => {
    const where = type === 'MultiPolygon' ? ` of polygon ${nth(pi)}` : '';
    if (!Array.isArray(p) || !p.length) throw refuse(`Polygon ${nth(pi)} must be an array of rings`);
    return p.map((r, ri) => {
      if (!Array.isArray(r)) throw refuse(`Ring ${nth(ri)}${where} must be an array of positions`);
      const ring: Ring = r.map((pos, i) => {
        if (!Array.isArray(pos) || pos.length < 2 || typeof pos[0] !== 'number' || typeof pos[1] !== 'number' || !Number.isFinite(pos[0]) || !Number.isFinite(pos[1])) {
          throw refuse(`Position ${nth(i)} of ring ${nth(ri)}${where} must be two finite numbers (x, y)`);
        }
        return [pos[0], pos[1]];
      });
      if (ring.length < 4) throw refuse(`Ring ${nth(ri)}${where} has ${ring.length} positions; a ring needs at least 4 positions (the first repeated as the last)`);
      const [a, b] = [ring[0], ring[ring.length - 1]];
      if (a[0] !== b[0] || a[1] !== b[1]) throw refuse(`Ring ${nth(ri)}${where} is not closed: its last position must repeat its first`);
      return ring;
    });
  });
  return { type, polygons };
}

export interface CheckedOutline {
  geometry: OutlineGeometry;
  areaM2: number;
}

export interface OutlineArea {
  crs: GridCrs;
  /** The wells' box in grid metres; null for a site without wells. */
  wellsBox: { minX: number; minY: number; maxX: number; maxY: number } | null;
  /** The site's system's area of use [west, south, east, north] in degrees (null: the whole world). */
  areaOfUse: [number, number, number, number] | null;
  areaOfUseLabel: string;
}

function insideAreaOfUse(b: [number, number, number, number], lon: number, lat: number): boolean {
  const [w, s, e, n] = b;
  if (lat < s || lat > n) return false;
  return w <= e ? lon >= w && lon <= e : lon >= w || lon <= e;
}

/**
 * Check an outline (any of the accepted GeoJSON shapes, in WGS84 or the site's system) and return
 * it as a WGS84 Polygon or MultiPolygon with its geodesic area. Every refusal names `geometry`.
 * Inside the site means within 20 km of the box around its wells; a site without wells takes an
 * outline whose every vertex lies inside its system's published area of use.
 */
export function checkOutline(input: unknown, crs: 'wgs84' | 'site', at: OutlineArea): CheckedOutline {
  const { type, polygons } = readPolygons(input);
  const wgs: Polygons = polygons.map((p, pi) =>
    p.map((ring, ri) =>
      ring.map(([x, y], i): [number, number] => {
        const where = `position ${nth(i)} of ring ${nth(ri)}${type === 'MultiPolygon' ? ` of polygon ${nth(pi)}` : ''}`;
        let lon = x;
        let lat = y;
        if (crs === 'site') {
          try {
            [lon, lat] = at.crs.siteToWgs84(x, y);
          } catch {
            lon = lat = Number.NaN;
          }
          if (!Number.isFinite(lon) || !Number.isFinite(lat)) throw refuse(`At ${where}, ${x}, ${y} cannot be converted from the site’s system`);
        }
        if (lat < -90 || lat > 90) throw refuse(`At ${where}, latitude ${lat} is outside −90…90${crs === 'wgs84' ? ' (GeoJSON gives longitude first)' : ''}`);
        if (lon < -180 || lon > 180) throw refuse(`At ${where}, longitude ${lon} is outside −180…180`);
        return [lon, lat];
      }),
    ),
  );
  const crossings = kinks(multiPolygon(wgs));
  if (crossings.features.length) {
    const [lon, lat] = crossings.features[0].geometry.coordinates;
    throw refuse(`The outline crosses itself near ${lat.toFixed(6)}°, ${lon.toFixed(6)}° (lat, lon); draw it without crossing edges`);
  }
  const areaM2 = turfArea(multiPolygon(wgs));
  if (!(areaM2 >= 1)) throw refuse('The outline encloses no area');

  if (at.wellsBox) {
    const b = at.wellsBox;
    let far = 0;
    for (const p of wgs) for (const r of p) for (const [lon, lat] of r) {
      let x = Number.NaN;
      let y = Number.NaN;
      try {
        [x, y] = at.crs.wgs84ToGrid(lon, lat);
      } catch {
        // out of the projection's reach: counted as too far below
      }
      const dx = Math.max(b.minX - x, 0, x - b.maxX);
      const dy = Math.max(b.minY - y, 0, y - b.maxY);
      const d = Number.isFinite(x) && Number.isFinite(y) ? Math.hypot(dx, dy) : Number.POSITIVE_INFINITY;
      if (d > far) far = d;
    }
    if (far > MAX_DISTANCE_FROM_WELLS_M) {
      const km = Number.isFinite(far) ? `${(far / 1000).toFixed(1)} km` : 'too far';
      throw refuse(`The outline reaches ${km} from the site’s wells; it must lie within 20 km of the box around them`);
    }
  } else if (at.areaOfUse) {
    for (const p of wgs) for (const r of p) for (const [lon, lat] of r) {
      if (!insideAreaOfUse(at.areaOfUse, lon, lat)) {
        throw refuse(`The outline reaches ${lat.toFixed(4)}°, ${lon.toFixed(4)}° (lat, lon), outside the area of use of ${at.areaOfUseLabel}; a site without wells takes outlines inside it`);
      }
    }
  }
  const geometry: OutlineGeometry = type === 'Polygon' ? { type, coordinates: wgs[0] } : { type, coordinates: wgs };
  return { geometry, areaM2 };
}

/** The outline's rings in grid metres, as polygonMask takes them. */
export function outlineInGrid(g: OutlineGeometry, crs: GridCrs): number[][][][] {
  const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
  return polys.map((p) => p.map((r) => r.map(([lon, lat]) => crs.wgs84ToGrid(lon, lat))));
}
