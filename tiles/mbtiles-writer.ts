import { createHash } from 'node:crypto';
import fs from 'node:fs';
import Database from 'better-sqlite3';
import { tmsRow } from '@shared/geo/tiles';

/**
 * Writes an MBTiles 1.3 file with de-duplicated tiles: `map` rows point at one `images` row per
 * distinct tile content and `tiles` is a view over both, so the many identical solid-land tiles are stored once.
 * Rows are TMS: tile_row counts from the south (y flipped).
 */
export class MbtilesWriter {
  private db: Database.Database;
  private insertMap: Database.Statement;
  private insertImage: Database.Statement;
  readonly tmpPath: string;
  /** Content hash → images.tile_id, so identical tiles share one row. */
  private ids = new Map<string, number>();
  tiles = 0;
  images = 0;

  constructor(private readonly target: string) {
    // Unique per process: two builds at once (parallel test files) must not share a half-written file.
    this.tmpPath = `${target}.${process.pid}.partial`;
    fs.rmSync(this.tmpPath, { force: true });
    this.db = new Database(this.tmpPath);
    this.db.pragma('journal_mode = OFF');
    this.db.pragma('synchronous = OFF');
    this.db.exec(`
      CREATE TABLE metadata (name TEXT NOT NULL, value TEXT);
      CREATE UNIQUE INDEX metadata_name ON metadata (name);
      CREATE TABLE map (zoom_level INTEGER NOT NULL, tile_column INTEGER NOT NULL, tile_row INTEGER NOT NULL, tile_id INTEGER NOT NULL,
        PRIMARY KEY (zoom_level, tile_column, tile_row)) WITHOUT ROWID;
      CREATE TABLE images (tile_id INTEGER PRIMARY KEY, tile_data BLOB NOT NULL);
      CREATE VIEW tiles AS SELECT map.zoom_level AS zoom_level, map.tile_column AS tile_column, map.tile_row AS tile_row, images.tile_data AS tile_data
        FROM map JOIN images ON images.tile_id = map.tile_id;
    `);
    this.insertMap = this.db.prepare('INSERT INTO map (zoom_level, tile_column, tile_row, tile_id) VALUES (?, ?, ?, ?)');
    this.insertImage = this.db.prepare('INSERT INTO images (tile_id, tile_data) VALUES (?, ?)');
    this.db.exec('BEGIN');
  }

  /** Add a gzipped tile at XYZ z/x/y. */
  put(z: number, x: number, y: number, gz: Buffer): void {
    const hash = createHash('sha1').update(gz).digest('base64');
    let id = this.ids.get(hash);
    if (id === undefined) {
      id = ++this.images;
      this.ids.set(hash, id);
      this.insertImage.run(id, gz);
    }
    this.insertMap.run(z, x, tmsRow(z, y), id);
    this.tiles++;
  }

  finish(metadata: Record<string, string>): void {
    const put = this.db.prepare('INSERT INTO metadata (name, value) VALUES (?, ?)');
    for (const [k, v] of Object.entries(metadata)) put.run(k, v);
    this.db.exec('COMMIT');
    this.db.exec('VACUUM');
    this.db.close();
    fs.renameSync(this.tmpPath, this.target);
  }

  abort(): void {
    try {
      this.db.close();
    } finally {
      fs.rmSync(this.tmpPath, { force: true });
    }
  }
}
