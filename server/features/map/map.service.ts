import type Database from 'better-sqlite3';
import type { AppContext } from '../../context';
import { exclusive } from '../../db/serialize';

/*
 * The wells layer is read for thousands of wells at a time, so SQLite writes the GeoJSON itself
 * (json_object / json_group_array) in one statement, with Well K aggregated beside it: the
 * geometric mean of each well's Checked fits that no later revision replaced (Freeze 1975), the
 * count, and the sample standard deviation of log10 K. Numbers are rounded to what a map needs.
 */
const SQL = `
WITH k AS (
  SELECT wellId, count(*) AS n, avg(log10(kMetersPerSecond)) AS m, sum(log10(kMetersPerSecond) * log10(kMetersPerSecond)) AS ss
    FROM fits
   WHERE siteId = @siteId AND status = 'checked' AND supersededAt IS NULL AND kMetersPerSecond > 0
   GROUP BY wellId
), f AS (
  SELECT w.id, w.name, w.status, w.hydroUnit, w.lon, w.lat, w.groundElevationM, w.screenTopDepthM, w.screenBottomDepthM,
         w.screenTopElevationM, w.screenBottomElevationM, k.n, k.m,
         CASE WHEN k.n > 1 THEN sqrt(max(0, (k.ss - k.n * k.m * k.m) / (k.n - 1))) END AS sd
    FROM wells w LEFT JOIN k ON k.wellId = w.id
   WHERE w.siteId = @siteId
)
SELECT json_object(
  'type', 'FeatureCollection',
  'bbox', CASE WHEN count(*) > 0 THEN json_array(round(min(lon), 7), round(min(lat), 7), round(max(lon), 7), round(max(lat), 7)) END,
  'features', json(coalesce(json_group_array(json_object(
    'type', 'Feature', 'id', id,
    'geometry', json_object('type', 'Point', 'coordinates', json_array(round(lon, 7), round(lat, 7))),
    'properties', json_object(
      'id', id, 'name', name, 'status', status, 'hydroUnit', hydroUnit,
      'wellK', CASE WHEN n IS NOT NULL THEN pow(10, m) END, 'log10K', m, 'count', coalesce(n, 0), 'log10StdDev', sd,
      'groundElevationM', round(groundElevationM, 3), 'screenTopDepthM', round(screenTopDepthM, 3),
      'screenBottomDepthM', round(screenBottomDepthM, 3), 'screenTopElevationM', round(screenTopElevationM, 3),
      'screenBottomElevationM', round(screenBottomElevationM, 3))
  )) FILTER (WHERE id IS NOT NULL), '[]'))
) AS geojson
FROM (SELECT * FROM f ORDER BY name)`;

export interface WellsLayer {
  body: Buffer;
  etag: string;
}

/** Cached layers kept per site; a few sites' worth of GeoJSON at most. */
const MAX_CACHED_SITES = 16;

export function createMapService({ ds }: AppContext) {
  const db = (ds.driver as unknown as { databaseConnection: Database.Database }).databaseConnection;
  const stmt = db.prepare(SQL).pluck();
  const versionStmt = db.prepare(`SELECT "version" FROM "map_versions" WHERE "siteId" = ?`).pluck();
  const cache = new Map<string, WellsLayer & { version: number }>();

  /** The site's wells as GeoJSON (WGS84) with Well K, count and spread; rebuilt only after a change. */
  async function wellsLayer(siteId: string): Promise<WellsLayer> {
    // The handle is read directly (one SQL statement builds the GeoJSON): take the connection's turn
    // so that another request's open transaction is never read half done.
    return exclusive(ds, () => build(siteId));
  }
  function build(siteId: string): WellsLayer {
    const version = Number(versionStmt.get(siteId) ?? 0);
    const hit = cache.get(siteId);
    if (hit && hit.version === version) return hit;
    const body = Buffer.from(stmt.get({ siteId }) as string, 'utf8');
    const layer = { body, etag: `W/"wells-${siteId}-${version}"`, version };
    cache.delete(siteId);
    cache.set(siteId, layer);
    if (cache.size > MAX_CACHED_SITES) cache.delete(cache.keys().next().value!);
    return layer;
  }
  return { wellsLayer };
}
