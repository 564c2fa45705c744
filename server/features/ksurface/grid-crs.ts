import proj4 from 'proj4';
import { localProjection } from '@shared/geo/local-crs';
import { badRequest } from '../../lib/errors';
import { lookupCrs } from '../sites/crs';
import type { Site } from '../sites/site.entity';

const WGS84 = '+proj=longlat +datum=WGS84 +no_defs';

/** proj4's named linear units, metres per unit (proj4 2.x units table). */
const METRES_PER_UNIT: Record<string, number> = {
  m: 1, km: 1000, dm: 0.1, cm: 0.01, mm: 0.001,
  ft: 0.3048, 'us-ft': 1200 / 3937, yd: 0.9144, 'us-yd': 3600 / 3937, mi: 1609.344, 'us-mi': 6336000 / 3937,
  fath: 1.8288, ch: 20.1168, 'us-ch': 79200 / 3937, link: 0.201168, 'us-link': 792 / 3937, 'ind-ft': 0.30479841, 'ind-yd': 0.91439523,
};

/** Metres per unit of a projected proj4 definition; null when its unit cannot be read. */
export function metresPerUnit(def: string): number | null {
  const toMeter = /\+to_meter=([0-9.eE+-]+)/.exec(def);
  if (toMeter) return Number(toMeter[1]) > 0 ? Number(toMeter[1]) : null;
  const unit = /\+units=([\w-]+)/.exec(def);
  if (!unit) return 1; // proj4's default for a projected system
  return METRES_PER_UNIT[unit[1]] ?? null;
}

/**
 * The metric system a site's surfaces are laid out in, with its conversions. A projected site
 * keeps its own projection; a system in feet gets the same projection in metres (proj4's false
 * easting and northing are always in metres, so only the unit changes). A geographic site gets a
 * local projection centred on its wells (or, with none, on the given point).
 */
export interface GridCrs {
  proj4: string;
  label: string;
  siteGeographic: boolean;
  siteToGrid(x: number, y: number): [number, number];
  gridToSite(x: number, y: number): [number, number];
  gridToWgs84(x: number, y: number): [number, number];
  wgs84ToGrid(lon: number, lat: number): [number, number];
  wgs84ToSite(lon: number, lat: number): [number, number];
  siteToWgs84(x: number, y: number): [number, number];
}

export function siteCrs(site: Site) {
  const crs = lookupCrs(site.epsgCode);
  if (!crs) throw badRequest(`The site's system EPSG:${site.epsgCode} is not one proj4 can use`, { crs: 'Unknown coordinate system' });
  return { ...crs, geographic: /\+proj=longlat\b/.test(crs.proj4) };
}

export function gridCrsFor(site: Site, centre: { lon: number; lat: number } | null): GridCrs {
  const crs = siteCrs(site);
  const site2wgs = proj4(crs.proj4, WGS84);
  const siteToWgs84 = (x: number, y: number) => site2wgs.forward([x, y]) as [number, number];
  const wgs84ToSite = (lon: number, lat: number) => site2wgs.inverse([lon, lat]) as [number, number];
  if (crs.geographic) {
    const c = centre ?? { lon: 0, lat: 0 };
    const def = localProjection(c.lon, c.lat);
    const g = proj4(WGS84, def);
    const wgs84ToGrid = (lon: number, lat: number) => g.forward([lon, lat]) as [number, number];
    const gridToWgs84 = (x: number, y: number) => g.inverse([x, y]) as [number, number];
    return {
      proj4: def,
      label: `Local projection centred on ${c.lat.toFixed(4)}°, ${c.lon.toFixed(4)}° (the site’s EPSG:${site.epsgCode} is in degrees)`,
      siteGeographic: true,
      siteToGrid: (x, y) => wgs84ToGrid(...siteToWgs84(x, y)),
      gridToSite: (x, y) => wgs84ToSite(...gridToWgs84(x, y)),
      gridToWgs84, wgs84ToGrid, wgs84ToSite, siteToWgs84,
    };
  }
  const perUnit = metresPerUnit(crs.proj4);
  if (perUnit === null) throw badRequest(`The unit of the site's system EPSG:${site.epsgCode} cannot be read`, { crs: 'Unknown unit' });
  if (perUnit === 1) {
    return {
      proj4: crs.proj4,
      label: `EPSG:${site.epsgCode} (${crs.name})`,
      siteGeographic: false,
      siteToGrid: (x, y) => [x, y],
      gridToSite: (x, y) => [x, y],
      gridToWgs84: siteToWgs84, wgs84ToGrid: wgs84ToSite, wgs84ToSite, siteToWgs84,
    };
  }
  const def = `${crs.proj4.replace(/\s*\+(units|to_meter)=\S+/g, '')} +units=m`;
  const g = proj4(WGS84, def);
  return {
    proj4: def,
    label: `EPSG:${site.epsgCode} (${crs.name}) in metres`,
    siteGeographic: false,
    // The same projection: only the unit differs.
    siteToGrid: (x, y) => [x * perUnit, y * perUnit],
    gridToSite: (x, y) => [x / perUnit, y / perUnit],
    gridToWgs84: (x, y) => g.inverse([x, y]) as [number, number],
    wgs84ToGrid: (lon, lat) => g.forward([lon, lat]) as [number, number],
    wgs84ToSite, siteToWgs84,
  };
}
