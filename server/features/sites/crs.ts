import { createRequire } from 'node:module';
import proj4 from 'proj4';
import type { Crs } from '@shared/schemas/sites';

const require = createRequire(import.meta.url);

interface EpsgEntry {
  code: string;
  kind: string;
  name: string;
  proj4: string | null;
  bbox: [number, number, number, number] | null;
  unit: string | null;
  area: string | null;
}

const cache = new Map<number, Crs | null>();

/**
 * Look one EPSG code up in epsg-index (one small JSON file per code; the full index is 40 MB) and
 * check that proj4 can build a projection from it. Null when the code is unknown or not a CRS.
 */
export function lookupCrs(code: number): Crs | null {
  if (cache.has(code)) return cache.get(code)!;
  let found: Crs | null = null;
  try {
    const e = require(`epsg-index/s/${code}.json`) as EpsgEntry;
    if (e.kind.startsWith('CRS-') && e.proj4) {
      proj4(e.proj4); // throws when proj4 cannot use the definition
      // epsg-index stores bbox as [north, west, south, east].
      const b = e.bbox;
      found = {
        code,
        name: e.name,
        unit: e.unit,
        area: e.area,
        bbox: b ? [b[1], b[2], b[3], b[0]] : null,
        proj4: e.proj4,
      };
    }
  } catch {
    found = null;
  }
  cache.set(code, found);
  return found;
}
