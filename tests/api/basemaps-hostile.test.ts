import { spawnSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { GeoJSONVT } from '@maplibre/geojson-vt';
import { fromGeojsonVt } from '@maplibre/vt-pbf';
import zlib from 'node:zlib';
import Database from 'better-sqlite3';
import { PbfWriter } from 'pbf';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { lonLatToTile, tmsRow } from '@shared/geo/tiles';
import { Basemap } from '../../server/features/basemaps/basemap.entity';
import { basemapDir, overrideCopyLimits } from '../../server/features/basemaps/basemaps.service';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let admin: ApiClient;
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-hostile-'));
const BUILT_IN = path.resolve('tiles/dist/basemap.mbtiles');
const Z = 12;
const AT = lonLatToTile(9.15, 47.75, Z);

beforeAll(async () => {
  const r = spawnSync(process.execPath, ['tiles/ensure.mjs'], { stdio: 'inherit' });
  expect(r.status, 'the basemap build').toBe(0);
  ts = await startTestServer();
  admin = await ts.as(demoEmail('Admin'));
}, 180_000);
afterAll(async () => ts.close());
afterEach(() => overrideCopyLimits(null));

/** Rows counted by a recursive CTE: about 5 million a second on these machines. */
const countTo = (n: number) => `(WITH RECURSIVE c(x) AS (SELECT 1 UNION ALL SELECT x + 1 FROM c WHERE x < ${n}) SELECT count(*) FROM c)`;

/**
 * A vector MBTiles whose `tiles` is a view over a real table that first counts to `slowness`:
 * every query on the view costs that count once, however few rows it returns.
 */
function slowMbtiles(name: string, slowness: number, tileCount = 9, tileData?: Buffer): Buffer {
  const file = path.join(tmp, name);
  fs.rmSync(file, { force: true });
  const db = new Database(file);
  db.exec('CREATE TABLE metadata (name TEXT, value TEXT)');
  for (const [k, v] of Object.entries({ name: 'Slow view', format: 'pbf', minzoom: String(Z), maxzoom: String(Z), bounds: '9.1,47.7,9.2,47.8' })) {
    db.prepare('INSERT INTO metadata VALUES (?, ?)').run(k, v);
  }
  db.exec('CREATE TABLE real_tiles (zoom_level INTEGER, tile_column INTEGER, tile_row INTEGER, tile_data BLOB)');
  const vt = new GeoJSONVT({
    type: 'FeatureCollection',
    features: [{ type: 'Feature', properties: { name: 'Slow Street' }, geometry: { type: 'LineString', coordinates: [[9.0, 47.6], [9.3, 47.9]] } }],
  }, { maxZoom: Z });
  const side = Math.ceil(Math.sqrt(tileCount));
  for (let i = 0; i < tileCount; i++) {
    const x = AT.x - 1 + (i % side);
    const y = AT.y - 1 + Math.floor(i / side);
    const tile = vt.getTile(Z, x, y) ?? { features: [], numPoints: 0, numSimplified: 0, numFeatures: 0, source: null, x, y, z: Z, transformed: false, minX: 0, minY: 0, maxX: 0, maxY: 0 };
    db.prepare('INSERT INTO real_tiles VALUES (?, ?, ?, ?)').run(Z, x, tmsRow(Z, y), tileData ?? Buffer.from(fromGeojsonVt({ road: tile }, { version: 2, extent: 4096 })));
  }
  db.exec(`CREATE VIEW tiles AS SELECT zoom_level, tile_column, tile_row, tile_data FROM real_tiles WHERE ${countTo(slowness)} > 0`);
  db.close();
  return fs.readFileSync(file);
}

const upload = (c: ApiClient, bytes: Buffer, filename: string) =>
  c.agent.post('/api/admin/basemaps').set('x-csrf-token', c.csrf).attach('file', bytes, filename);

/** Asks for /api/health every 50 ms until `work` settles; the slowest answer in ms. */
async function slowestHealthDuring<T>(work: Promise<T>): Promise<{ result: T; slowestMs: number; asked: number }> {
  let done = false;
  let slowestMs = 0;
  let asked = 0;
  const settled = work.finally(() => {
    done = true;
  });
  const poll = (async () => {
    while (!done) {
      const t0 = performance.now();
      await ts.client().get('/api/health').expect(200);
      slowestMs = Math.max(slowestMs, performance.now() - t0);
      asked++;
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  const result = await settled;
  await poll;
  return { result, slowestMs, asked };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

function filesIn(dir: string): string[] {
  return fs.existsSync(dir) ? fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).map((d) => d.name) : [];
}

describe('a basemap upload that is slow to read', () => {
  it('is refused when copying its tiles takes longer than the time limit, and the server keeps answering meanwhile', async () => {
    overrideCopyLimits({ timeMs: 1500 });
    const before = await ts.ds.getRepository(Basemap).count();
    const bytes = slowMbtiles('hostile.mbtiles', 30_000_000);
    const t0 = performance.now();
    const { result: r, slowestMs, asked } = await slowestHealthDuring(Promise.resolve(upload(admin, bytes, 'hostile.mbtiles')));
    const tookMs = performance.now() - t0;
    expect(r.status).toBe(400);
    expect(r.body.error.message).toMatch(/longer than the limit of 1\.5 s/);
    expect(r.body.error.fields.file).toMatch(/limit/);
    expect(asked).toBeGreaterThan(3);
    expect(slowestMs).toBeLessThan(200);
    expect(tookMs).toBeLessThan(5000);
    expect(await ts.ds.getRepository(Basemap).count()).toBe(before);
    expect(filesIn(basemapDir(ts.config))).toEqual([]);
  }, 60_000);

  it('is accepted when the copy fits the limits, and its tiles then come from Kfield’s copy in a few ms each', async () => {
    const bytes = slowMbtiles('slowish.mbtiles', 1_500_000);
    const r = await upload(admin, bytes, 'slowish.mbtiles').expect(201);
    const id = r.body.id as string;
    const url = `/tiles/${id}/${Z}/${AT.x}/${AT.y}.pbf`;
    await ts.client().get(url).expect(200);
    const times: number[] = [];
    const tiles = (async () => {
      for (let i = 0; i < 30; i++) {
        const t0 = performance.now();
        await ts.client().get(url).expect(200);
        times.push(performance.now() - t0);
      }
    })();
    const { slowestMs } = await slowestHealthDuring(tiles);
    console.log(`tile of a slow-view upload, served from the copy: median ${median(times).toFixed(1)} ms over ${times.length}`);
    expect(median(times)).toBeLessThan(20);
    expect(slowestMs).toBeLessThan(200);
    await admin.delete(`/api/admin/basemaps/${id}`).expect(204);
  }, 60_000);
});

describe('copies of uploads', () => {
  it('uploads the built-in basemap file, keeps only a plain MBTiles copy of it and serves its tiles', async () => {
    const bytes = fs.readFileSync(BUILT_IN);
    const t0 = performance.now();
    const r = await upload(admin, bytes, 'basemap.mbtiles').expect(201);
    console.log(`upload of the built-in basemap (${(bytes.length / 1e6).toFixed(1)} MB): ${(performance.now() - t0).toFixed(0)} ms`);
    const id = r.body.id as string;
    expect(r.body.styleKind).toBe('kfield');
    const files = filesIn(basemapDir(ts.config));
    expect(files).toEqual([`${id}.kfield.mbtiles`]);

    const copy = new Database(path.join(basemapDir(ts.config), files[0]), { readonly: true });
    const objects = copy.prepare("SELECT type, name FROM sqlite_master WHERE name NOT LIKE 'sqlite_%' ORDER BY name").all();
    const original = new Database(BUILT_IN, { readonly: true });
    const count = (db: Database.Database) => (db.prepare('SELECT count(*) AS n FROM tiles').get() as { n: number }).n;
    expect(count(copy)).toBe(count(original));
    copy.close();
    original.close();
    expect(objects).toEqual([{ type: 'table', name: 'metadata' }, { type: 'table', name: 'tiles' }]);

    const DEMO = { z: 14, x: 8608, y: 5711 };
    const mine = await ts.client().get(`/tiles/${id}/${DEMO.z}/${DEMO.x}/${DEMO.y}.pbf`).expect(200);
    expect(mine.headers['content-encoding']).toBe('gzip');
    const builtIn = await ts.client().get(`/tiles/${DEMO.z}/${DEMO.x}/${DEMO.y}.pbf`).expect(200);
    expect(mine.headers['content-length']).toBe(builtIn.headers['content-length']);
    await admin.delete(`/api/admin/basemaps/${id}`).expect(204);
    expect(filesIn(basemapDir(ts.config))).toEqual([]);
  }, 60_000);

  it('refuses a copy larger than the size limit with 413, naming the limit, and keeps nothing', async () => {
    overrideCopyLimits({ maxBytes: 200_000 });
    const r = await upload(admin, fs.readFileSync(BUILT_IN), 'basemap.mbtiles');
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/BASEMAP_MAX_UPLOAD_MB/);
    expect(filesIn(basemapDir(ts.config))).toEqual([]);
  }, 60_000);

  it('refuses a tileset with more tiles than the tile limit with 413, naming the limit', async () => {
    overrideCopyLimits({ maxTiles: 4 });
    const r = await upload(admin, slowMbtiles('many.mbtiles', 1, 9), 'many.mbtiles');
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/more than 4 tiles/);
    expect(filesIn(basemapDir(ts.config))).toEqual([]);
  });

  it('refuses a tile that a few kilobytes of gzip blow up into more than the tile limit', async () => {
    // A valid vector tile (layer "road", version 2) whose key table is one 40 MB string of "a".
    const w = new PbfWriter();
    w.writeMessage(3, (_: unknown, l: PbfWriter) => {
      l.writeStringField(1, 'road');
      l.writeStringField(3, 'a'.repeat(40 * 1024 * 1024));
      l.writeVarintField(15, 2);
    }, null);
    const bomb = zlib.gzipSync(Buffer.from(w.finish()), { level: 9 });
    expect(bomb.length).toBeLessThan(100_000);
    const r = await upload(admin, slowMbtiles('bomb.mbtiles', 1, 1, bomb), 'bomb.mbtiles');
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/A tile at zoom 12 is larger than the limit of 8 MB for one tile/);
    expect(filesIn(basemapDir(ts.config))).toEqual([]);
  }, 60_000);
});

describe('basemaps uploaded before copies existed', () => {
  /** A row and its original file, as an older Kfield left them. */
  async function legacy(bytes: Buffer): Promise<string> {
    const id = randomUUID();
    const dir = basemapDir(ts.config);
    fs.mkdirSync(dir, { recursive: true });
    fs.writeFileSync(path.join(dir, `${id}.mbtiles`), bytes);
    await ts.ds.getRepository(Basemap).insert({
      id, name: 'Older upload', fileName: `${id}.mbtiles`, sizeBytes: bytes.length, isDefault: false,
      metadata: { title: '', description: '', attribution: '', format: 'pbf', minzoom: Z, maxzoom: Z, bounds: [9.1, 47.7, 9.2, 47.8], center: [9.15, 47.75, Z], vectorLayers: [{ id: 'road' }], gzipped: false, localBounds: null },
    });
    return id;
  }

  /** Asks for a tile every 100 ms until it is no longer 503; every answer's time and the last answer. */
  async function untilReady(url: string) {
    const times: number[] = [];
    for (;;) {
      const t0 = performance.now();
      const r = await ts.client().get(url);
      times.push(performance.now() - t0);
      if (r.status !== 503) return { r, times };
      expect(r.headers['retry-after']).toBeDefined();
      await new Promise((res) => setTimeout(res, 100));
    }
  }

  it('are copied on first use: the tile answers 503 until the copy is ready, then comes from the copy, and the original is deleted', async () => {
    const id = await legacy(slowMbtiles('legacy.mbtiles', 1_500_000));
    const { r, times } = await untilReady(`/tiles/${id}/${Z}/${AT.x}/${AT.y}.pbf`);
    expect(r.status).toBe(200);
    expect(Math.max(...times)).toBeLessThan(200);
    expect(filesIn(basemapDir(ts.config))).toEqual([`${id}.kfield.mbtiles`]);
    expect((await ts.ds.getRepository(Basemap).findOneByOrFail({ id })).fileName).toBe(`${id}.kfield.mbtiles`);
    await admin.delete(`/api/admin/basemaps/${id}`).expect(204);
  }, 30_000);

  it('are copied in the background when the server starts, before anyone asks for them', async () => {
    const id = await legacy(slowMbtiles('legacy-start.mbtiles', 1));
    const restarted = await startTestServer({}, ts.dbPath);
    try {
      const copied = path.join(basemapDir(ts.config), `${id}.kfield.mbtiles`);
      const until = Date.now() + 15_000;
      while (!fs.existsSync(copied) && Date.now() < until) await new Promise((res) => setTimeout(res, 100));
      expect(filesIn(basemapDir(ts.config))).toEqual([`${id}.kfield.mbtiles`]);
      await expect.poll(async () => (await ts.ds.getRepository(Basemap).findOneByOrFail({ id })).fileName).toBe(`${id}.kfield.mbtiles`);
      await restarted.client().get(`/tiles/${id}/${Z}/${AT.x}/${AT.y}.pbf`).expect(200);
    } finally {
      await restarted.close();
    }
    await admin.delete(`/api/admin/basemaps/${id}`).expect(204);
  }, 60_000);

  it('one that cannot be copied within the limits is never served from the original and says why', async () => {
    overrideCopyLimits({ timeMs: 1000 });
    const id = await legacy(slowMbtiles('legacy-hostile.mbtiles', 30_000_000));
    const { r, times } = await untilReady(`/tiles/${id}/${Z}/${AT.x}/${AT.y}.pbf`);
    expect(r.status).toBe(404);
    expect(r.body.error.message).toMatch(/could not be copied.*longer than the limit of 1 s/);
    expect(Math.max(...times)).toBeLessThan(200);
    await admin.delete(`/api/admin/basemaps/${id}`).expect(204);
    expect(filesIn(basemapDir(ts.config))).toEqual([]);
  }, 60_000);
});
