// Plain JavaScript so that the copy process (mbtiles-copy.worker.mjs) can use it without a
// TypeScript loader; the server imports the same code through mbtiles-check.d.mts.
import zlib from 'node:zlib';
import { PbfReader } from 'pbf';

/** Why a file is not a vector MBTiles basemap; the message is shown to the Admin as it is. */
export class MbtilesError extends Error {}

/** Written into the header of Kfield's copies (PRAGMA application_id), "Kfld". */
export const KFIELD_APPLICATION_ID = 0x4b666c64;

export const SQLITE_MAGIC = Buffer.from('SQLite format 3\0', 'latin1');

/** A guess at what a non-SQLite file is, for a clearer refusal. */
export function sniff(head) {
  const starts = (...bytes) => bytes.every((b, i) => head[i] === b);
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

/** Throws unless the first bytes of a file are SQLite's. */
export function checkHead(head) {
  if (head.length === 0) throw new MbtilesError('The file is empty');
  if (head.length < SQLITE_MAGIC.length || !head.subarray(0, SQLITE_MAGIC.length).equals(SQLITE_MAGIC)) {
    const kind = sniff(head);
    throw new MbtilesError(`The file is not an SQLite file${kind ? ` (it looks like ${kind})` : ''}; a basemap must be an MBTiles file with vector tiles`);
  }
}

export const isGzip = (b) => b.length > 2 && b[0] === 0x1f && b[1] === 0x8b;
const isZlib = (b) => b.length > 2 && b[0] === 0x78 && (b[0] * 256 + b[1]) % 31 === 0;

/** The raw tile; maxOutputLength bounds what a small compressed tile may expand to. */
export function inflate(b, maxOutputLength) {
  const opts = maxOutputLength ? { maxOutputLength } : {};
  if (isGzip(b)) return zlib.gunzipSync(b, opts);
  if (isZlib(b)) return zlib.inflateSync(b, opts);
  return b;
}

/**
 * The layer names of a Mapbox Vector Tile, read with pbf (tile field 3 = layer, layer field
 * 1 = name, 15 = version). Throws when the bytes are not a vector tile.
 */
export function vectorTileLayerNames(raw) {
  const pbf = new PbfReader(raw);
  const names = [];
  pbf.readFields((tag, _r, p) => {
    if (tag !== 3 || p.type !== 2) throw new Error(`unexpected tile field ${tag}`);
    let name = '';
    let version = 0;
    p.readMessage((ltag, _l, lp) => {
      if (ltag === 1 && lp.type === 2) name = lp.readString();
      else if (ltag === 15 && lp.type === 0) version = lp.readVarint();
    }, null);
    if (!name || version < 1 || version > 2) throw new Error('layer without a name or version');
    names.push(name);
  }, null);
  return names;
}

/** The tables (or views) and columns an MBTiles file must have. Reads only the schema. */
export function checkSchema(db) {
  const objects = db.prepare("SELECT name, type FROM sqlite_master WHERE type IN ('table', 'view')").all();
  const has = (name) => objects.some((o) => o.name === name);
  if (!has('tiles')) throw new MbtilesError('The file is an SQLite database but not an MBTiles file: it has no tiles table');
  if (!has('metadata')) throw new MbtilesError('The file is an SQLite database but not an MBTiles file: it has no metadata table');
  const columns = (t) => db.prepare('SELECT name FROM pragma_table_info(?)').all(t).map((c) => c.name);
  const missing = ['zoom_level', 'tile_column', 'tile_row', 'tile_data'].filter((c) => !columns('tiles').includes(c));
  if (missing.length) throw new MbtilesError(`The tiles table lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}`);
  const metaMissing = ['name', 'value'].filter((c) => !columns('metadata').includes(c));
  if (metaMissing.length) throw new MbtilesError(`The metadata table lacks the column${metaMissing.length > 1 ? 's' : ''} ${metaMissing.join(', ')}`);
  return { objects, columns };
}

/** The metadata rows as name → value (at most 1000 rows), with the format checked. */
export function readMetadata(db, maxBytes = Infinity) {
  const meta = {};
  let bytes = 0;
  for (const r of db.prepare('SELECT name, value FROM metadata LIMIT 1000').iterate()) {
    if (typeof r.name !== 'string') continue;
    const value = r.value == null ? '' : String(r.value);
    bytes += r.name.length + value.length;
    if (bytes > maxBytes) throw new MbtilesError(`The metadata table holds more than ${Math.round(maxBytes / 1048576)} MB of text`);
    meta[r.name] = value;
  }
  const format = meta.format?.trim().toLowerCase();
  if (!format) throw new MbtilesError('The metadata has no format entry; a vector basemap says format = pbf');
  if (format !== 'pbf') {
    throw new MbtilesError(`The tiles' format is ${format}, not pbf: Kfield serves vector tiles only (raster MBTiles are not supported)`);
  }
  return meta;
}

/**
 * Checks one tile as stored and returns its raw bytes; layer names go into `layers` when given.
 * maxRawBytes turns a tile that inflates beyond it into a RangeError (ERR_BUFFER_TOO_LARGE).
 */
export function checkTile(z, d, layers, maxRawBytes) {
  if (!Buffer.isBuffer(d) || d.length === 0) throw new MbtilesError(`A tile at zoom ${z} is empty or not binary data`);
  const kind = sniff(d.subarray(0, 16));
  if (kind && kind.includes('image')) throw new MbtilesError(`The tiles are ${kind.replace(/^a /, '')}s although the metadata says pbf; Kfield serves vector tiles only`);
  let raw;
  try {
    raw = inflate(d, maxRawBytes);
  } catch (e) {
    if (e instanceof RangeError) throw e;
    throw new MbtilesError(`A tile at zoom ${z} is compressed but cannot be decompressed`);
  }
  if (layers) {
    try {
      for (const n of vectorTileLayerNames(raw)) layers.add(n);
    } catch {
      throw new MbtilesError(`The tiles are not Mapbox vector tiles (a tile at zoom ${z} could not be read as one)`);
    }
  }
  return raw;
}

function parseNumbers(value, count) {
  if (!value) return null;
  const parts = value.split(',').map((s) => Number(s.trim()));
  return parts.length === count && parts.every(Number.isFinite) ? parts : null;
}

function validBounds(b) {
  if (!b) return null;
  const [w, s, e, n] = b;
  return w >= -180 && e <= 180 && s >= -90 && n <= 90 && w < e && s < n ? [w, s, e, n] : null;
}

/** Kfield's metadata of a tileset from its metadata rows, its zoom levels (ascending) and the layers seen in its tiles. */
export function deriveMetadata(meta, zooms, seenLayers, gzipped) {
  if (zooms.length === 0) throw new MbtilesError('The MBTiles file has no tiles');
  let json = {};
  try {
    json = meta.json ? JSON.parse(meta.json) : {};
  } catch {
    json = {};
  }
  const declared = Array.isArray(json?.vector_layers)
    ? json.vector_layers.filter((l) => typeof l?.id === 'string').map((l) => ({
        id: String(l.id),
        ...(typeof l.minzoom === 'number' ? { minzoom: l.minzoom } : {}),
        ...(typeof l.maxzoom === 'number' ? { maxzoom: l.maxzoom } : {}),
        ...(l.fields && typeof l.fields === 'object' ? { fields: Object.fromEntries(Object.entries(l.fields).map(([k, v]) => [k, String(v)])) } : {}),
        ...(typeof l.description === 'string' ? { description: l.description } : {}),
      }))
    : [];
  const vectorLayers = declared.length > 0 ? declared : [...seenLayers].sort().map((id) => ({ id }));

  const minzoom = Number.isInteger(Number(meta.minzoom)) && meta.minzoom !== '' && meta.minzoom !== undefined ? Number(meta.minzoom) : zooms[0];
  const maxzoom = Number.isInteger(Number(meta.maxzoom)) && meta.maxzoom !== '' && meta.maxzoom !== undefined ? Number(meta.maxzoom) : zooms[zooms.length - 1];
  const bounds = validBounds(parseNumbers(meta.bounds, 4)) ?? [-180, -85.05113, 180, 85.05113];
  const c = parseNumbers(meta.center, 3);
  const center =
    c && c[0] >= -180 && c[0] <= 180 && c[1] >= -90 && c[1] <= 90 ? [c[0], c[1], Math.round(c[2])] : [(bounds[0] + bounds[2]) / 2, (bounds[1] + bounds[3]) / 2, Math.min(maxzoom, minzoom + 2)];
  const lb = json?.kfield?.localBounds;
  const localBounds = Array.isArray(lb) ? validBounds(lb.map(Number)) : null;
  return {
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
  };
}

/**
 * Checks a trusted file in place (the built-in basemap, written by tiles/build.ts): a few tiles
 * across the zoom range. Uploads never come here; they are copied by mbtiles-copy.worker.mjs.
 */
export function inspect(db) {
  db.pragma('trusted_schema = OFF');
  const { objects, columns } = checkSchema(db);
  const meta = readMetadata(db);
  const zooms = db.prepare('SELECT DISTINCT zoom_level AS z FROM tiles ORDER BY zoom_level').all().map((r) => r.z);
  if (zooms.length === 0) throw new MbtilesError('The MBTiles file has no tiles');
  const sample = db.prepare('SELECT tile_data AS d FROM tiles WHERE zoom_level = ? LIMIT 3');
  const seenLayers = new Set();
  let gzipped = true;
  for (const z of zooms.length > 6 ? [zooms[0], zooms[Math.floor(zooms.length / 2)], zooms[zooms.length - 1]] : zooms) {
    for (const { d } of sample.all(z)) {
      checkTile(z, d, seenLayers);
      if (!isGzip(d)) gzipped = false;
    }
  }
  const byImageId =
    objects.some((o) => o.name === 'map' && o.type === 'table') &&
    objects.some((o) => o.name === 'images' && o.type === 'table') &&
    ['zoom_level', 'tile_column', 'tile_row', 'tile_id'].every((col) => columns('map').includes(col)) &&
    ['tile_id', 'tile_data'].every((col) => columns('images').includes(col));
  return { byImageId, metadata: deriveMetadata(meta, zooms, seenLayers, gzipped) };
}
