import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { isValidTile, lonLatToTile, tileRange, tmsRow } from '@shared/geo/tiles';
import { MbtilesFile } from '../../../server/features/basemaps/mbtiles';
import { MbtilesWriter } from '../../../tiles/mbtiles-writer';

describe('tile addressing', () => {
  it('flips y between XYZ and the TMS rows of MBTiles, both ways', () => {
    expect(tmsRow(0, 0)).toBe(0);
    expect(tmsRow(1, 0)).toBe(1);
    expect(tmsRow(3, 2)).toBe(5);
    expect(tmsRow(14, 5711)).toBe(16383 - 5711);
    expect(tmsRow(14, tmsRow(14, 5711))).toBe(5711);
  });

  it('finds the tile of a longitude/latitude (OSM slippy-map convention)', () => {
    // Check value from the slippy-map tile formula: 0°/0° is the top-left of tile 1/1 at z1,
    // and 9.160136 E, 47.763255 N (the invented demo site) is tile 14/8608/5711.
    expect(lonLatToTile(0.0001, -0.0001, 1)).toEqual({ x: 1, y: 1 });
    expect(lonLatToTile(9.160136, 47.763255, 14)).toEqual({ x: 8608, y: 5711 });
    expect(tileRange([9.15, 47.75, 9.17, 47.77], 14)).toEqual({ minX: 8608, maxX: 8609, minY: 5710, maxY: 5712 });
  });

  it('accepts only tiles inside the zoom level’s grid', () => {
    expect(isValidTile(0, 0, 0)).toBe(true);
    expect(isValidTile(2, 3, 3)).toBe(true);
    expect(isValidTile(2, 4, 0)).toBe(false);
    expect(isValidTile(25, 0, 0)).toBe(false);
    expect(isValidTile(1.5, 0, 0)).toBe(false);
  });

  it('stores a tile in its TMS row and reads it back by its XYZ address', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-tms-'));
    const file = path.join(dir, 'flip.mbtiles');
    const w = new MbtilesWriter(file);
    // An empty but valid vector tile with one layer "probe" (version 2).
    const layer = Buffer.from([0x0a, 0x05, ...Buffer.from('probe'), 0x78, 0x02]);
    const tile = zlib.gzipSync(Buffer.concat([Buffer.from([0x1a, layer.length]), layer]));
    w.put(3, 2, 1, tile);
    w.finish({ name: 'flip', format: 'pbf', minzoom: '3', maxzoom: '3' });
    const raw = new Database(file, { readonly: true });
    expect(raw.prepare('SELECT zoom_level z, tile_column x, tile_row r FROM tiles').all()).toEqual([{ z: 3, x: 2, r: 6 }]);
    raw.close();
    const f = MbtilesFile.open(file);
    expect(f.metadata.vectorLayers.map((l) => l.id)).toEqual(['probe']);
    expect(f.getTile(3, 2, 1)?.data.equals(tile)).toBe(true);
    expect(f.getTile(3, 2, 6)).toBeNull();
    f.close();
  });
});
