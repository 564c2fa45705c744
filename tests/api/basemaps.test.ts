import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { GeoJSONVT } from '@maplibre/geojson-vt';
import { VectorTile } from '@mapbox/vector-tile';
import { validateStyleMin } from '@maplibre/maplibre-gl-style-spec';
import { fromGeojsonVt } from '@maplibre/vt-pbf';
import Database from 'better-sqlite3';
import { PbfReader } from 'pbf';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { lonLatToTile, tmsRow } from '@shared/geo/tiles';
import { Basemap } from '../../server/features/basemaps/basemap.entity';
import { basemapDir } from '../../server/features/basemaps/basemaps.service';
import { Site } from '../../server/features/sites/site.entity';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let admin: ApiClient;
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-basemaps-'));
/** The tile over the invented demo site's origin (9.160136 E, 47.763255 N) at zoom 14. */
const DEMO = { z: 14, x: 8608, y: 5711 };
/** Not the test server's own origin: the style must name it anyway (given with a trailing slash). */
const PUBLIC_URL = 'http://kfield.example.org';

beforeAll(async () => {
  const r = spawnSync(process.execPath, ['tiles/ensure.mjs'], { stdio: 'inherit' });
  expect(r.status, 'the basemap build').toBe(0);
  ts = await startTestServer({ PUBLIC_URL: `${PUBLIC_URL}/` });
  admin = await ts.as(demoEmail('Admin'));
}, 180_000);
afterAll(async () => ts.close());

/** Keep binary answers as bytes (superagent has already undone the gzip encoding). */
type Parser = Extract<Parameters<ReturnType<ApiClient['get']>['parse']>[0], (res: never, cb: never) => void>;
const binary: Parser = (res, cb) => {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => cb(null, Buffer.concat(chunks)));
};
const getBinary = (c: ApiClient, url: string) => c.get(url).buffer(true).parse(binary);
const layersOf = (body: Buffer) => Object.keys(new VectorTile(new PbfReader(body)).layers);

/** A small vector MBTiles with a flat tiles table and uncompressed tiles, as other tools write them. */
function makeMbtiles(file: string, opts: { format?: string | null; tiles?: boolean; tileData?: Buffer } = {}) {
  const db = new Database(file);
  db.exec('CREATE TABLE metadata (name TEXT, value TEXT)');
  if (opts.tiles !== false) db.exec('CREATE TABLE tiles (zoom_level INTEGER, tile_column INTEGER, tile_row INTEGER, tile_data BLOB)');
  const meta: Record<string, string> = { name: 'Test region', bounds: '9.1,47.7,9.2,47.8', center: '9.15,47.75,12', minzoom: '12', maxzoom: '12', attribution: 'Test data' };
  if (opts.format !== null) meta.format = opts.format ?? 'pbf';
  for (const [k, v] of Object.entries(meta)) db.prepare('INSERT INTO metadata VALUES (?, ?)').run(k, v);
  if (opts.tiles !== false) {
    const vt = new GeoJSONVT({
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { name: 'Test Street' }, geometry: { type: 'LineString', coordinates: [[9.12, 47.72], [9.18, 47.78]] } },
        { type: 'Feature', properties: { name: 'Test Park' }, geometry: { type: 'Polygon', coordinates: [[[9.13, 47.73], [9.16, 47.73], [9.16, 47.76], [9.13, 47.73]]] } },
      ],
    }, { maxZoom: 12 });
    const { x, y } = lonLatToTile(9.15, 47.75, 12);
    const data = opts.tileData ?? Buffer.from(fromGeojsonVt({ transportation: vt.getTile(12, x, y)! }, { version: 2, extent: 4096 }));
    db.prepare('INSERT INTO tiles VALUES (?, ?, ?, ?)').run(12, x, tmsRow(12, y), data);
  }
  db.close();
  return fs.readFileSync(file);
}

const upload = (c: ApiClient, bytes: Buffer, filename: string, name?: string) => {
  const req = c.agent.post('/api/admin/basemaps').set('x-csrf-token', c.csrf).attach('file', bytes, filename);
  return name ? req.field('name', name) : req;
};

function savedNothing(before: number) {
  return async () => {
    expect(await ts.ds.getRepository(Basemap).count()).toBe(before);
    const dir = basemapDir(ts.config);
    const files = fs.existsSync(dir) ? fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()) : [];
    expect(files.map((f) => f.name)).toEqual([]);
  };
}

describe('tiles of the built-in basemap', () => {
  it('serves a demo-area tile gzipped with its type, an ETag and a long cache lifetime, and 304 on If-None-Match', async () => {
    const r = await getBinary(ts.client(), `/tiles/${DEMO.z}/${DEMO.x}/${DEMO.y}.pbf`).expect(200);
    expect(r.headers['content-type']).toBe('application/x-protobuf');
    expect(r.headers['content-encoding']).toBe('gzip');
    expect(r.headers['cache-control']).toMatch(/public, max-age=(\d{5,})/);
    expect(r.headers.etag).toMatch(/^"[^"]+"$/);
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    expect(layersOf(r.body)).toEqual(expect.arrayContaining(['road', 'building', 'landuse', 'site']));
    const again = await ts.client().get(`/tiles/${DEMO.z}/${DEMO.x}/${DEMO.y}.pbf`).set('If-None-Match', r.headers.etag);
    expect(again.status).toBe(304);
    expect(again.headers.etag).toBe(r.headers.etag);
  });

  it('sends the tile uncompressed to a client that does not accept gzip', async () => {
    const r = await getBinary(ts.client(), `/tiles/${DEMO.z}/${DEMO.x}/${DEMO.y}.pbf`).set('Accept-Encoding', 'identity').expect(200);
    expect(r.headers['content-encoding']).toBeUndefined();
    expect(layersOf(r.body)).toContain('road');
  });

  it('answers 204 where there is no tile, and 400 for an address that is not a tile', async () => {
    const far = lonLatToTile(-3.7, 40.4, 14);
    const none = await ts.client().get(`/tiles/14/${far.x}/${far.y}.pbf`);
    expect(none.status).toBe(204);
    expect(none.body).toEqual({});
    expect((await ts.client().get('/tiles/3/8/0.pbf')).status).toBe(400);
    expect((await ts.client().get('/tiles/three/1/0.pbf')).status).toBe(400);
    expect((await ts.client().get('/tiles/40/0/0.pbf')).status).toBe(400);
  });

  it('sets no cookie on tiles, even for a signed-in user', async () => {
    const r = await admin.get(`/tiles/${DEMO.z}/${DEMO.x}/${DEMO.y}.pbf`).expect(200);
    expect(r.headers['set-cookie']).toBeUndefined();
  });

  it('answers an unknown tile path with a JSON 404, not the client app', async () => {
    const r = await ts.client().get('/tiles/nothing/here');
    expect(r.status).toBe(404);
    expect(r.body.error.code).toBe('NOT_FOUND');
    expect((await ts.client().get('/tiles/4d1c2a5e-0000-4000-8000-000000000000/style.json')).status).toBe(404);
  });
});

describe('the style', () => {
  it('is a valid MapLibre style whose tile and glyph URLs are absolute on PUBLIC_URL and resolve', async () => {
    const r = await ts.client().get('/tiles/style.json').expect(200);
    const style = r.body;
    expect(validateStyleMin(style).map((e) => e.message)).toEqual([]);
    expect(style.glyphs.startsWith(`${PUBLIC_URL}/tiles/glyphs/{fontstack}/{range}.pbf?v=`)).toBe(true);
    const sources = Object.values(style.sources) as { tiles: string[]; minzoom: number; maxzoom: number }[];
    expect(sources).toHaveLength(2);
    for (const s of sources) expect(s.tiles[0].startsWith(`${PUBLIC_URL}/tiles/{z}/{x}/{y}.pbf?v=`)).toBe(true);
    const tileUrl = new URL(sources[0].tiles[0].replace('{z}', String(DEMO.z)).replace('{x}', String(DEMO.x)).replace('{y}', String(DEMO.y)));
    const tile = await ts.client().get(tileUrl.pathname + tileUrl.search).expect(200);
    expect(tile.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    const font = style.layers.find((l: { layout?: { 'text-font'?: string[] } }) => Array.isArray(l.layout?.['text-font'])).layout['text-font'];
    const glyphUrl = new URL(style.glyphs.replace('{fontstack}', encodeURIComponent(font.join(','))).replace('{range}', '0-255'));
    const glyph = await ts.client().get(glyphUrl.pathname + glyphUrl.search).expect(200);
    expect(glyph.headers['content-type']).toBe('application/x-protobuf');
    expect(glyph.headers['cache-control']).toBe('public, max-age=31536000, immutable');
  });

  it('names PUBLIC_URL, never the Host header the caller sent', async () => {
    const uploadedId = (await upload(admin, makeMbtiles(path.join(tmp, 'style.mbtiles')), 'style.mbtiles').expect(201)).body.id;
    try {
      for (const url of ['/tiles/style.json', `/tiles/${uploadedId}/style.json`]) {
        const r = await ts.client().get(url).set('Host', 'evil.example.test:8443').set('X-Forwarded-Host', 'evil.example.test').expect(200);
        expect(r.body.glyphs.startsWith(`${PUBLIC_URL}/tiles/glyphs/`)).toBe(true);
        const tiles = Object.values(r.body.sources as Record<string, { tiles: string[] }>).flatMap((s) => s.tiles);
        expect(tiles.length).toBeGreaterThan(0);
        for (const t of tiles) expect(t.startsWith(`${PUBLIC_URL}/tiles/`)).toBe(true);
      }
    } finally {
      await admin.delete(`/api/admin/basemaps/${uploadedId}`).expect(204);
    }
  });
});

describe('the API document', () => {
  it('lists the tile routes with their media type and the upload as multipart', async () => {
    const doc = (await ts.client().get('/api/openapi.json').expect(200)).body;
    const tile = doc.paths['/tiles/{z}/{x}/{y}.pbf'].get;
    expect(Object.keys(tile.responses['200'].content)).toEqual(['application/x-protobuf']);
    expect(Object.keys(doc.paths['/tiles/{basemapId}/{z}/{x}/{y}.pbf'].get.responses['200'].content)).toEqual(['application/x-protobuf']);
    expect(Object.keys(doc.paths['/tiles/glyphs/{fontstack}/{range}.pbf'].get.responses['200'].content)).toEqual(['application/x-protobuf']);
    expect(Object.keys(doc.paths['/api/admin/basemaps'].post.requestBody.content)).toEqual(['multipart/form-data']);
  });
});

describe('glyphs', () => {
  it('serves a glyph range of a font stack, the first known font of a list, and an empty range the font lacks', async () => {
    const r = await getBinary(ts.client(), '/tiles/glyphs/Roboto%20Flex%20Bold/0-255.pbf').expect(200);
    expect(r.body.length).toBeGreaterThan(10_000);
    const list = await getBinary(ts.client(), `/tiles/glyphs/${encodeURIComponent('Noto Sans Regular,Roboto Flex Regular')}/0-255.pbf`).expect(200);
    expect(list.body.includes(Buffer.from('Roboto Flex Regular'))).toBe(true);
    const cjk = await getBinary(ts.client(), '/tiles/glyphs/Roboto%20Flex%20Regular/19968-20223.pbf').expect(200);
    expect(cjk.body.length).toBeLessThan(100);
    expect((await ts.client().get('/tiles/glyphs/Roboto%20Flex%20Regular/1-2.pbf')).status).toBe(400);
  });
});

describe('uploading basemaps', () => {
  it('accepts a small vector MBTiles, serves its tiles gzipped and a style for it, and lets a Lead choose it for a site', async () => {
    const bytes = makeMbtiles(path.join(tmp, 'ok.mbtiles'));
    const r = await upload(admin, bytes, 'ok.mbtiles', 'Test region').expect(201);
    expect(r.body).toMatchObject({ name: 'Test region', builtIn: false, isDefault: false, styleKind: 'generic' });
    expect(r.body.metadata).toMatchObject({ format: 'pbf', minzoom: 12, maxzoom: 12, bounds: [9.1, 47.7, 9.2, 47.8], gzipped: false });
    expect(r.body.metadata.vectorLayers).toEqual([{ id: 'transportation' }]);
    const id = r.body.id as string;
    // What is kept and served is Kfield's copy of the upload, not the upload.
    const copy = path.join(basemapDir(ts.config), `${id}.kfield.mbtiles`);
    expect(r.body.sizeBytes).toBe(fs.statSync(copy).size);

    const list = (await admin.get('/api/admin/basemaps').expect(200)).body.basemaps as { id: string; builtIn: boolean; isDefault: boolean }[];
    expect(list.map((b) => b.id)).toEqual(['default', id]);
    expect(list[0]).toMatchObject({ builtIn: true, isDefault: true, siteCount: await ts.ds.getRepository(Site).count() });

    const { x, y } = lonLatToTile(9.15, 47.75, 12);
    const tile = await getBinary(admin, `/tiles/${id}/12/${x}/${y}.pbf`).expect(200);
    expect(tile.headers['content-encoding']).toBe('gzip');
    expect(layersOf(tile.body)).toEqual(['transportation']);
    const style = (await ts.client().get(`/tiles/${id}/style.json`).expect(200)).body;
    expect(validateStyleMin(style).map((e) => e.message)).toEqual([]);

    const lead = await ts.as(demoEmail('Lead'));
    const choices = (await lead.get('/api/basemaps').expect(200)).body.basemaps;
    expect(choices.map((b: { id: string }) => b.id)).toEqual(['default', id]);
    const site = await lead.patch(`/api/sites/${ts.demoSiteId}`, { basemapId: id }).expect(200);
    expect(site.body).toMatchObject({ basemapId: id, basemapStyleUrl: `/tiles/${id}/style.json` });
    const bad = await lead.patch(`/api/sites/${ts.demoSiteId}`, { basemapId: '0c8f3e1a-1111-4222-8333-444455556666' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.basemapId).toBeDefined();

    // The instance default applies to sites without a choice of their own.
    await admin.patch(`/api/admin/basemaps/${id}`, { isDefault: true }).expect(200);
    await lead.patch(`/api/sites/${ts.demoSiteId}`, { basemapId: null }).expect(200);
    expect((await lead.get(`/api/sites/${ts.demoSiteId}`).expect(200)).body).toMatchObject({ basemapId: null, basemapStyleUrl: `/tiles/${id}/style.json` });
    await admin.patch('/api/admin/basemaps/default', { isDefault: true }).expect(200);
    expect((await lead.get(`/api/sites/${ts.demoSiteId}`).expect(200)).body.basemapStyleUrl).toBe('/tiles/style.json');

    // Deleting it sends sites that chose it back to the instance default and removes the file.
    await lead.patch(`/api/sites/${ts.demoSiteId}`, { basemapId: id }).expect(200);
    await admin.delete(`/api/admin/basemaps/${id}`).expect(204);
    expect((await ts.ds.getRepository(Site).findOneByOrFail({ id: ts.demoSiteId })).basemapId).toBeNull();
    expect(fs.existsSync(copy)).toBe(false);
    expect((await ts.client().get(`/tiles/${id}/12/${x}/${y}.pbf`)).status).toBe(404);
  });

  const refusals: [string, () => Buffer, string, RegExp][] = [
    ['a PNG image', () => Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(200, 7)]), 'map.png', /not an SQLite file \(it looks like a PNG image\)/],
    ['a text file', () => Buffer.from('zoom,x,y\n14,1,2\n'), 'tiles.txt', /not an SQLite file \(it looks like a text file\)/],
    ['an empty file', () => Buffer.alloc(0), 'empty.mbtiles', /The file is empty/],
    ['an SQLite file without tiles', () => {
      const f = path.join(tmp, 'no-tiles.sqlite');
      const db = new Database(f);
      db.exec('CREATE TABLE wells (name TEXT)');
      db.close();
      return fs.readFileSync(f);
    }, 'no-tiles.mbtiles', /no tiles table/],
    ['an MBTiles without metadata rows for the format', () => makeMbtiles(path.join(tmp, 'no-format.mbtiles'), { format: null }), 'no-format.mbtiles', /no format entry/],
    ['a raster MBTiles (format png)', () => makeMbtiles(path.join(tmp, 'raster.mbtiles'), { format: 'png', tileData: Buffer.from([0x89, 0x50, 0x4e, 0x47, 1, 2, 3]) }), 'raster.mbtiles', /format is png, not pbf/],
    ['an MBTiles that claims pbf but holds PNG tiles', () => makeMbtiles(path.join(tmp, 'liar.mbtiles'), { tileData: Buffer.from([0x89, 0x50, 0x4e, 0x47, 1, 2, 3]) }), 'liar.mbtiles', /PNG images although the metadata says pbf/],
    ['an MBTiles whose tiles are not vector tiles', () => makeMbtiles(path.join(tmp, 'junk.mbtiles'), { tileData: zlib.gzipSync(Buffer.from([0x08, 0x96, 0x01, 0xff, 0xff])) }), 'junk.mbtiles', /not Mapbox vector tiles/],
  ];
  for (const [what, bytes, filename, message] of refusals) {
    it(`refuses ${what} with a clear message and keeps nothing`, async () => {
      const before = await ts.ds.getRepository(Basemap).count();
      const r: Response = await upload(admin, bytes(), filename);
      expect(r.status).toBe(400);
      expect(r.body.error.message).toMatch(message);
      expect(r.body.error.fields.file).toMatch(message);
      await savedNothing(before)();
    });
  }

  it('asks for a multipart file when none is sent', async () => {
    const r = await admin.post('/api/admin/basemaps', { name: 'x' });
    expect(r.status).toBe(400);
    expect(r.body.error.message).toMatch(/multipart\/form-data/);
  });

  it('refuses uploads from anyone but an Admin, before reading the file', async () => {
    const bytes = makeMbtiles(path.join(tmp, 'lead.mbtiles'));
    const lead = await ts.as(demoEmail('Lead'));
    expect((await upload(lead, bytes, 'lead.mbtiles')).status).toBe(403);
    const anon = await ts.client().refreshCsrf();
    expect((await upload(anon, bytes, 'anon.mbtiles')).status).toBe(401);
    expect((await lead.get('/api/admin/basemaps')).status).toBe(403);
    await savedNothing(0)();
  });

  it('keeps the built-in basemap: it cannot be deleted or renamed', async () => {
    const del = await admin.delete('/api/admin/basemaps/default');
    expect(del.status).toBe(409);
    expect((await admin.patch('/api/admin/basemaps/default', { name: 'Mine' })).status).toBe(400);
  });
});
