import { createHash } from 'node:crypto';
import fs from 'node:fs';
import zlib from 'node:zlib';
import Database from 'better-sqlite3';
import { PbfReader } from 'pbf';
import type { BasemapMetadata, Bounds, VectorLayer } from '@shared/schemas/basemaps';
import { tmsRow } from '@shared/geo/tiles';

/** Why a file is not a vector MBTiles basemap; the message is shown to the Admin as it is. */
export class MbtilesError extends Error {}

const SQLITE_MAGIC = Buffer.from('SQLite format 3\0', 'latin1');

/** A guess at what a non-SQLite file is, for a clearer refusal. */
function sniff(head: Buffer): string | null {
  const starts = (...bytes: number[]) => bytes.every((b, i) => head[i] === b);
  if (starts(0x89, 0x50, 0x4e, 0x47)) return 'a PNG image';
  if (starts(0xff, 0xd8, 0xff)) return 'a JPEG image';
  if (starts(0x47, 0x49, 0x46, 0x38)) return 'a GIF image';
  if (starts(0x25, 0x50, 0x44, 0x46)) return 'a PDF document';
  if (starts(0x50, 0x4b, 0x03, 0x04)) return 'a ZIP archive';
  if (starts(0x1f, 0x8b)) return 'a gzip archive';
  if (starts(0x50, 0x4d, 0x54, 0x69, 0x6c, 0x65, 0x73)) return 'a PMTiles archive';
  const text = head.subarray(0, 512);
  if (text.length > 0 && !text.includes(0)) return head.subarray(0, 1).toString() === '{' ? 'a JSON text file' : 'a text file';
  return null;
}

function readHead(file: string): Buffer {
  const fd = fs.openSync(file, 'r');
  try {
    const buf = Buffer.alloc(512);
    const n = fs.readSync(fd, buf, 0, 512, 0);
    return buf.subarray(0, n);
  } finally {
    fs.closeSync(fd);
  }
}

const isGzip = (b: Uint8Array) => b.length > 2 && b[0] === 0x1f && b[1] === 0x8b;
const isZlib = (b: Uint8Array) => b.length > 2 && b[0] === 0x78 && (b[0] * 256 + b[1]) % 31 === 0;

function inflate(b: Buffer): Buffer {
  if (isGzip(b)) return zlib.gunzipSync(b);
  if (isZlib(b)) return zlib.inflateSync(b);
  return b;
}

/**
 * The layer names of a Mapbox Vector Tile, read with pbf (tile field 3 = layer, layer field
 * 1 = name, 15 = version). Throws when the bytes are not a vector tile.
 */
export function vectorTileLayerNames(raw: Uint8Array): string[] {
  const pbf = new PbfReader(raw);
  const names: string[] = [];
  pbf.readFields((tag, _r, p) => {
    if (tag !== 3 || p!.type !== 2) throw new Error(`unexpected tile field ${tag}`);
    let name = '';
    let version = 0;
    // Fields a callback does not read are skipped by readFields.
    p!.readMessage((ltag, _l, lp) => {
      if (ltag === 1 && lp!.type === 2) name = lp!.readString();
      else if (ltag === 15 && lp!.type === 0) version = lp!.readVarint();
    }, null);
    if (!name || version < 1 || version > 2) throw new Error('layer without a name or version');
    names.push(name);
  }, null);
  return names;
}

function parseNumbers(value: string | undefined, count: number): number[] | null {
  if (!value) return null;
  const parts = value.split(',').map((s) => Number(s.trim()));
  return parts.length === count && parts.every(Number.isFinite) ? parts : null;
}

function validBounds(b: number[] | null): Bounds | null {
  if (!b) return null;
  const [w, s, e, n] = b;
  return w >= -180 && e <= 180 && s >= -90 && n <= 90 && w < e && s < n ? [w, s, e, n] : null;
}

export interface TileHit {
  /** The tile as stored (gzipped, zlib-compressed or raw). */
  data: Buffer;
  /** A strong validator for the tile's content. */
  etag: string;
}

/**
 * One MBTiles file, open read-only. Tiles are looked up with a prepared statement; rows are
 * TMS (y flipped). Files written as `map` + `images` (de-duplicated, as tiles/build.ts does) give
 * the tile's image id as its ETag for free; others hash the tile bytes.
 */
export class MbtilesFile {
  readonly metadata: BasemapMetadata;
  readonly sizeBytes: number;
  /** Changes whenever the file does (size and modification time); part of every ETag and versioned URL. */
  readonly version: string;
  private db: Database.Database;
  private lookup: Database.Statement<[number, number, number], { d: Buffer; id?: number | string }>;
  private byImageId: boolean;

  private constructor(readonly file: string, db: Database.Database, metadata: BasemapMetadata, byImageId: boolean) {
    this.db = db;
    this.metadata = metadata;
    const st = fs.statSync(file);
    this.sizeBytes = st.size;
    this.version = createHash('sha1').update(`${st.size}:${st.mtimeMs}:${file}`).digest('hex').slice(0, 10);
    this.byImageId = byImageId;
    this.lookup = byImageId
      ? db.prepare('SELECT images.tile_data AS d, map.tile_id AS id FROM map JOIN images ON images.tile_id = map.tile_id WHERE map.zoom_level = ? AND map.tile_column = ? AND map.tile_row = ?')
      : db.prepare('SELECT tile_data AS d FROM tiles WHERE zoom_level = ? AND tile_column = ? AND tile_row = ?');
  }

  /** Open and check a file: SQLite, MBTiles tables, format pbf, readable vector tiles. Throws MbtilesError. */
  static open(file: string): MbtilesFile {
    const st = fs.statSync(file, { throwIfNoEntry: false });
    if (!st || !st.isFile()) throw new MbtilesError('The file does not exist');
    if (st.size === 0) throw new MbtilesError('The file is empty');
    const head = readHead(file);
    if (head.length < SQLITE_MAGIC.length || !head.subarray(0, SQLITE_MAGIC.length).equals(SQLITE_MAGIC)) {
      const kind = sniff(head);
      throw new MbtilesError(`The file is not an SQLite file${kind ? ` (it looks like ${kind})` : ''}; a basemap must be an MBTiles file with vector tiles`);
    }
    let db: Database.Database;
    try {
      db = new Database(file, { readonly: true, fileMustExist: true });
    } catch {
      throw new MbtilesError('The file starts like an SQLite file but cannot be opened (it may be damaged or incomplete)');
    }
    try {
      const { metadata, byImageId } = inspect(db);
      return new MbtilesFile(file, db, metadata, byImageId);
    } catch (e) {
      db.close();
      if (e instanceof MbtilesError) throw e;
      throw new MbtilesError(`The file is not a readable SQLite database (${(e as Error).message})`);
    }
  }

  getTile(z: number, x: number, y: number): TileHit | null {
    const row = this.lookup.get(z, x, tmsRow(z, y));
    if (!row || !row.d) return null;
    const id = this.byImageId ? String(row.id) : createHash('sha1').update(row.d).digest('base64url').slice(0, 16);
    return { data: row.d, etag: `"${this.version}-${id}"` };
  }

  close(): void {
    if (this.db.open) this.db.close();
  }
}

function inspect(db: Database.Database): { metadata: BasemapMetadata; byImageId: boolean } {
  db.pragma('trusted_schema = OFF');
  const objects = db.prepare("SELECT name, type FROM sqlite_master WHERE type IN ('table', 'view')").all() as { name: string; type: string }[];
  const has = (name: string) => objects.some((o) => o.name === name);
  if (!has('tiles')) throw new MbtilesError('The file is an SQLite database but not an MBTiles file: it has no tiles table');
  if (!has('metadata')) throw new MbtilesError('The file is an SQLite database but not an MBTiles file: it has no metadata table');
  const columns = (t: string) => (db.prepare(`PRAGMA table_info("${t}")`).all() as { name: string }[]).map((c) => c.name);
  const missing = ['zoom_level', 'tile_column', 'tile_row', 'tile_data'].filter((c) => !columns('tiles').includes(c));
  if (missing.length) throw new MbtilesError(`The tiles table lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}`);
  const metaMissing = ['name', 'value'].filter((c) => !columns('metadata').includes(c));
  if (metaMissing.length) throw new MbtilesError(`The metadata table lacks the column${metaMissing.length > 1 ? 's' : ''} ${metaMissing.join(', ')}`);

  const meta: Record<string, string> = {};
  for (const r of db.prepare('SELECT name, value FROM metadata LIMIT 1000').all() as { name: unknown; value: unknown }[]) {
    if (typeof r.name === 'string') meta[r.name] = r.value == null ? '' : String(r.value);
  }
  const format = meta.format?.trim().toLowerCase();
  if (!format) throw new MbtilesError('The metadata has no format entry; a vector basemap says format = pbf');
  if (format !== 'pbf') {
    throw new MbtilesError(`The tiles' format is ${format}, not pbf: Kfield serves vector tiles only (raster MBTiles are not supported)`);
  }

  // Look at a few tiles across the zoom range: they must be vector tiles, and they name the layers.
  const zooms = (db.prepare('SELECT DISTINCT zoom_level AS z FROM tiles ORDER BY zoom_level').all() as { z: number }[]).map((r) => r.z);
  if (zooms.length === 0) throw new MbtilesError('The MBTiles file has no tiles');
  const sample = db.prepare('SELECT tile_data AS d FROM tiles WHERE zoom_level = ? LIMIT 3');
  const seenLayers = new Set<string>();
  let gzipped = true;
  for (const z of zooms.length > 6 ? [zooms[0], zooms[Math.floor(zooms.length / 2)], zooms[zooms.length - 1]] : zooms) {
    for (const { d } of sample.all(z) as { d: unknown }[]) {
      if (!Buffer.isBuffer(d) || d.length === 0) throw new MbtilesError(`A tile at zoom ${z} is empty or not binary data`);
      const kind = sniff(d.subarray(0, 16));
      if (kind && kind.includes('image')) throw new MbtilesError(`The tiles are ${kind.replace(/^a /, '')}s although the metadata says pbf; Kfield serves vector tiles only`);
      if (!isGzip(d)) gzipped = false;
      let raw: Buffer;
      try {
        raw = inflate(d);
      } catch {
        throw new MbtilesError(`A tile at zoom ${z} is compressed but cannot be decompressed`);
      }
      try {
        for (const n of vectorTileLayerNames(raw)) seenLayers.add(n);
      } catch {
        throw new MbtilesError(`The tiles are not Mapbox vector tiles (a tile at zoom ${z} could not be read as one)`);
      }
    }
  }

  let json: { vector_layers?: unknown; kfield?: { localBounds?: unknown } } = {};
  try {
    json = meta.json ? JSON.parse(meta.json) : {};
  } catch {
    json = {};
  }
  const declared = Array.isArray(json.vector_layers)
    ? (json.vector_layers as Record<string, unknown>[]).filter((l) => typeof l?.id === 'string').map((l): VectorLayer => ({
        id: String(l.id),
        ...(typeof l.minzoom === 'number' ? { minzoom: l.minzoom } : {}),
        ...(typeof l.maxzoom === 'number' ? { maxzoom: l.maxzoom } : {}),
        ...(l.fields && typeof l.fields === 'object' ? { fields: Object.fromEntries(Object.entries(l.fields as object).map(([k, v]) => [k, String(v)])) } : {}),
        ...(typeof l.description === 'string' ? { description: l.description } : {}),
      }))
    : [];
  const vectorLayers = declared.length > 0 ? declared : [...seenLayers].sort().map((id) => ({ id }));

  const minzoom = Number.isInteger(Number(meta.minzoom)) && meta.minzoom !== '' ? Number(meta.minzoom) : zooms[0];
  const maxzoom = Number.isInteger(Number(meta.maxzoom)) && meta.maxzoom !== '' ? Number(meta.maxzoom) : zooms[zooms.length - 1];
  const bounds = validBounds(parseNumbers(meta.bounds, 4)) ?? [-180, -85.05113, 180, 85.05113];
  const c = parseNumbers(meta.center, 3);
  const center: [number, number, number] =
    c && c[0] >= -180 && c[0] <= 180 && c[1] >= -90 && c[1] <= 90 ? [c[0], c[1], Math.round(c[2])] : [(bounds[0] + bounds[2]) / 2, (bounds[1] + bounds[3]) / 2, Math.min(maxzoom, minzoom + 2)];
  const lb = json.kfield?.localBounds;
  const localBounds = Array.isArray(lb) ? validBounds(lb.map(Number)) : null;

  const byImageId =
    objects.some((o) => o.name === 'map' && o.type === 'table') &&
    objects.some((o) => o.name === 'images' && o.type === 'table') &&
    ['zoom_level', 'tile_column', 'tile_row', 'tile_id'].every((col) => columns('map').includes(col)) &&
    ['tile_id', 'tile_data'].every((col) => columns('images').includes(col));

  return {
    byImageId,
    metadata: {
      title: (meta.name ?? '').slice(0, 200),
      description: (meta.description ?? '').slice(0, 2000),
      attribution: (meta.attribution ?? '').slice(0, 1000),
      format: 'pbf',
      minzoom: Math.max(0, Math.min(30, minzoom)),
      maxzoom: Math.max(0, Math.min(30, maxzoom)),
      bounds,
      center,
      vectorLayers,
      gzipped,
      localBounds,
    },
  };
}

/** A tile body ready to send gzipped, and the raw bytes for a client that does not accept gzip. */
export function gzipTile(data: Buffer): Buffer {
  if (isGzip(data)) return data;
  return zlib.gzipSync(inflate(data), { level: 6 });
}

export function rawTile(data: Buffer): Buffer {
  return inflate(data);
}
