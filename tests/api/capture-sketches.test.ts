import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTIONS } from '../../shared/cautions';
import { captureSketchListSchema, captureSketchSchema } from '../../shared/schemas/ksurface';
import { DEMO_SKETCH_NAME } from '../../server/db/seed/demo-surface';
import { Membership } from '../../server/features/sites/membership.entity';
import { User } from '../../server/features/users/user.entity';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient;
let viewer: ApiClient;
let admin: ApiClient;

beforeAll(async () => {
  ts = await startTestServer();
  [analyst, viewer, admin] = await Promise.all((['Analyst', 'Viewer', 'Admin'] as const).map((r) => ts.as(demoEmail(r))));
});
afterAll(async () => ts.close());

const UTM32 = '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs';
const url = (siteId = ts.demoSiteId) => `/api/sites/${siteId}/capture-sketches`;
/** domain.md §7 item 12 (Javandel & Tsang 1986, derived): Q = 1e-3 m³/s, b = 10 m, K = 1e-4 m/s, i = 0.005. */
const JT = (over: Record<string, unknown> = {}) => ({
  name: 'J&T check', x: 512425, y: 5289980, rate: { value: 1, unit: 'L/s' }, thicknessM: 10, kMetersPerSecond: 1e-4,
  gradient: { mode: 'typed', magnitude: 0.005, flowDirectionDeg: 90 }, ...over,
});

describe('capture sketches', () => {
  it('give the Javandel & Tsang check values: 200.0 m far upgradient, 100.0 m at the well, stagnation 31.83 m', async () => {
    const s = (await analyst.post(url(), JT()).expect(201)).body;
    // domain.md §7 item 12.
    expect(s.results.captureWidthFarM).toBeCloseTo(200.0, 1);
    expect(s.results.captureWidthAtWellM).toBeCloseTo(100.0, 1);
    expect(s.results.stagnationPointM).toBeCloseTo(31.83, 2);
    expect(s.results.rateM3PerS).toBeCloseTo(1e-3, 15);
    expect(s.results.transmissivityM2PerS).toBeCloseTo(1e-3, 15);
    expect(s.results.darcyVelocityMPerS).toBeCloseTo(5e-7, 15);
    expect(s.cautions).toEqual(CAUTIONS);
    expect(captureSketchSchema.safeParse(s).success).toBe(true);
    // Flow toward grid east: the stagnation point lies 31.83 m east of the well.
    const [sx, sy] = proj4('WGS84', UTM32, [s.results.stagnationPoint.lon, s.results.stagnationPoint.lat]);
    expect(sx - 512425).toBeCloseTo(31.83, 2);
    expect(sy - 5289980).toBeCloseTo(0, 3);
    // The envelope is a closed WGS84 ring, upgradient (west) of the stagnation point, approaching 200 m wide far
    // upgradient (cut at twice that distance, where the dividing streamline is 185.5 m apart: derived).
    const ring: number[][] = s.results.envelope.coordinates[0];
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    const xy = ring.map((p) => proj4('WGS84', UTM32, p));
    expect(Math.max(...xy.map((p) => p[0])) - 512425).toBeCloseTo(31.83, 1);
    expect(Math.min(...xy.map((p) => p[0]))).toBeLessThan(512425 - 300);
    const ys = xy.map((p) => p[1]);
    expect(Math.max(...ys) - Math.min(...ys)).toBeGreaterThan(180);
    expect(Math.max(...ys) - Math.min(...ys)).toBeLessThan(200);
    // Cooper-Jacob at the defaults (10 m, one day), with its note.
    expect(s.results.cooperJacob.valid).toBe(true);
    expect(s.results.cooperJacob.note).toMatch(/u = .* < 0\.01/);
    expect(s.inputs).toMatchObject({ thicknessM: 10, storativity: 1e-4, drawdownRadiusM: 10, drawdownTimeS: 86_400 });
  });

  it('gives the Cooper-Jacob check value (domain.md §7 item 13: s = 5.3293 m)', async () => {
    // Q = 0.01 m³/s, T = 1e-3 m²/s (K 1e-4 × b 10), S = 1e-4, r = 10 m, t = 3600 s.
    const s = (await analyst.post(url(), JT({ rate: { value: 10, unit: 'L/s' }, storativity: 1e-4, drawdownRadiusM: 10, drawdownTimeS: 3600 })).expect(201)).body;
    expect(s.results.cooperJacob.drawdownM).toBeCloseTo(5.3293, 4);
  });

  it('converts m³/d and US gpm to m³/s (NIST SP 811: 1 gal = 3.785411784 L)', async () => {
    const perDay = (await analyst.post(url(), JT({ rate: { value: 86.4, unit: 'm3/d' } })).expect(201)).body;
    expect(perDay.results.rateM3PerS).toBeCloseTo(1e-3, 15);
    const gpm = (await analyst.post(url(), JT({ rate: { value: 100, unit: 'gpm' } })).expect(201)).body;
    expect(gpm.results.rateM3PerS).toBeCloseTo((100 * 3.785411784e-3) / 60, 12);
  });

  it('takes K from the K surface at the spot when none is typed', async () => {
    const at = (await viewer.get(`/api/sites/${ts.demoSiteId}/k-at`).query({ x: 512100, y: 5290000, power: 3 }).expect(200)).body;
    const s = (await analyst.post(url(), JT({ x: 512100, y: 5290000, kMetersPerSecond: undefined, surface: { power: 3 } })).expect(201)).body;
    expect(s.results.kMetersPerSecond).toBeCloseTo(at.kMetersPerSecond, 15);
    expect(s.results.transmissivityM2PerS).toBeCloseTo(at.kMetersPerSecond * 10, 15);
  });

  it('takes the gradient from three wells on a known plane of static water levels', async () => {
    const site = (await admin.post('/api/sites', { name: 'Plane heads', epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body;
    const analystId = (await ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Analyst') })).id;
    await ts.ds.getRepository(Membership).insert({ siteId: site.id, userId: analystId, role: 'Analyst' });
    // h = 105 − 0.003·(x − 512000) − 0.004·(y − 5290000): |∇h| = 0.005, flow toward bearing atan2(0.003, 0.004) = 36.87°.
    const head = (dx: number, dy: number) => 105 - 0.003 * dx - 0.004 * dy;
    const m = (value: number) => ({ value, unit: 'm' });
    const ids: string[] = [];
    for (const [name, dx, dy] of [['P-1', 0, 0], ['P-2', 100, 0], ['P-3', 0, 100], ['P-4', 100, 100]] as const) {
      const body = {
        name, coordinates: { kind: 'epsg', epsg: 32632, x: 512000 + dx, y: 5290000 + dy }, groundElevation: m(109.5), measuringPointElevation: m(110),
        screenReference: 'depth', screenTop: m(6), screenBottom: m(9), casingRadius: m(0.0254), screenRadius: m(0.0254), boreholeRadius: m(0.1016),
        filterPackPorosity: 0.3, hydroUnit: null, aquiferCondition: 'unconfined', saturatedThickness: m(10),
        staticWaterDepth: name === 'P-4' ? null : m(110 - head(dx, dy)), status: 'active', notes: '',
      };
      ids.push((await analyst.post(`/api/sites/${site.id}/wells`, body).expect(201)).body.id);
    }
    const s = (await analyst.post(url(site.id), JT({ x: 512050, y: 5290050, gradient: { mode: 'wells', wellIds: ids.slice(0, 3) } })).expect(201)).body;
    expect(s.results.gradient).toBeCloseTo(0.005, 10);
    expect(s.results.flowDirectionDeg).toBeCloseTo((Math.atan2(0.003, 0.004) * 180) / Math.PI, 6);

    // A well without a static level is refused by name.
    const dry = await analyst.post(url(site.id), JT({ x: 512050, y: 5290050, gradient: { mode: 'wells', wellIds: [ids[0], ids[1], ids[3]] } })).expect(400);
    expect(dry.body.error.fields['gradient.wellIds']).toMatch(/P-4 has no static water level/);

    // Three wells on one line leave the plane undetermined.
    const line = (await analyst.post(`/api/sites/${site.id}/wells`, {
      name: 'P-5', coordinates: { kind: 'epsg', epsg: 32632, x: 512200, y: 5290000 }, groundElevation: m(109.5), measuringPointElevation: m(110),
      screenReference: 'depth', screenTop: m(6), screenBottom: m(9), casingRadius: m(0.0254), screenRadius: m(0.0254), boreholeRadius: m(0.1016),
      filterPackPorosity: 0.3, hydroUnit: null, aquiferCondition: 'unconfined', saturatedThickness: m(10), staticWaterDepth: m(110 - head(200, 0)), status: 'active', notes: '',
    }).expect(201)).body.id;
    const collinear = await analyst.post(url(site.id), JT({ x: 512050, y: 5290050, gradient: { mode: 'wells', wellIds: [ids[0], ids[1], line] } })).expect(400);
    expect(collinear.body.error.fields['gradient.wellIds']).toMatch(/lie on one line/);
  });

  it('refuses zero or negative rate, thickness, gradient and bad fields, naming each (400, never 5xx)', async () => {
    const field = async (over: Record<string, unknown>) => {
      const r = await analyst.post(url(), JT(over));
      expect(r.status, JSON.stringify(r.body)).toBe(400);
      return r.body.error.fields as Record<string, string>;
    };
    expect((await field({ rate: { value: 0, unit: 'L/s' } }))['rate.value']).toMatch(/greater than 0/);
    expect((await field({ rate: { value: 1, unit: 'cfs' } }))['rate.unit']).toMatch(/L\/s, m³\/d or US gpm/);
    expect((await field({ thicknessM: -2 })).thicknessM).toMatch(/greater than 0/);
    expect((await field({ gradient: { mode: 'typed', magnitude: 0, flowDirectionDeg: 90 } }))['gradient.magnitude']).toMatch(/greater than 0/);
    expect((await field({ gradient: { mode: 'typed', magnitude: -0.01, flowDirectionDeg: 90 } }))['gradient.magnitude']).toMatch(/greater than 0/);
    expect((await field({ gradient: { mode: 'wells', wellIds: [] } }))['gradient.wellIds']).toMatch(/at least three/);
    expect((await field({ kMetersPerSecond: 0 })).kMetersPerSecond).toMatch(/greater than 0/);
    expect((await field({ x: 'east' })).x).toMatch(/number/);
    expect((await field({ x: 612425 })).x).toMatch(/km from the nearest well/);
  });

  it('are listed, read, exported as GeoJSON and deleted; a Viewer reads but cannot write', async () => {
    const listed = (await viewer.get(url()).expect(200)).body;
    expect(captureSketchListSchema.safeParse(listed).success).toBe(true);
    const list = listed.sketches;
    const demo = list.find((s: { name: string }) => s.name === DEMO_SKETCH_NAME);
    expect(demo).toBeDefined();
    expect(demo.inputs.gradient.mode).toBe('wells');
    expect(demo.results.gradient).toBeGreaterThan(0);
    expect((await viewer.get(`${url()}/${demo.id}`).expect(200)).body.results).toEqual(demo.results);

    const file = await viewer.get(`${url(ts.demoSiteId)}.geojson`).expect(200);
    expect(file.headers['content-disposition']).toMatch(/attachment/);
    const fc = JSON.parse(file.text);
    expect(fc.type).toBe('FeatureCollection');
    const mine = fc.features.filter((f: { properties: { sketchId: string } }) => f.properties.sketchId === demo.id);
    expect(mine.map((f: { geometry: { type: string }; properties: { kind: string } }) => [f.properties.kind, f.geometry.type])).toEqual([
      ['trial extraction well', 'Point'], ['stagnation point', 'Point'], ['capture envelope', 'Polygon'],
    ]);
    expect(mine[2].properties).toMatchObject({ stagnationPointM: demo.results.stagnationPointM, captureWidthFarM: demo.results.captureWidthFarM, cautions: CAUTIONS.join(' ') });

    expect((await viewer.post(url(), JT())).status).toBe(403);
    const s = (await analyst.post(url(), JT({ name: 'To delete' })).expect(201)).body;
    expect((await viewer.delete(`${url()}/${s.id}`)).status).toBe(403);
    await analyst.delete(`${url()}/${s.id}`).expect(204);
    expect((await viewer.get(`${url()}/${s.id}`)).status).toBe(404);
  });
});
