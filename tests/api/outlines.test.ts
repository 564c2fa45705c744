import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outlineListSchema } from '../../shared/schemas/ksurface';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let lead: ApiClient;
let analyst: ApiClient;
let viewer: ApiClient;
let admin: ApiClient;

beforeAll(async () => {
  ts = await startTestServer();
  [lead, analyst, viewer, admin] = await Promise.all((['Lead', 'Analyst', 'Viewer', 'Admin'] as const).map((r) => ts.as(demoEmail(r))));
});
afterAll(async () => ts.close());

const UTM32 = '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs';
/** Demo-site coordinates as offsets (m) from easting 512000, northing 5290000 on EPSG:32632, to lon/lat. */
const ll = (dx: number, dy: number) => proj4(UTM32, 'WGS84', [512000 + dx, 5290000 + dy]);
const square = (cx: number, cy: number, half: number) => ({
  type: 'Polygon',
  coordinates: [[ll(cx - half, cy - half), ll(cx + half, cy - half), ll(cx + half, cy + half), ll(cx - half, cy + half), ll(cx - half, cy - half)]],
});
const url = (siteId = ts.demoSiteId) => `/api/sites/${siteId}/outlines`;

async function refusal(body: object, siteId = ts.demoSiteId): Promise<string> {
  const r = await analyst.post(url(siteId), body);
  expect(r.status, JSON.stringify(r.body)).toBe(400);
  expect(r.body.error.fields).toHaveProperty('geometry');
  return r.body.error.fields.geometry as string;
}

describe('outlines', () => {
  it('are created from WGS84 GeoJSON, listed, read, renamed, exported and deleted', async () => {
    const created = (await analyst.post(url(), { name: 'Study area A', geometry: square(0, 0, 100) }).expect(201)).body;
    expect(created).toMatchObject({ name: 'Study area A', siteId: ts.demoSiteId, geometry: { type: 'Polygon' } });
    // A 200 m square on UTM: 40,000 m², within the scale factor of the zone (0.9996² near its middle).
    expect(created.areaM2).toBeGreaterThan(39_900);
    expect(created.areaM2).toBeLessThan(40_100);
    expect(typeof created.createdBy).toBe('string');

    const listed = (await viewer.get(url()).expect(200)).body;
    expect(outlineListSchema.safeParse(listed).success).toBe(true);
    const list = listed.outlines;
    expect(list.map((o: { id: string }) => o.id)).toContain(created.id);
    expect((await viewer.get(`${url()}/${created.id}`).expect(200)).body.name).toBe('Study area A');

    const renamed = (await lead.patch(`${url()}/${created.id}`, { name: 'Study area B' }).expect(200)).body;
    expect(renamed.name).toBe('Study area B');
    expect(renamed.geometry).toEqual(created.geometry);

    const file = await viewer.get(`${url()}/${created.id}.geojson`).expect(200);
    expect(file.headers['content-disposition']).toMatch(/attachment; filename=".*\.geojson"/);
    const feature = JSON.parse(file.text);
    expect(feature).toMatchObject({ type: 'Feature', geometry: created.geometry, properties: { name: 'Study area B', areaM2: created.areaM2 } });

    await analyst.delete(`${url()}/${created.id}`).expect(204);
    expect((await viewer.get(`${url()}/${created.id}`)).status).toBe(404);
  });

  it("takes coordinates in the site's own system and stores them as WGS84", async () => {
    const half = 80;
    const ring = [[-half, -half], [half, -half], [half, half], [-half, half], [-half, -half]].map(([x, y]) => [512000 + x, 5290000 + y]);
    const r = (await analyst.post(url(), { name: 'In UTM', crs: 'site', geometry: { type: 'Polygon', coordinates: [ring] } }).expect(201)).body;
    const [lon, lat] = r.geometry.coordinates[0][0];
    const [x, y] = proj4('WGS84', UTM32, [lon, lat]);
    expect(x).toBeCloseTo(512000 - half, 3);
    expect(y).toBeCloseTo(5290000 - half, 3);
  });

  it('takes a Feature, a FeatureCollection of one polygon and a MultiPolygon', async () => {
    await analyst.post(url(), { name: 'Feature', geometry: { type: 'Feature', properties: {}, geometry: square(50, 50, 40) } }).expect(201);
    await analyst.post(url(), { name: 'Collection', geometry: { type: 'FeatureCollection', features: [{ type: 'Feature', properties: {}, geometry: square(-50, 50, 40) }] } }).expect(201);
    const multi = { type: 'MultiPolygon', coordinates: [square(-200, -200, 30).coordinates, square(200, 200, 30).coordinates] };
    const r = (await analyst.post(url(), { name: 'Two parts', geometry: multi }).expect(201)).body;
    expect(r.geometry.type).toBe('MultiPolygon');
    expect(r.areaM2).toBeGreaterThan(2 * 3590);
  });

  it('refuses what is not a polygon, or more than one', async () => {
    expect(await refusal({ name: 'Line', geometry: { type: 'LineString', coordinates: [ll(0, 0), ll(10, 10)] } })).toMatch(/Polygon or MultiPolygon/);
    expect(await refusal({ name: 'Nothing', geometry: 'not geojson' })).toMatch(/Polygon or MultiPolygon/);
    const two = { type: 'FeatureCollection', features: [square(0, 0, 10), square(50, 50, 10)].map((g) => ({ type: 'Feature', properties: {}, geometry: g })) };
    expect(await refusal({ name: 'Two', geometry: two })).toMatch(/exactly one/);
  });

  it('refuses non-numeric or non-finite coordinates and lon/lat out of range', async () => {
    expect(await refusal({ name: 'Text', geometry: { type: 'Polygon', coordinates: [[['9.16', 47.76], [9.17, 47.76], [9.17, 47.77], ['9.16', 47.76]]] } })).toMatch(/number/);
    expect(await refusal({ name: 'Far lat', geometry: { type: 'Polygon', coordinates: [[[9.16, 95], [9.17, 95], [9.17, 96], [9.16, 95]]] } })).toMatch(/latitude/i);
  });

  it('refuses an unclosed ring and a ring of fewer than four positions', async () => {
    const open = square(0, 0, 50);
    open.coordinates[0].pop();
    expect(await refusal({ name: 'Open', geometry: open })).toMatch(/closed/);
    expect(await refusal({ name: 'Short', geometry: { type: 'Polygon', coordinates: [[ll(0, 0), ll(10, 0), ll(0, 0)]] } })).toMatch(/at least 4 positions/);
  });

  it('refuses a self-intersecting (bow-tie) ring, saying where it crosses itself', async () => {
    const bowTie = { type: 'Polygon', coordinates: [[ll(-50, -50), ll(50, 50), ll(50, -50), ll(-50, 50), ll(-50, -50)]] };
    expect(await refusal({ name: 'Bow tie', geometry: bowTie })).toMatch(/crosses itself/);
  });

  it('refuses a polygon of no area', async () => {
    const flat = { type: 'Polygon', coordinates: [[ll(0, 0), ll(50, 0), ll(100, 0), ll(0, 0)]] };
    expect(await refusal({ name: 'Flat', geometry: flat })).toMatch(/area|crosses itself/);
  });

  it("refuses an outline far from the site's wells, with the distance", async () => {
    // 50 km east of the demo wells; the rule is 20 km from the box around them.
    const msg = await refusal({ name: 'Elsewhere', geometry: square(50_000, 0, 200) });
    expect(msg).toMatch(/km from the site’s wells/);
    expect(msg).toMatch(/4[89]\.\d km/);
  });

  it('refuses more than 10,000 vertices', async () => {
    const n = 10_050;
    const ring = Array.from({ length: n }, (_, i) => {
      const a = (2 * Math.PI * i) / n;
      return ll(100 * Math.cos(a), 100 * Math.sin(a));
    });
    ring.push(ring[0]);
    expect(await refusal({ name: 'Dense', geometry: { type: 'Polygon', coordinates: [ring] } })).toMatch(/10,000 vertices/);
  });

  it("on a site without wells, takes only outlines inside its system's area of use", async () => {
    const site = (await admin.post('/api/sites', { name: 'No wells yet', epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body;
    const near = { type: 'Polygon', coordinates: [[[9, 45], [9.01, 45], [9.01, 45.01], [9, 45]]] };
    await admin.post(url(site.id), { name: 'Inside zone 32', geometry: near }).expect(201);
    const far = { type: 'Polygon', coordinates: [[[30, 45], [30.01, 45], [30.01, 45.01], [30, 45]]] };
    const r = await admin.post(url(site.id), { name: 'Outside zone 32', geometry: far }).expect(400);
    expect(r.body.error.fields.geometry).toMatch(/area of use/);
  });

  it('are written by Leads and Analysts only; a Viewer reads but cannot write', async () => {
    const mine = (await lead.post(url(), { name: 'Lead’s', geometry: square(0, 0, 60) }).expect(201)).body;
    expect((await viewer.post(url(), { name: 'Viewer’s', geometry: square(0, 0, 60) })).status).toBe(403);
    expect((await viewer.patch(`${url()}/${mine.id}`, { name: 'Renamed by a viewer' })).status).toBe(403);
    expect((await viewer.delete(`${url()}/${mine.id}`)).status).toBe(403);
    expect((await viewer.get(`${url()}/${mine.id}`)).status).toBe(200);
  });

  it('checks a changed geometry like a new one', async () => {
    const o = (await analyst.post(url(), { name: 'To move', geometry: square(0, 0, 60) }).expect(201)).body;
    const r = await analyst.patch(`${url()}/${o.id}`, { geometry: square(60_000, 0, 60) }).expect(400);
    expect(r.body.error.fields.geometry).toMatch(/km from the site’s wells/);
    const moved = (await analyst.patch(`${url()}/${o.id}`, { geometry: square(100, 100, 30) }).expect(200)).body;
    expect(moved.areaM2).toBeLessThan(o.areaM2);
  });
});
