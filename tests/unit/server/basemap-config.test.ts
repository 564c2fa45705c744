import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../../server/config';
import { basemapDir, builtInMbtilesPath } from '../../../server/features/basemaps/basemaps.service';

describe('basemap configuration', () => {
  it('keeps uploaded basemaps in a basemaps folder beside the database unless BASEMAP_DIR says otherwise', () => {
    expect(basemapDir(loadConfig({}))).toBe(path.resolve('data/basemaps'));
    expect(basemapDir(loadConfig({ DATABASE_PATH: '/srv/kfield/db/kfield.sqlite' }))).toBe('/srv/kfield/db/basemaps');
    expect(basemapDir(loadConfig({ BASEMAP_DIR: '/srv/tiles' }))).toBe('/srv/tiles');
  });

  it('reads the built-in basemap from TILES_DIST and bounds uploads by BASEMAP_MAX_UPLOAD_MB', () => {
    expect(builtInMbtilesPath(loadConfig({}))).toBe(path.resolve('tiles/dist/basemap.mbtiles'));
    expect(loadConfig({}).BASEMAP_MAX_UPLOAD_MB).toBe(2048);
    expect(() => loadConfig({ BASEMAP_MAX_UPLOAD_MB: 'lots' })).toThrow(/BASEMAP_MAX_UPLOAD_MB: must be a number of megabytes/);
  });
});
