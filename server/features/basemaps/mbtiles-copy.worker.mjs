// The copy of an uploaded MBTiles into Kfield's own plain MBTiles, run in a child process by
// mbtiles-copy.ts (decision 009). Every query on the upload runs here: a slow view blocks only this
// process, which the parent kills at the time limit. One job per process: the parent sends
// { src, dest, limits } and gets one message back: done, refused or limit.
import fs from 'node:fs';
import { Worker } from 'node:worker_threads';
import zlib from 'node:zlib';
import Database from 'better-sqlite3';
import { KFIELD_APPLICATION_ID, MbtilesError, checkHead, checkSchema, checkTile, deriveMetadata, isGzip, readMetadata } from './mbtiles-check.mjs';

const BATCH = 500;
/** Tiles per zoom level whose layers are read (all tiles are checked to be tiles at all). */
const SAMPLES_PER_ZOOM = 3;

class LimitExceeded extends Error {
  constructor(limit, detail = {}) {
    super(limit);
    this.limit = limit;
    this.detail = detail;
  }
}

function readHead(file) {
  const st = fs.statSync(file, { throwIfNoEntry: false });
  if (!st || !st.isFile()) throw new MbtilesError('The file does not exist');
  const fd = fs.openSync(file, 'r');
  try {
    const buf = Buffer.alloc(512);
    return buf.subarray(0, fs.readSync(fd, buf, 0, 512, 0));
  } finally {
    fs.closeSync(fd);
  }
}

const maxCoord = (z) => 2 ** z;
const whole = (v) => (typeof v === 'number' || typeof v === 'bigint' ? Number(v) : NaN);

function copy({ src, dest, limits }) {
  checkHead(readHead(src));
  let db;
  try {
    db = new Database(src, { readonly: true, fileMustExist: true });
  } catch {
    throw new MbtilesError('The file starts like an SQLite file but cannot be opened (it may be damaged or incomplete)');
  }
  try {
    db.pragma('trusted_schema = OFF');
    db.pragma('query_only = ON');
    checkSchema(db);
    const meta = readMetadata(db, limits.maxMetadataBytes);

    fs.rmSync(dest, { force: true });
    const out = new Database(dest);
    try {
      // A fresh file that is deleted on any failure: no journal, no fsync until the end.
      out.pragma('journal_mode = OFF');
      out.pragma('synchronous = OFF');
      out.pragma(`application_id = ${KFIELD_APPLICATION_ID}`);
      out.exec(`
        CREATE TABLE metadata (name TEXT NOT NULL PRIMARY KEY, value TEXT);
        CREATE TABLE tiles (
          zoom_level INTEGER NOT NULL, tile_column INTEGER NOT NULL, tile_row INTEGER NOT NULL, tile_data BLOB NOT NULL,
          PRIMARY KEY (zoom_level, tile_column, tile_row)
        );`);
      const putMeta = out.prepare('INSERT OR REPLACE INTO metadata (name, value) VALUES (?, ?)');
      out.transaction(() => {
        for (const [k, v] of Object.entries(meta)) putMeta.run(k, v);
      })();

      const put = out.prepare('INSERT OR IGNORE INTO tiles (zoom_level, tile_column, tile_row, tile_data) VALUES (?, ?, ?, ?)');
      const flush = out.transaction((rows) => {
        for (const r of rows) put.run(r);
      });
      const sampled = new Map();
      const layers = new Set();
      let gzipped = true;
      let tiles = 0;
      let bytes = 0;
      let batch = [];
      for (const row of db.prepare('SELECT zoom_level, tile_column, tile_row, tile_data FROM tiles').raw().iterate()) {
        const [z, x, y] = [whole(row[0]), whole(row[1]), whole(row[2])];
        if (!Number.isInteger(z) || z < 0 || z > 30 || !Number.isInteger(x) || !Number.isInteger(y) || x < 0 || y < 0 || x >= maxCoord(z) || y >= maxCoord(z)) {
          throw new MbtilesError(`A tile row has the address ${String(row[0])}/${String(row[1])}/${String(row[2])}, which is not a tile (zoom 0–30, column and row below 2^zoom)`);
        }
        if (++tiles > limits.maxTiles) throw new LimitExceeded('tiles');
        const seen = sampled.get(z) ?? 0;
        sampled.set(z, seen + 1);
        const d = row[3];
        let raw;
        try {
          raw = checkTile(z, d, seen < SAMPLES_PER_ZOOM ? layers : null, limits.maxTileBytes);
        } catch (e) {
          if (e instanceof RangeError) throw new LimitExceeded('tileBytes', { z });
          throw e;
        }
        if (raw.length > limits.maxTileBytes) throw new LimitExceeded('tileBytes', { z });
        if (!isGzip(d)) gzipped = false;
        // Stored gzipped: the tile route then sends the bytes as they are.
        const stored = isGzip(d) ? d : zlib.gzipSync(raw, { level: 6 });
        bytes += stored.length;
        if (bytes > limits.maxBytes) throw new LimitExceeded('bytes');
        batch.push([z, x, y, stored]);
        if (batch.length >= BATCH) {
          flush(batch);
          batch = [];
        }
      }
      flush(batch);
      const zooms = [...sampled.keys()].sort((a, b) => a - b);
      const metadata = deriveMetadata(meta, zooms, layers, gzipped);
      const stored = (out.prepare('SELECT count(*) AS n FROM tiles').get()).n;
      out.close();
      return { metadata, tiles: stored, sizeBytes: fs.statSync(dest).size };
    } finally {
      if (out.open) out.close();
    }
  } finally {
    db.close();
  }
}

/**
 * If the server dies without killing this process, nothing else would stop a copy stuck in one
 * long SQLite step; a thread of its own kills it at the deadline or once the parent is gone.
 */
function watchdog(deadlineMs) {
  const code = `const { workerData: w } = require('node:worker_threads');
    setInterval(() => { if (process.ppid !== w.parent) process.kill(w.pid, 'SIGKILL'); }, 500);
    setTimeout(() => process.kill(w.pid, 'SIGKILL'), w.deadlineMs);`;
  new Worker(code, { eval: true, workerData: { pid: process.pid, parent: process.ppid, deadlineMs } }).unref();
}

process.once('message', (job) => {
  watchdog(job.limits.timeMs + 5000);
  let answer;
  try {
    answer = { type: 'done', ...copy(job) };
  } catch (e) {
    if (e instanceof LimitExceeded) answer = { type: 'limit', limit: e.limit, detail: e.detail };
    else if (e instanceof MbtilesError) answer = { type: 'refused', message: e.message };
    else if (typeof e?.code === 'string' && e.code.startsWith('SQLITE_') && !/^SQLITE_(FULL|IOERR|CANTOPEN|READONLY|NOMEM)/.test(e.code)) {
      // The upload's own SQL failed (damaged pages, a view naming a missing table, ...).
      answer = { type: 'refused', message: `The file is not a readable SQLite database (${e.message})` };
    } else answer = { type: 'failed', message: String(e?.stack ?? e) };
  }
  process.send(answer, () => process.exit(0));
});
