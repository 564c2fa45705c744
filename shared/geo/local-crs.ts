/**
 * A proj4 string for a local metric system centred on (lon, lat), for sites whose own CRS is geographic:
 * azimuthal equidistant on WGS84, true distances from the centre and small distortion across a site.
 */
export function localProjection(lon: number, lat: number): string {
  if (!(Number.isFinite(lon) && lon >= -180 && lon <= 180)) throw new Error(`Longitude must be within −180…180° (got ${lon})`);
  if (!(Number.isFinite(lat) && lat >= -90 && lat <= 90)) throw new Error(`Latitude must be within −90…90° (got ${lat})`);
  const f = (v: number) => Number(v.toFixed(7)).toString();
  return `+proj=aeqd +lat_0=${f(lat)} +lon_0=${f(lon)} +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs`;
}
