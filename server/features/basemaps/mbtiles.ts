import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { promisify } from 'node:util';
import zlib from 'node:zlib';
import Database from 'better-sqlite3';
import type { BasemapMetadata } from '@shared/schemas/basemaps';
import { tmsRow } from '@shared/geo/tiles';
import { KFIELD_APPLICATION_ID, MbtilesError, checkHead, inflate, inspect, isGzip } from './mbtiles-check.mjs';

export { MbtilesError, vectorTileLayerNames } from './mbtiles-check.mjs';

function readHead(file: string, bytes = 512): Buffer {
  const fd = fs.openSync(file, 'r');
  try {
    const buf = Buffer.alloc(bytes);
    const n = fs.readSync(fd, buf, 0, bytes, 0);
    return buf.subarray(0, n);
  } finally {
    fs.closeSync(fd);
  }
}

export interface TileHit {
  /** The tile as stored (gzipped, zlib-compressed or raw). */
  data: Buffer;
  /** A strong validator for the tile's content. */
  etag: string;
}

type Lookup = Database.Statement<[number, number, number], { d: Buffer; id?: number | string }>;

/**
 * One MBTiles file, open read-only. Tiles are looked up with a prepared statement; rows are
 * TMS (y flipped). Two kinds: the built-in basemap (tiles/build.ts writes `map` + `images`, so the
 * image id is the ETag) and Kfield's copies of uploads (decision 009: a plain table keyed by the
 * tile address, so a lookup is one indexed row; its rowid is the ETag). An uploaded file itself is
 * never opened here.
 */
export class MbtilesFile {
  readonly metadata: BasemapMetadata;
  readonly sizeBytes: number;
  /** Changes whenever the file does (size and modification time); part of every ETag and versioned URL. */
  readonly version: string;
  private db: Database.Database;
  private lookup: Lookup;
  private idFromRow: boolean;

  private constructor(readonly file: string, db: Database.Database, metadata: BasemapMetadata, lookup: Lookup, idFromRow: boolean) {
    this.db = db;
    this.metadata = metadata;
    const st = fs.statSync(file);
    this.sizeBytes = st.size;
    this.version = createHash('sha1').update(`${st.size}:${st.mtimeMs}:${file}`).digest('hex').slice(0, 10);
    this.lookup = lookup;
    this.idFromRow = idFromRow;
  }

  /** Open and check Kfield's own built-in basemap (trusted: its SQL runs on the server's thread). Throws MbtilesError. */
  static open(file: string): MbtilesFile {
    const st = fs.statSync(file, { throwIfNoEntry: false });
    if (!st || !st.isFile()) throw new MbtilesError('The file does not exist');
    checkHead(readHead(file));
    let db: Database.Database;
    try {
      db = new Database(file, { readonly: true, fileMustExist: true });
    } catch {
      throw new MbtilesError('The file starts like an SQLite file but cannot be opened (it may be damaged or incomplete)');
    }
    try {
      const { metadata, byImageId } = inspect(db);
      const lookup: Lookup = byImageId
        ? db.prepare('SELECT images.tile_data AS d, map.tile_id AS id FROM map JOIN images ON images.tile_id = map.tile_id WHERE map.zoom_level = ? AND map.tile_column = ? AND map.tile_row = ?')
        : db.prepare('SELECT tile_data AS d FROM tiles WHERE zoom_level = ? AND tile_column = ? AND tile_row = ?');
      return new MbtilesFile(file, db, metadata, lookup, byImageId);
    } catch (e) {
      db.close();
      if (e instanceof MbtilesError) throw e;
      throw new MbtilesError(`The file is not a readable SQLite database (${(e as Error).message})`);
    }
  }

  /**
   * Open a copy written by mbtiles-copy.worker.mjs, with the metadata read when it was made. Only
   * a file with Kfield's mark and exactly Kfield's two tables is served: nothing else in it can run.
   */
  static openCopy(file: string, metadata: BasemapMetadata): MbtilesFile {
    const head = readHead(file, 100);
    if (head.length < 72 || head.readUInt32BE(68) !== KFIELD_APPLICATION_ID) throw new MbtilesError('The file is not one of Kfield’s basemap copies');
    const db = new Database(file, { readonly: true, fileMustExist: true });
    try {
      db.pragma('trusted_schema = OFF');
      const objects = (db.prepare("SELECT type || ' ' || name AS o FROM sqlite_master WHERE name NOT LIKE 'sqlite_autoindex_%' ORDER BY name").all() as { o: string }[]).map((r) => r.o);
      if (objects.join(',') !== 'table metadata,table tiles') throw new MbtilesError('The basemap copy has been changed since Kfield wrote it');
      const lookup: Lookup = db.prepare('SELECT rowid AS id, tile_data AS d FROM tiles WHERE zoom_level = ? AND tile_column = ? AND tile_row = ?');
      return new MbtilesFile(file, db, metadata, lookup, true);
    } catch (e) {
      db.close();
      throw e;
    }
  }

  getTile(z: number, x: number, y: number): TileHit | null {
    const row = this.lookup.get(z, x, tmsRow(z, y));
    if (!row || !row.d) return null;
    const id = this.idFromRow ? String(row.id) : createHash('sha1').update(row.d).digest('base64url').slice(0, 16);
    return { data: row.d, etag: `"${this.version}-${id}"` };
  }

  close(): void {
    if (this.db.open) this.db.close();
  }
}

/** A tile body ready to send gzipped, and the raw bytes for a client that does not accept gzip. */
export function gzipTile(data: Buffer): Buffer {
  if (isGzip(data)) return data;
  return zlib.gzipSync(inflate(data), { level: 6 });
}

const gunzipAsync = promisify(zlib.gunzip);
const inflateAsync = promisify(zlib.inflate);

/** The raw tile, decompressed on libuv's thread pool rather than on the server's thread. */
export async function rawTile(data: Buffer): Promise<Buffer> {
  if (isGzip(data)) return gunzipAsync(data);
  if (data.length > 2 && data[0] === 0x78 && (data[0] * 256 + data[1]) % 31 === 0) return inflateAsync(data);
  return data;
}
