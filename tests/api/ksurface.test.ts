import { booleanPointInPolygon, point } from '@turf/turf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTIONS } from '../../shared/cautions';
import { Well } from '../../server/features/wells/well.entity';
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
