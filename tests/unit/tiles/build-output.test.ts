import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { VectorTile } from '@mapbox/vector-tile';
import Database from 'better-sqlite3';
import { PbfReader } from 'pbf';
import { beforeAll, describe, expect, it } from 'vitest';
import { LOCAL_LAYERS, WORLD_LAYERS } from '@shared/geo/basemap';
import { lonLatToTile, tmsRow } from '@shared/geo/tiles';
import { DEMO_WELL_ROWS } from '../../../server/db/seed/demo-wells';
import { inside } from '../../../tiles/sources/geometry';
import { DEMO_ORIGIN, SITE_BOUNDARY_M, toLonLat } from '../../../tiles/sources/demo-area';

const MBTILES = path.resolve('tiles/dist/basemap.mbtiles');
let db: Database.Database;

beforeAll(() => {
  // Builds tiles/dist when it is missing or out of date (about 15 s); a no-op otherwise.
  const r = spawnSync(process.execPath, ['tiles/ensure.mjs'], { stdio: 'inherit' });
  expect(r.status).toBe(0);
  db = new Database(MBTILES, { readonly: true });
}, 180_000);

function tileAt(z: number, x: number, y: number): VectorTile {
  const row = db.prepare('SELECT tile_data AS d FROM tiles WHERE zoom_level = ? AND tile_column = ? AND tile_row = ?').get(z, x, tmsRow(z, y)) as { d: Buffer } | undefined;
  expect(row, `tile ${z}/${x}/${y}`).toBeDefined();
  expect([row!.d[0], row!.d[1]], 'gzip magic').toEqual([0x1f, 0x8b]);
  return new VectorTile(new PbfReader(zlib.gunzipSync(row!.d)));
}

describe('the built basemap', () => {
  it('describes itself as a vector MBTiles of Natural Earth and an invented area', () => {
    const meta = Object.fromEntries((db.prepare('SELECT name, value FROM metadata').all() as { name: string; value: string }[]).map((r) => [r.name, r.value]));
    expect(meta).toMatchObject({ format: 'pbf', minzoom: '0', maxzoom: '16' });
    expect(meta.attribution).toMatch(/Natural Earth/);
    expect(meta.attribution).toMatch(/invented/);
    expect(meta.bounds.split(',').map(Number)).toHaveLength(4);
    const ids = (JSON.parse(meta.json).vector_layers as { id: string }[]).map((l) => l.id);
    expect(ids).toEqual([...WORLD_LAYERS, ...LOCAL_LAYERS]);
  });

  it('has streets, buildings, land use, water and the site boundary in the tile over the demo wells at zoom 15', () => {
    const [lon, lat] = toLonLat([0, 0]);
    const { x, y } = lonLatToTile(lon, lat, 15);
    const tile = tileAt(15, x, y);
    for (const layer of ['road', 'building', 'landuse', 'site']) expect(Object.keys(tile.layers)).toContain(layer);
    const roads = tile.layers.road;
    const names = Array.from({ length: roads.length }, (_, i) => roads.feature(i).properties.name).filter(Boolean);
    expect(names).toContain('Depot Road');
    expect(tile.layers.site.feature(0).properties.name).toBe('Willow Bend former fuel depot');
    // The build-only minzoom tag is not written into the tiles.
    expect(Object.keys(roads.feature(0).properties)).not.toContain('minzoom');
  });

  it('draws the river with its name and the world land at small scales', () => {
    const [lon, lat] = toLonLat([0, 400]);
    const { x, y } = lonLatToTile(lon, lat, 13);
    const waterway = tileAt(13, x, y).layers.waterway;
    const names = Array.from({ length: waterway.length }, (_, i) => waterway.feature(i).properties.name);
    expect(names).toContain('River Tamsel');
    expect(Object.keys(tileAt(0, 0, 0).layers)).toEqual(['earth']);
    // Europe at zoom 2: land, borders and country names.
    expect(Object.keys(tileAt(2, 2, 1).layers)).toEqual(expect.arrayContaining(['earth', 'boundary', 'country_label']));
    expect(Object.keys(tileAt(8, lonLatToTile(lon, lat, 8).x, lonLatToTile(lon, lat, 8).y).layers)).toContain('earth');
  });

  it('writes no large-scale tiles outside the demo area', () => {
    const far = lonLatToTile(-3.7, 40.4, 14);
    expect(db.prepare('SELECT COUNT(*) AS n FROM tiles WHERE zoom_level = 14 AND tile_column = ? AND tile_row = ?').get(far.x, tmsRow(14, far.y))).toEqual({ n: 0 });
  });

  it('keeps the invented site boundary around every demo well, clear of the river', () => {
    for (const [name, easting, northing] of DEMO_WELL_ROWS) {
      expect(inside([easting - DEMO_ORIGIN.easting, northing - DEMO_ORIGIN.northing], SITE_BOUNDARY_M), name).toBe(true);
    }
  });

  it('stays reasonably small', () => {
    expect(fs.statSync(MBTILES).size).toBeLessThan(20 * 1024 * 1024);
  });
});
