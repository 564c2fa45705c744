/*
 * Web-Mercator tile arithmetic (XYZ: y counts from the north, as maplibre requests tiles).
 * MBTiles stores rows in TMS order, counting from the south: tmsRow flips between the two.
 */
export const MAX_TILE_ZOOM = 24;

/** XYZ y ⇄ TMS tile_row (the same flip both ways). */
export const tmsRow = (z: number, y: number): number => 2 ** z - 1 - y;

export function lonLatToTile(lon: number, lat: number, z: number): { x: number; y: number } {
  const n = 2 ** z;
  const clampedLat = Math.max(-85.05112878, Math.min(85.05112878, lat));
  const rad = (clampedLat * Math.PI) / 180;
  const x = Math.floor(((lon + 180) / 360) * n);
  const y = Math.floor(((1 - Math.log(Math.tan(rad) + 1 / Math.cos(rad)) / Math.PI) / 2) * n);
  return { x: Math.min(n - 1, Math.max(0, x)), y: Math.min(n - 1, Math.max(0, y)) };
}

/** The tiles of zoom z that cover a [west, south, east, north] box. */
export function tileRange(bounds: readonly [number, number, number, number], z: number) {
  const nw = lonLatToTile(bounds[0], bounds[3], z);
  const se = lonLatToTile(bounds[2], bounds[1], z);
  return { minX: nw.x, maxX: se.x, minY: nw.y, maxY: se.y };
}

export const isValidTile = (z: number, x: number, y: number): boolean =>
  Number.isInteger(z) && Number.isInteger(x) && Number.isInteger(y) && z >= 0 && z <= MAX_TILE_ZOOM && x >= 0 && y >= 0 && x < 2 ** z && y < 2 ** z;
