import { DOMParser } from '@xmldom/xmldom';
import { fromArrayBuffer } from 'geotiff';
import JSZip from 'jszip';
import getShapefile, { parseShp } from 'shpjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTIONS } from '../../shared/cautions';
import { readDelimitedTable } from '../../shared/csv/read-table';
import { DEMO_OUTLINE_NAME } from '../../server/db/seed/demo-surface';
import { FitEntity } from '../../server/features/fits/fit.entity';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let viewer: ApiClient;
let lead: ApiClient;
let outlineId: string;

beforeAll(async () => {
  ts = await startTestServer();
  viewer = await ts.as(demoEmail('Viewer'));
  lead = await ts.as(demoEmail('Lead'));
  const outlines = (await viewer.get(`${base()}/outlines`).expect(200)).body.outlines;
  outlineId = outlines.find((o: { name: string }) => o.name === DEMO_OUTLINE_NAME).id;
});
afterAll(async () => ts.close());

const base = () => `/api/sites/${ts.demoSiteId}`;
const exp = (file: string) => `${base()}/exports/${file}`;
const today = () => new Date().toISOString().slice(0, 10);
/** supertest keeps a binary answer as a Buffer only when asked to. */
const binary = (req: ReturnType<ApiClient['get']>) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });
const arrayBuffer = (b: Buffer) => b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
const decode = (b64: string) => {
  const buf = Buffer.from(b64, 'base64');
  const out = new Float32Array(buf.length / 4);
  for (let i = 0; i < out.length; i++) out[i] = buf.readFloatLE(i * 4);
  return out;
};

interface WellInfo { id: string; name: string; siteX: number; siteY: number; lon: number; lat: number; log10K: number | null; wellK: number | null; count: number }
/** The wells as Kfield holds them: positions from the wells route, Well K from the K map's layer (held to wellKFor by map.test.ts). */
async function wells(): Promise<WellInfo[]> {
  const list = (await viewer.get(`${base()}/wells`).expect(200)).body.wells;
  const layer = (await viewer.get(`${base()}/map/wells`).expect(200)).body;
  const k = new Map(layer.features.map((f: { id: string; properties: { log10K: number | null; wellK: number | null; count: number } }) => [f.id, f.properties]));
  return list.map((w: WellInfo) => {
    const p = k.get(w.id) as { log10K: number | null; wellK: number | null; count: number };
    return { id: w.id, name: w.name, siteX: w.siteX, siteY: w.siteY, lon: w.lon, lat: w.lat, log10K: p.log10K, wellK: p.wellK, count: p.count };
  });
}

describe('wells exports', () => {
  it('gives a zipped shapefile in the site’s system: points within 1 mm of the wells, a .prj naming EPSG:32632, Well K in the attributes', async () => {
    const r = await binary(viewer.get(exp('wells-shapefile.zip'))).expect(200);
    expect(r.headers['content-type']).toMatch(/application\/zip/);
    expect(r.headers['content-disposition']).toBe(`attachment; filename="former-fuel-depot-invented-wells-shapefile-${today()}.zip"`.replace('former-fuel-depot-invented', r.headers['content-disposition'].match(/filename="(.+)-wells-shapefile-/)![1]));
    const zip = await JSZip.loadAsync(r.body as Buffer);
    const names = Object.keys(zip.files).sort();
    const stem = names.find((n) => n.endsWith('.shp'))!.slice(0, -4);
    expect(names).toEqual(['README.txt', `${stem}.cpg`, `${stem}.dbf`, `${stem}.prj`, `${stem}.shp`, `${stem}.shx`].sort());
    const prj = await zip.file(`${stem}.prj`)!.async('string');
    expect(prj).toMatch(/^PROJCS\["WGS 84 \/ UTM zone 32N"/);
    expect(prj).toContain('AUTHORITY["EPSG","32632"]');
    expect(await zip.file('README.txt')!.async('string')).toContain(CAUTIONS[0]);

    const ws = await wells();
    // Raw coordinates, as the .shp holds them (no reprojection): the site's easting and northing.
    const points = parseShp(await zip.file(`${stem}.shp`)!.async('uint8array'), false) as { type: 'Point'; coordinates: [number, number] }[];
    expect(points.length).toBe(ws.length);
    const fc = await getShapefile(r.body as Buffer);
    fc.features.forEach((f, i) => {
      const w = ws.find((x) => x.name === (f.properties as { name: string }).name)!;
      expect(w, String((f.properties as { name: string }).name)).toBeDefined();
      expect(Math.abs(points[i].coordinates[0] - w.siteX)).toBeLessThan(0.001);
      expect(Math.abs(points[i].coordinates[1] - w.siteY)).toBeLessThan(0.001);
      // shpjs reprojects with the .prj: back to the wells' WGS84 within 1e-7° (about 1 cm).
      const [lon, lat] = (f.geometry as unknown as { coordinates: [number, number] }).coordinates;
      expect(Math.abs(lon - w.lon)).toBeLessThan(1e-7);
      expect(Math.abs(lat - w.lat)).toBeLessThan(1e-7);
      const p = f.properties as { k_m_s: number | null; n_fits: number; log10_k: number | null };
      if (w.wellK === null) expect(p.n_fits).toBe(0);
      else {
        // Six significant digits in the dBASE field.
        expect(Math.abs(p.k_m_s! / w.wellK - 1)).toBeLessThan(1e-5);
        expect(p.n_fits).toBe(w.count);
        expect(Math.abs(p.log10_k! - w.log10K!)).toBeLessThan(0.0006);
      }
    });
    // Every dBASE field name fits in 10 characters.
    for (const k of Object.keys(fc.features[0].properties!)) expect(k.length).toBeLessThanOrEqual(10);
  });

  it('gives GeoJSON per RFC 7946: longitude then latitude in WGS84, no crs member, the cautions as a foreign member', async () => {
    const r = await viewer.get(exp('wells.geojson')).expect(200);
    expect(r.headers['content-type']).toMatch(/application\/geo\+json/);
    expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-wells-${today()}\\.geojson"$`));
    const fc = JSON.parse(r.text);
    expect(fc.type).toBe('FeatureCollection');
    expect(fc).not.toHaveProperty('crs');
    expect(fc.cautions).toEqual(CAUTIONS);
    const ws = await wells();
    expect(fc.features.length).toBe(ws.length);
    for (const f of fc.features) {
      const w = ws.find((x) => x.id === f.id)!;
      expect(f.geometry).toEqual({ type: 'Point', coordinates: [w.lon, w.lat] });
      // The demo site is near 9.16° E, 47.77° N: longitude first.
      expect(f.geometry.coordinates[0]).toBeCloseTo(9.16, 1);
      expect(f.properties.log10K === null ? null : f.properties.log10K).toBe(w.log10K === null ? null : f.properties.log10K);
      if (w.log10K !== null) expect(f.properties.log10K).toBeCloseTo(w.log10K, 12);
    }
  });

  it('gives KML that parses, a Placemark per well, the cautions in the folder’s description', async () => {
    const r = await viewer.get(exp('wells.kml')).expect(200);
    expect(r.headers['content-type']).toMatch(/application\/vnd\.google-earth\.kml\+xml/);
    const errors: string[] = [];
    const doc = new DOMParser({ onError: (level, msg) => errors.push(`${level}: ${msg}`) }).parseFromString(r.text, 'text/xml');
    expect(errors).toEqual([]);
    const ws = await wells();
    const placemarks = doc.getElementsByTagName('Placemark');
    expect(placemarks.length).toBe(ws.length);
    const folder = doc.getElementsByTagName('Folder')[0];
    const description = Array.from(folder.childNodes).find((n) => n.nodeName === 'description')!;
    expect(description.textContent).toContain(CAUTIONS[1]);
    const first = placemarks[0];
    const name = first.getElementsByTagName('name')[0].textContent;
    const w = ws.find((x) => x.name === name)!;
    expect(first.getElementsByTagName('coordinates')[0].textContent).toBe(`${w.lon},${w.lat}`);
  });

  it('gives CSV with SI unit suffixes in the header and a text cell starting with = + - @ neutralised, numbers left as numbers', async () => {
    const ws = await wells();
    const target = ws.find((w) => w.log10K !== null)!;
    await lead.patch(`/api/wells/${target.id}`, { name: '=HYPERLINK("http://x.example","MW")' }).expect(200);
    try {
      const r = await viewer.get(exp('wells.csv')).expect(200);
      expect(r.headers['content-type']).toMatch(/^text\/csv; charset=utf-8/);
      expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-wells-${today()}\\.csv"$`));
      expect(r.text.startsWith('\uFEFF')).toBe(true);
      const t = readDelimitedTable(r.text, ',');
      expect(t.header).toContain('well_k_m_per_s');
      expect(t.header).toContain('x_epsg_32632_metre');
      expect(t.records.length).toBe(ws.length);
      const col = (n: string) => t.header.indexOf(n);
      const row = t.records.find((x) => x.values[col('well_id')] === target.id)!.values;
      expect(row[col('well')]).toBe(`'=HYPERLINK("http://x.example","MW")`);
      // A negative number stays a number.
      expect(row[col('log10_well_k_m_per_s')]).toMatch(/^-\d/);
      expect(Number(row[col('log10_well_k_m_per_s')])).toBeCloseTo(target.log10K!, 12);
      expect(Number(row[col('well_k_m_per_s')]) / target.wellK! - 1).toBeCloseTo(0, 12);
      expect(Number(row[col('x_epsg_32632_metre')])).toBe(target.siteX);

      const fits = await viewer.get(exp('fits.csv')).expect(200);
      const f = readDelimitedTable(fits.text, ',');
      const wellCol = f.header.indexOf('well');
      expect(f.records.some((x) => x.values[wellCol] === `'=HYPERLINK("http://x.example","MW")`)).toBe(true);
    } finally {
      await lead.patch(`/api/wells/${target.id}`, { name: target.name }).expect(200);
    }
  });
});

describe('the fits export', () => {
  it('has one row per Checked fit that counts for Well K, with the stored numbers', async () => {
    const r = await viewer.get(exp('fits.csv')).expect(200);
    expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-fits-${today()}\\.csv"$`));
    const t = readDelimitedTable(r.text, ',');
    expect(t.header.slice(0, 3)).toEqual(['well', 'well_id', 'record_id']);
    for (const h of ['method', 'window_from_s', 'window_to_s', 't0_s', 'k_m_per_s', 'r_squared', 'n_readings', 'flags', 'preparer', 'checker', 'checked_at']) expect(t.header).toContain(h);
    const stored = await ts.ds.getRepository(FitEntity).find({ where: { siteId: ts.demoSiteId, status: 'checked' } });
    const counting = stored.filter((s) => s.supersededAt === null);
    expect(counting.length).toBeGreaterThan(10);
    expect(t.records.length).toBe(counting.length);
    const col = (n: string) => t.header.indexOf(n);
    for (const rec of t.records) {
      const v = rec.values;
      const s = counting.find((x) => x.id === v[col('fit_id')])!;
      expect(s, v[col('fit_id')]).toBeDefined();
      // The shortest decimal of a double reads back as the same double.
      expect(Number(v[col('k_m_per_s')])).toBe(s.kMetersPerSecond);
      expect(Number(v[col('t0_s')])).toBe(s.result.t0Seconds);
      expect(Number(v[col('r_squared')])).toBe(s.result.rSquared);
      expect(Number(v[col('n_readings')])).toBe(s.result.count);
      expect(Number(v[col('window_from_s')])).toBe(s.result.window.fromSeconds);
      expect(v[col('method')]).toBe(s.method);
      expect(v[col('checked_at')]).toBe(s.checkedAt!.toISOString());
      expect(v[col('checker')]).not.toBe('');
    }
  });
});

describe('K surface exports', () => {
  it('gives a float32 GeoTIFF in EPSG:32632 that a GIS places on the wells: the surface’s cells, nodata outside the outline, a cell on a well equal to its log10 K', async () => {
    const q = { outlineId, cellSizeM: 1 };
    const s = (await viewer.get(`${base()}/k-surface`).query(q).expect(200)).body;
    const r = await binary(viewer.get(exp('k-surface.tif')).query(q)).expect(200);
    expect(r.headers['content-type']).toBe('image/tiff');
    expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-k-surface-${today()}\\.tif"$`));
    const tiff = await fromArrayBuffer(arrayBuffer(r.body as Buffer));
    const image = await tiff.getImage();
    expect([image.getWidth(), image.getHeight()]).toEqual([s.cols, s.rows]);
    expect(image.getGeoKeys()).toMatchObject({ GTModelTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32632, GTRasterTypeGeoKey: 1 });
    expect(image.getOrigin()).toEqual([s.minX, s.minY + s.rows * s.cellSizeM, 0]);
    expect(image.getResolution()).toEqual([1, -1, 0]);
    expect(image.getGDALNoData()).toBe(-9999);
    expect(image.getBitsPerSample()).toBe(32);
    expect(image.getSampleFormat()).toBe(3);
    const description = String(await image.fileDirectory.loadValue('ImageDescription'));
    expect(description).toContain('interpolated K between wells is an estimate');
    expect(description).toContain('licensed geologist or engineer');
    const [band] = (await image.readRasters()) as unknown as [Float32Array];
    const cells = decode(s.log10K);
    let outside = 0;
    let differ = 0;
    for (let i = 0; i < cells.length; i++) {
      if (Number.isNaN(cells[i])) outside++;
      if (band[i] !== (Number.isNaN(cells[i]) ? -9999 : cells[i])) differ++;
    }
    expect(differ).toBe(0);
    // The grid's north-west corner lies outside the plume outline.
    expect(band[0]).toBe(-9999);
    expect(outside).toBeGreaterThan(0);

    // A lone well (no other within 10 m) inside the outline: the cell it falls in.
    const ws = (await wells()).filter((w) => w.log10K !== null);
    const [ox, oy] = image.getOrigin();
    const lone = ws.filter((w) => ws.every((o) => o === w || Math.hypot(o.siteX - w.siteX, o.siteY - w.siteY) > 10));
    const inside = lone.filter((w) => {
      const c = Math.floor(w.siteX - ox);
      const rr = Math.floor(oy - w.siteY);
      return c >= 0 && c < s.cols && rr >= 0 && rr < s.rows && band[rr * s.cols + c] !== -9999;
    });
    expect(inside.length).toBeGreaterThan(3);
    for (const w of inside) {
      const v = band[Math.floor(oy - w.siteY) * s.cols + Math.floor(w.siteX - ox)];
      // IDW passes through its data points (Shepard 1968). At a cell centre d ≤ √2/2 m from well i the
      // estimate is (z_i/d² + Σ z_j/D_j²)/(1/d² + Σ 1/D_j²) with power 2, so it departs from z_i by at most
      // d²·Σ|z_j − z_i|/D_j² (D_j the distance to well j less d): that bound, plus float32 rounding, is the tolerance.
      const d = Math.SQRT1_2;
      const bound = ws.filter((o) => o !== w).reduce((a, o) => a + (d * d * Math.abs(o.log10K! - w.log10K!)) / (Math.hypot(o.siteX - w.siteX, o.siteY - w.siteY) - d) ** 2, 0);
      expect(bound, w.name).toBeLessThan(0.05);
      expect(Math.abs(v - w.log10K!), `${w.name}: cell ${v}, Well K ${w.log10K}, bound ${bound}`).toBeLessThanOrEqual(bound + 1e-6);
    }
  });

  it('gives isobands of log10 K as RFC 7946 GeoJSON in WGS84 inside the outline, with their K ranges and the cautions', async () => {
    const r = await viewer.get(exp('k-surface-isobands.geojson')).query({ outlineId, stepLog10: 0.5 }).expect(200);
    expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-k-surface-isobands-${today()}\\.geojson"$`));
    const fc = JSON.parse(r.text);
    expect(fc).not.toHaveProperty('crs');
    expect(fc.cautions).toEqual(CAUTIONS);
    expect(fc.features.length).toBeGreaterThan(1);
    const outline = (await viewer.get(`${base()}/outlines/${outlineId}`).expect(200)).body.geometry.coordinates[0] as [number, number][];
    const [w, e] = [Math.min(...outline.map((p) => p[0])), Math.max(...outline.map((p) => p[0]))];
    const [so, n] = [Math.min(...outline.map((p) => p[1])), Math.max(...outline.map((p) => p[1]))];
    for (const f of fc.features) {
      expect(f.geometry.type).toBe('MultiPolygon');
      expect(f.properties.upperLog10K - f.properties.lowerLog10K).toBeCloseTo(0.5, 9);
      expect(f.properties.lowerKMetersPerSecond).toBeCloseTo(10 ** f.properties.lowerLog10K, 15);
      expect(f.properties.areaM2).toBeGreaterThan(0);
      for (const poly of f.geometry.coordinates)
        for (const ring of poly)
          for (const [lon, lat] of ring) {
            expect(lon).toBeGreaterThanOrEqual(w - 1e-4);
            expect(lon).toBeLessThanOrEqual(e + 1e-4);
            expect(lat).toBeGreaterThanOrEqual(so - 1e-4);
            expect(lat).toBeLessThanOrEqual(n + 1e-4);
          }
    }
    // Each band covers the cells of the surface in its range: its area is their count × the cell area
    // (within 3 %: the band's edge runs between cell centres, and the area is geodesic, the cells in UTM metres).
    const sf = (await viewer.get(`${base()}/k-surface`).query({ outlineId }).expect(200)).body;
    const cells = decode(sf.log10K);
    for (const f of fc.features) {
      let n = 0;
      for (const z of cells) if (z >= f.properties.lowerLog10K && z < f.properties.upperLog10K) n++;
      if (n < 200) continue;
      expect(f.properties.areaM2 / (n * sf.cellSizeM ** 2), `band from ${f.properties.lowerLog10K}`).toBeGreaterThan(0.97);
      expect(f.properties.areaM2 / (n * sf.cellSizeM ** 2), `band from ${f.properties.lowerLog10K}`).toBeLessThan(1.03);
    }
  });

  it('answers 400 naming the field for bad surface settings', async () => {
    const a = await viewer.get(exp('k-surface.tif')).query({ power: 'abc' }).expect(400);
    expect(a.body.error.fields).toHaveProperty('power');
    const b = await viewer.get(exp('k-surface-isobands.geojson')).query({ stepLog10: 0 }).expect(400);
    expect(b.body.error.fields).toHaveProperty('stepLog10');
    await viewer.get(exp('k-surface.tif')).query({ cellSizeM: 0.01 }).expect(400);
  });
});

describe('who may download exports', () => {
  const files = ['wells.csv', 'wells.geojson', 'wells-shapefile.zip', 'wells.kml', 'k-surface.tif', 'k-surface-isobands.geojson', 'fits.csv'];
  it('lets a Viewer download every export, answers an outsider 404 and no one signed in 401', async () => {
    await (await ts.as(demoEmail('Admin'))).post('/api/admin/users', { email: 'exports.outsider@demo.kfield.example', name: 'Exports Outsider', password: 'outsider-password-1' }).expect(201);
    const outsider = await ts.as('exports.outsider@demo.kfield.example', 'outsider-password-1');
    for (const f of files) {
      const ok = await binary(viewer.get(exp(f))).expect(200);
      expect(ok.headers['content-disposition'], f).toMatch(/^attachment; filename="[a-z0-9-]+-[a-z-]+-\d{4}-\d\d-\d\d\.[a-z]+"$/);
      expect((await outsider.get(exp(f))).status, f).toBe(404);
      expect((await ts.client().get(exp(f))).status, f).toBe(401);
    }
  });

  it('lists every export in the OpenAPI document with its media type', async () => {
    const doc = (await viewer.get('/api/openapi.json').expect(200)).body;
    const types: Record<string, string> = {
      'wells.csv': 'text/csv', 'wells.geojson': 'application/geo+json', 'wells-shapefile.zip': 'application/zip', 'wells.kml': 'application/vnd.google-earth.kml+xml',
      'k-surface.tif': 'image/tiff', 'k-surface-isobands.geojson': 'application/geo+json', 'fits.csv': 'text/csv',
    };
    for (const f of files) {
      const op = doc.paths[`/api/sites/{siteId}/exports/${f}`]?.get;
      expect(op, f).toBeDefined();
      expect(Object.keys(op.responses['200'].content ?? {}), f).toContain(types[f]);
    }
  });
});
