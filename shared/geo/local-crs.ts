/** A proj4 string for a local metric system centred on (lon, lat), for sites whose own CRS is geographic. */
export function localProjection(_lon: number, _lat: number): string {
  throw new Error('not implemented');
}
