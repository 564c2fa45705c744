import proj4 from 'proj4';
import { WGS84_EPSG, type CoordinatesInput } from '@shared/schemas/wells';
import { lookupCrs } from '../sites/crs';

export interface ResolvedCoordinates {
  inputEpsg: number;
  inputX: number;
  inputY: number;
  lon: number;
  lat: number;
  siteX: number;
  siteY: number;
}

export type CoordinateResult = { ok: true; value: ResolvedCoordinates } | { ok: false; field: string; message: string };

const WGS84 = '+proj=longlat +datum=WGS84 +no_defs';

/**
 * Points this close outside a system's published area of use are still accepted: a margin of
 * 0.1° plus 2 % of the area's span, since wells at a zone edge are often kept in one zone.
 */
function insideArea(bbox: [number, number, number, number], lon: number, lat: number): boolean {
  const [w, s, e, n] = bbox;
  const lonSpan = w <= e ? e - w : 360 - (w - e);
  const mLon = 0.1 + 0.02 * lonSpan;
  const mLat = 0.1 + 0.02 * (n - s);
  if (lat < s - mLat || lat > n + mLat) return false;
  if (lonSpan >= 359) return true;
  // An area may cross the antimeridian (west edge greater than the east edge).
  return w <= e ? lon >= w - mLon && lon <= e + mLon : lon >= w - mLon || lon <= e + mLon;
}

const deg = (v: number, pos: string, neg: string) => `${Math.abs(v).toFixed(4)}°${v >= 0 ? pos : neg}`;

type Usable = { ok: true; proj4: string; name: string; bbox: [number, number, number, number] | null; geographic: boolean } | { ok: false; message: string };

function usableCrs(code: number): Usable {
  const crs = lookupCrs(code);
  if (!crs) return { ok: false, message: `Unknown EPSG code ${code}: not a coordinate reference system that proj4 can use` };
  if (/\+proj=geocent\b/.test(crs.proj4)) return { ok: false, message: `EPSG:${code} (${crs.name}) is geocentric (x, y, z); choose a projected system or latitude/longitude` };
  return { ok: true, proj4: crs.proj4, name: crs.name, bbox: crs.bbox, geographic: /\+proj=longlat\b/.test(crs.proj4) };
}

/**
 * Entered coordinates → as entered, WGS 84 and the site's system (proj4 with epsg-index, one
 * code at a time). Refuses points outside the area of use of the entered system or the site's.
 */
export function resolveCoordinates(c: CoordinatesInput, siteEpsg: number): CoordinateResult {
  const site = usableCrs(siteEpsg);
  if (!site.ok) return { ok: false, field: 'coordinates', message: `The site's ${site.message}` };
  let inputEpsg: number;
  let inputX: number;
  let inputY: number;
  let lon: number;
  let lat: number;
  let inputName: string;
  let inputBbox: [number, number, number, number] | null;
  if (c.kind === 'latlon') {
    [inputEpsg, inputX, inputY, lon, lat, inputName, inputBbox] = [WGS84_EPSG, c.lon, c.lat, c.lon, c.lat, 'WGS 84', null];
  } else {
    const from = usableCrs(c.epsg);
    if (!from.ok) return { ok: false, field: 'coordinates.epsg', message: from.message };
    if (from.geographic && (Math.abs(c.y) > 90 || Math.abs(c.x) > 360)) {
      return { ok: false, field: 'coordinates', message: `EPSG:${c.epsg} (${from.name}) takes longitude as x and latitude as y in degrees; ${c.x}, ${c.y} are not degrees` };
    }
    [inputEpsg, inputX, inputY, inputName, inputBbox] = [c.epsg, c.x, c.y, from.name, from.bbox];
    try {
      [lon, lat] = proj4(from.proj4, WGS84, [c.x, c.y]);
    } catch {
      lon = lat = Number.NaN;
    }
    if (!Number.isFinite(lon) || !Number.isFinite(lat)) {
      return { ok: false, field: 'coordinates', message: `Easting ${c.x}, northing ${c.y} cannot be converted from EPSG:${c.epsg} (${from.name}); check the system and the numbers` };
    }
  }
  const where = `${deg(lat, 'N', 'S')} ${deg(lon, 'E', 'W')}`;
  if (inputBbox && !insideArea(inputBbox, lon, lat)) {
    const swapped = c.kind === 'epsg' ? ' Check the system, and that easting and northing are not swapped.' : '';
    return { ok: false, field: 'coordinates', message: `These coordinates fall at ${where}, outside the area of use of EPSG:${inputEpsg} (${inputName}).${swapped}` };
  }
  if (site.bbox && !insideArea(site.bbox, lon, lat)) {
    return { ok: false, field: 'coordinates', message: `These coordinates fall at ${where}, outside the area of use of the site's system EPSG:${siteEpsg} (${site.name}).` };
  }
  let siteX: number;
  let siteY: number;
  if (c.kind === 'epsg' && c.epsg === siteEpsg) return { ok: true, value: { inputEpsg, inputX, inputY, lon, lat, siteX: c.x, siteY: c.y } };
  try {
    [siteX, siteY] = proj4(WGS84, site.proj4, [lon, lat]);
  } catch {
    siteX = siteY = Number.NaN;
  }
  if (!Number.isFinite(siteX) || !Number.isFinite(siteY)) {
    return { ok: false, field: 'coordinates', message: `The point at ${where} cannot be expressed in the site's system EPSG:${siteEpsg} (${site.name})` };
  }
  return { ok: true, value: { inputEpsg, inputX, inputY, lon, lat, siteX, siteY } };
}

/** WGS 84 → another system, for re-expressing wells when a site changes its system. */
export function fromWgs84(epsg: number, lon: number, lat: number): CoordinateResult {
  return resolveCoordinates({ kind: 'latlon', lat, lon }, epsg);
}
