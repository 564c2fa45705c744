import proj4 from 'proj4';

/* proj4 definitions come from epsg-index, one code at a time (epsg-definitions.ts). */

export const WGS84 = 'EPSG:4326';

/** The site's CRS registered with proj4 under "EPSG:<code>"; null when epsg-index has no proj4 form of it. */
export async function loadCrs(code: number): Promise<string | null> {
  const name = `EPSG:${code}`;
  if (code === 4326) return WGS84;
  if (proj4.defs(name)) return name;
  const { definitions, PREFIX } = await import('./epsg-definitions');
  const load = definitions[`${PREFIX}${code}.json`];
  if (!load) return null;
  const def = await load();
  if (!def) return null;
  proj4.defs(name, def);
  return name;
}

/** Longitude/latitude to the site's x/y (easting, northing in its unit). */
export function toSiteXY(crsName: string, lon: number, lat: number): [number, number] {
  return proj4(WGS84, crsName, [lon, lat]) as [number, number];
}
