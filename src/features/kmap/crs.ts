import proj4 from 'proj4';
import { crsSchema } from '@shared/schemas/sites';
import { api, isApiError } from '@/lib/api-client';

/* proj4 definitions come from the server's CRS look-up (epsg-index there, one code at a time). */

export const WGS84 = 'EPSG:4326';

/** The site's CRS registered with proj4 under "EPSG:<code>"; null when epsg-index has no proj4 form of it. */
export async function loadCrs(code: number): Promise<string | null> {
  const name = `EPSG:${code}`;
  if (code === 4326) return WGS84;
  if (proj4.defs(name)) return name;
  try {
    const crs = await api.get(`/api/crs/${code}`, crsSchema);
    proj4.defs(name, crs.proj4);
    return name;
  } catch (e) {
    if (isApiError(e) && e.status === 404) return null;
    throw e;
  }
}

/** Longitude/latitude to the site's x/y (easting, northing in its unit). */
export function toSiteXY(crsName: string, lon: number, lat: number): [number, number] {
  return proj4(WGS84, crsName, [lon, lat]) as [number, number];
}
