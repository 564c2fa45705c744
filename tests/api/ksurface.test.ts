import { booleanPointInPolygon, distance, point } from '@turf/turf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTIONS } from '../../shared/cautions';
import { crossValidationSchema, kAtSchema, kSurfaceSchema } from '../../shared/schemas/ksurface';
import { Membership } from '../../server/features/sites/membership.entity';
import { User } from '../../server/features/users/user.entity';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { DEMO_OUTLINE_NAME } from '../../server/db/seed/demo-surface';
import { demoChannelWeight } from '../../server/db/seed/demo-wells';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let viewer: ApiClient;
let outline: { id: string; geometry: { type: 'Polygon'; coordinates: number[][][] } };

beforeAll(async () => {
  ts = await startTestServer();
  viewer = await ts.as(demoEmail('Viewer'));
  const outlines = (await viewer.get(`/api/sites/${ts.demoSiteId}/outlines`).expect(200)).body.outlines;
  outline = outlines.find((o: { name: string }) => o.name === DEMO_OUTLINE_NAME);
});
afterAll(async () => ts.close());

const base = () => `/api/sites/${ts.demoSiteId}`;
const decode = (b64: string) => {
  const buf = Buffer.from(b64, 'base64');
  const out = new Float32Array(buf.length / 4);
  for (let i = 0; i < out.length; i++) out[i] = buf.readFloatLE(i * 4);
  return out;
};
/** Well K per well id (log10), from the K map's layer (which tests/api/map.test.ts holds to wellKFor). */
async function wellLog10K(): Promise<Map<string, { log10K: number; name: string; hydroUnit: string; top: number; bottom: number }>> {
  const fc = (await viewer.get(`${base()}/map/wells`).expect(200)).body;
  const out = new Map();
  for (const f of fc.features) {
    if (f.properties.log10K !== null) out.set(f.id, { log10K: f.properties.log10K, name: f.properties.name, hydroUnit: f.properties.hydroUnit, top: f.properties.screenTopElevationM, bottom: f.properties.screenBottomElevationM });
  }
  return out;
}

describe('the K surface', () => {
  it('is the IDW of log10 Well K on the demo site, empty outside the plume outline, in under a second', async () => {
    expect(outline).toBeDefined();
    const t = performance.now();
    const r = await viewer.get(`${base()}/k-surface`).query({ outlineId: outline.id }).expect(200);
    const ms = performance.now() - t;
    const s = r.body;
    expect(ms, `surface took ${ms.toFixed(0)} ms`).toBeLessThan(1000);
    const wells = await wellLog10K();
    expect(s.wellsUsed).toBe(wells.size);
    expect(s.gridCrs.label).toMatch(/EPSG:32632/);
    expect(s.cautions).toEqual(CAUTIONS);
    // The answer is what the client parses it with.
    expect(kSurfaceSchema.safeParse(s).success).toBe(true);
    expect(s.settings).toEqual({ power: 2, neighbours: null, searchRadiusM: null, outlineId: outline.id });
    const cells = decode(s.log10K);
    expect(cells.length).toBe(s.cols * s.rows);
    // About 200 cells across the outline's longer side.
    expect(Math.max(s.cols, s.rows)).toBeGreaterThanOrEqual(199);
    expect(s.corners[0][0]).toBeCloseTo(9.155, 2);
    expect(s.corners[0][1]).toBeCloseTo(47.766, 2);

    // Cells are NaN outside the outline and set inside it: compare cell centres with the outline in lon/lat.
    const poly = { type: 'Polygon' as const, coordinates: outline.geometry.coordinates };
    const proj4 = (await import('proj4')).default;
    let inside = 0;
    let sum = 0;
    let checked = 0;
    for (let r0 = 0; r0 < s.rows; r0 += 7) {
      for (let c = 0; c < s.cols; c += 7) {
        const x = s.minX + (c + 0.5) * s.cellSizeM;
        const y = s.minY + (s.rows - r0 - 0.5) * s.cellSizeM;
        const ll = proj4(s.gridCrs.proj4, 'WGS84', [x, y]);
        const v = cells[r0 * s.cols + c];
        const isIn = booleanPointInPolygon(point(ll), poly);
        // Cells on the edge itself may go either way; skip those within half a cell.
        if (isIn) expect(Number.isFinite(v), `cell ${c},${r0}`).toBe(true);
        else if (!booleanPointInPolygon(point(proj4(s.gridCrs.proj4, 'WGS84', [x + s.cellSizeM, y])), poly)) expect(Number.isNaN(v), `cell ${c},${r0}`).toBe(true);
        checked++;
      }
    }
    for (const v of cells) if (Number.isFinite(v)) { inside++; sum += v; }
    expect(checked).toBeGreaterThan(500);
    expect(inside).toBeGreaterThan(0);
    expect(inside).toBeLessThan(cells.length);
    expect(Math.log10(s.geometricMeanK)).toBeCloseTo(sum / inside, 5);
  });

  it('shows the buried channel: cells along it are higher K than the sand and gravel beside it', async () => {
    const s = (await viewer.get(`${base()}/k-surface`).query({ outlineId: outline.id }).expect(200)).body;
    const cells = decode(s.log10K);
    let [inSum, inN, outSum, outN] = [0, 0, 0, 0];
    for (let r0 = 0; r0 < s.rows; r0++) {
      for (let c = 0; c < s.cols; c++) {
        const v = cells[r0 * s.cols + c];
        if (!Number.isFinite(v)) continue;
        // The invented channel's own profile (demo-wells.ts): 1 along its middle, 0 well away from it.
        const w = demoChannelWeight(s.minX + (c + 0.5) * s.cellSizeM, s.minY + (s.rows - r0 - 0.5) * s.cellSizeM);
        if (w > 0.9) [inSum, inN] = [inSum + v, inN + 1];
        else if (w < 0.01) [outSum, outN] = [outSum + v, outN + 1];
      }
    }
    expect(inN).toBeGreaterThan(1000);
    expect(inSum / inN).toBeGreaterThan(outSum / outN + 0.3);
  });

  it('equals a well’s log10 Well K exactly at the well (K at a point)', async () => {
    const wells = await wellLog10K();
    const mw17 = await ts.ds.getRepository(Well).findOneByOrFail({ siteId: ts.demoSiteId, name: 'MW-17' });
    const k = (await viewer.get(`${base()}/k-at`).query({ x: mw17.siteX, y: mw17.siteY }).expect(200)).body;
    // The map's log10K is rounded by SQLite's json; the stored fits give the exact value.
    expect(k.log10K).toBeCloseTo(wells.get(mw17.id)!.log10K, 10);
    const exact = (await viewer.get(`/api/wells/${mw17.id}/k`).expect(200)).body;
    expect(k.log10K).toBe(exact.log10Mean);
    expect(k.kMetersPerSecond).toBeCloseTo(exact.kMetersPerSecond, 15);
    expect(kAtSchema.safeParse(k).success).toBe(true);
    expect(k.nearest).toHaveLength(5);
    expect(k.nearest[0]).toMatchObject({ name: 'MW-17', distanceM: 0, saturatedThicknessM: mw17.saturatedThicknessM });
    for (let i = 1; i < 5; i++) expect(k.nearest[i].distanceM).toBeGreaterThanOrEqual(k.nearest[i - 1].distanceM);
    const bs = k.nearest.map((n: { saturatedThicknessM: number }) => n.saturatedThicknessM);
    expect(k.suggestedThicknessM).toBeCloseTo(bs.reduce((a: number, b: number) => a + b, 0) / bs.length, 10);
    expect(k.lon).toBeCloseTo(mw17.lon, 6);
    expect(k.lat).toBeCloseTo(mw17.lat, 6);
  });

  it('agrees cell by cell with the point estimate at the cell centres', async () => {
    const s = (await viewer.get(`${base()}/k-surface`).query({ outlineId: outline.id, power: 2.5, neighbours: 6 }).expect(200)).body;
    const cells = decode(s.log10K);
    const i = cells.findIndex((v) => Number.isFinite(v));
    const c = i % s.cols;
    const r0 = Math.floor(i / s.cols);
    const x = s.minX + (c + 0.5) * s.cellSizeM;
    const y = s.minY + (s.rows - r0 - 0.5) * s.cellSizeM;
    const k = (await viewer.get(`${base()}/k-at`).query({ x, y, power: 2.5, neighbours: 6 }).expect(200)).body;
    expect(cells[i]).toBeCloseTo(k.log10K, 5);
  });

  it('covers the wells’ extent plus 10 % without an outline, every cell set', async () => {
    const s = (await viewer.get(`${base()}/k-surface`).expect(200)).body;
    const cells = decode(s.log10K);
    expect(cells.every((v) => Number.isFinite(v))).toBe(true);
    const wells = await ts.ds.getRepository(Well).find({ where: { siteId: ts.demoSiteId } });
    const maxX = s.minX + s.cols * s.cellSizeM;
    expect(s.minX).toBeLessThan(Math.min(...wells.map((w) => w.siteX)) - 50);
    expect(maxX).toBeGreaterThan(Math.max(...wells.map((w) => w.siteX)) + 50);
  });

  it('warns with fewer than 5 wells and refuses fewer than 2', async () => {
    const wells = [...(await wellLog10K()).values()];
    const silt = wells.filter((w) => w.hydroUnit === 'Silt').sort((a, b) => a.bottom - b.bottom);
    expect(silt.length).toBeGreaterThanOrEqual(2);
    expect(silt.length).toBeLessThan(5);
    const few = (await viewer.get(`${base()}/k-surface`).query({ units: 'Silt' }).expect(200)).body;
    expect(few.wellsUsed).toBe(silt.length);
    expect(few.warnings.join(' ')).toMatch(/fewer than 5/);
    expect(few.warnings.join(' ')).not.toMatch(/hydrostratigraphic units/);
    const mixed = (await viewer.get(`${base()}/k-surface`).expect(200)).body;
    expect(mixed.warnings.join(' ')).toMatch(/Wells of 3 hydrostratigraphic units feed this surface \(Buried channel gravel, Sand and gravel, Silt\)/);

    // Only the deepest-screened silt well: its screen bottom is the lowest.
    const one = await viewer.get(`${base()}/k-surface`).query({ units: 'Silt', screenElevationMaxM: silt[0].bottom + 0.001 });
    expect(silt[1].bottom).toBeGreaterThan(silt[0].bottom + 0.001);
    expect(one.status).toBe(400);
    expect(one.body.error.message).toMatch(/needs at least 2 wells with a checked K/);
    const none = await viewer.get(`${base()}/k-surface`).query({ screenElevationMinM: 10_000 }).expect(400);
    expect(none.body.error.message).toMatch(/needs at least 2 wells with a checked K/);
  });

  it('refuses a grid of more than 1,000,000 cells, asking for a larger cell size', async () => {
    const r = await viewer.get(`${base()}/k-surface`).query({ outlineId: outline.id, cellSizeM: 0.5 }).expect(400);
    expect(r.body.error.fields.cellSizeM).toMatch(/more than 1,000,000.*larger cell size/);
    // Just under the limit is computed.
    await viewer.get(`${base()}/k-surface`).query({ outlineId: outline.id, cellSizeM: 1 }).expect(200);
  });

  it('refuses bad settings, naming them', async () => {
    expect((await viewer.get(`${base()}/k-surface`).query({ power: 9 }).expect(400)).body.error.fields.power).toMatch(/at most 6/);
    expect((await viewer.get(`${base()}/k-surface`).query({ outlineId: 'x' }).expect(400)).body.error.fields.outlineId).toMatch(/UUID/);
    expect((await viewer.get(`${base()}/k-at`).query({ x: 'east' }).expect(400)).body.error.fields).toHaveProperty('x');
  });
});

describe('cross-validation', () => {
  it('predicts each well from the others, per power, suggests one of the five, and names next-test spots inside the outline', async () => {
    const cv = (await viewer.get(`${base()}/k-surface/cross-validation`).query({ outlineId: outline.id }).expect(200)).body;
    const wells = await wellLog10K();
    expect(crossValidationSchema.safeParse(cv).success).toBe(true);
    expect(cv.n).toBe(wells.size);
    expect(cv.power).toBe(2);
    expect(cv.byPower.map((p: { power: number }) => p.power)).toEqual([1, 1.5, 2, 2.5, 3]);
    expect([1, 1.5, 2, 2.5, 3]).toContain(cv.suggestedPower);
    const best = Math.min(...cv.byPower.map((p: { rmseLog10: number }) => p.rmseLog10));
    expect(cv.byPower.find((p: { power: number }) => p.power === cv.suggestedPower).rmseLog10).toBe(best);
    expect(cv.wells).toHaveLength(wells.size);
    for (const w of cv.wells) {
      expect(w.name).toBe(wells.get(w.wellId)!.name);
      expect(w.observedLog10K).toBeCloseTo(wells.get(w.wellId)!.log10K, 10);
      expect(w.errorLog10).toBeCloseTo(w.predictedLog10K - w.observedLog10K, 10);
    }
    const rmse = Math.sqrt(cv.wells.reduce((a: number, w: { errorLog10: number }) => a + w.errorLog10 ** 2, 0) / cv.wells.length);
    expect(cv.rmseLog10).toBeCloseTo(rmse, 10);
    expect(cv.nextTestSpots).toHaveLength(5);
    const poly = { type: 'Polygon' as const, coordinates: outline.geometry.coordinates };
    for (const s of cv.nextTestSpots) {
      expect(booleanPointInPolygon(point([s.lon, s.lat]), poly)).toBe(true);
      expect(s.nearestWellM).toBeGreaterThan(0);
    }
    expect(cv.cautions).toEqual(CAUTIONS);
  });
});

describe('sites in feet and in degrees', () => {
  let reader: ApiClient;
  beforeAll(async () => {
    reader = await ts.as(demoEmail('Admin'));
  });

  /** A new site with three wells (entered as lat/lon, about 100 m apart), each with one Checked fit. */
  async function siteWithCheckedWells(epsgCode: number): Promise<{ siteId: string; wells: Well[] }> {
    const admin = await ts.as(demoEmail('Admin'));
    const site = (await admin.post('/api/sites', { name: `Surface on EPSG:${epsgCode}`, epsgCode, displayUnits: 'US' }).expect(201)).body;
    const analyst = await ts.as(demoEmail('Analyst'));
    const checker = await ts.as(demoEmail('Checker'));
    for (const [email, role] of [[demoEmail('Analyst'), 'Analyst'], [demoEmail('Checker'), 'Checker']] as const) {
      const u = await ts.ds.getRepository(User).findOneByOrFail({ email });
      await ts.ds.getRepository(Membership).insert({ siteId: site.id, userId: u.id, role });
    }
    const m = (value: number) => ({ value, unit: 'm' });
    const spots: [string, number, number, number][] = [['A', -76.5, 40.0, 1e-5], ['B', -76.4988, 40.0, 1e-4], ['C', -76.5, 40.0009, 1e-3]];
    for (const [name, lon, lat, k] of spots) {
      const well = (await analyst.post(`/api/sites/${site.id}/wells`, {
        name, coordinates: { kind: 'latlon', lat, lon }, groundElevation: m(100), measuringPointElevation: m(100.5), screenReference: 'depth',
        screenTop: m(3), screenBottom: m(6), casingRadius: m(0.0254), screenRadius: m(0.0254), boreholeRadius: m(0.1016), filterPackPorosity: 0.3,
        hydroUnit: null, aquiferCondition: 'unconfined', saturatedThickness: m(8), staticWaterDepth: m(2.5), status: 'active', notes: '',
      }).expect(201)).body;
      const { recordId } = await insertSyntheticRecord(ts.ds, well.id, { kMetersPerSecond: k });
      const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
      await analyst.post(`/api/fits/${fit.id}/submit`).expect(200);
      await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' }).expect(200);
    }
    return { siteId: site.id, wells: await ts.ds.getRepository(Well).find({ where: { siteId: site.id }, order: { name: 'ASC' } }) };
  }

  it('lays a site in US survey feet out in metres (the same projection), distances in metres', async () => {
    const { siteId, wells } = await siteWithCheckedWells(2272);
    const s = (await reader.get(`/api/sites/${siteId}/k-surface`).expect(200)).body;
    expect(s.gridCrs.proj4).toMatch(/\+units=m\b/);
    expect(s.gridCrs.proj4).not.toMatch(/us-ft/);
    expect(s.warnings.join(' ')).toMatch(/fewer than 5/);
    const [a, b] = wells;
    const k = (await reader.get(`/api/sites/${siteId}/k-at`).query({ x: a.siteX, y: a.siteY }).expect(200)).body;
    const exact = (await reader.get(`/api/wells/${a.id}/k`).expect(200)).body;
    expect(k.log10K).toBe(exact.log10Mean);
    // 1 US survey foot = 1200/3937 m (NIST SP 811).
    const ab = k.nearest.find((n: { name: string }) => n.name === 'B').distanceM;
    expect(ab).toBeCloseTo(Math.hypot(b.siteX - a.siteX, b.siteY - a.siteY) * (1200 / 3937), 3);
    expect(ab / (1000 * distance(point([a.lon, a.lat]), point([b.lon, b.lat])))).toBeCloseTo(1, 2);
    // The grid's corners come back to WGS84 around the wells.
    expect(s.corners[0][0]).toBeCloseTo(-76.5, 2);
    expect(s.corners[0][1]).toBeCloseTo(40.0, 2);
  });

  it('lays a site in degrees out in a local projection, distances in metres', async () => {
    const { siteId, wells } = await siteWithCheckedWells(4326);
    const s = (await reader.get(`/api/sites/${siteId}/k-surface`).expect(200)).body;
    expect(s.gridCrs.label).toMatch(/Local projection/);
    const [a, b] = wells;
    const k = (await reader.get(`/api/sites/${siteId}/k-at`).query({ x: a.lon, y: a.lat }).expect(200)).body;
    expect(k.log10K).toBeCloseTo((await reader.get(`/api/wells/${a.id}/k`).expect(200)).body.log10Mean, 9);
    const ab = k.nearest.find((n: { name: string }) => n.name === 'B').distanceM;
    expect(ab / (1000 * distance(point([a.lon, a.lat]), point([b.lon, b.lat])))).toBeCloseTo(1, 2);
  });
});
