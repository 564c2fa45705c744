import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { kSurfaceQuerySchema } from '../../shared/schemas/ksurface';
import { DEMO_OUTLINE_NAME } from '../../server/db/seed/demo-surface';
import { createKSurfaceService } from '../../server/features/ksurface/ksurface.service';
import { discardingOutbox } from '../../server/features/mail/outbox';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

/*
 * The K surface is kept once computed (a viewer link's frozen surface is asked for by every
 * visitor), so each thing it is made of must make a new one when it changes: the site's wells and
 * Well K (the map_versions counter its triggers bump) and the outline's geometry.
 */
let ts: TestServer;
let lead: ApiClient;
let outline: { id: string; geometry: { type: 'Polygon'; coordinates: number[][][] } };
let token = '';

type Surface = { cols: number; rows: number; minX: number; minY: number; log10K: string; geometricMeanK: number; wellsUsed: number };
const base = () => `/api/sites/${ts.demoSiteId}`;
const viewSurface = async () => (await ts.client().get(`/api/view/${token}/k-surface`).expect(200)).body as Surface;
const siteSurface = async () => (await lead.get(`${base()}/k-surface`).query({ outlineId: outline.id }).expect(200)).body as Surface;

/** The outline scaled about its first vertex (0.8: a smaller plume). */
function scaled(g: typeof outline.geometry, f: number): typeof outline.geometry {
  const [x0, y0] = g.coordinates[0][0];
  return { type: 'Polygon', coordinates: g.coordinates.map((ring) => ring.map(([x, y]) => [x0 + (x - x0) * f, y0 + (y - y0) * f])) };
}

beforeAll(async () => {
  ts = await startTestServer();
  lead = await ts.as(demoEmail('Lead'));
  const outlines = (await lead.get(`${base()}/outlines`).expect(200)).body.outlines;
  outline = outlines.find((o: { name: string }) => o.name === DEMO_OUTLINE_NAME);
  const r = await lead.post(`${base()}/viewer-links`, { label: 'Cache test', layers: { wells: true, surface: true, surfaceSettings: { outlineId: outline.id } } }).expect(201);
  token = r.body.url.split('/view/')[1];
});
afterAll(async () => ts.close());

describe('the K surface cache', () => {
  it('answers the same settings on an unchanged site from its cache, and other settings apart', async () => {
    const svc = createKSurfaceService({ ds: ts.ds, config: ts.config, outbox: discardingOutbox });
    const first = await svc.surface(ts.demoSiteId, kSurfaceQuerySchema.parse({ outlineId: outline.id }));
    // The same settings parsed afresh (as each viewer-link request does): the kept answer, not a new computation.
    expect(await svc.surface(ts.demoSiteId, kSurfaceQuerySchema.parse({ outlineId: outline.id, power: '2' }))).toBe(first);
    const power3 = await svc.surface(ts.demoSiteId, kSurfaceQuerySchema.parse({ outlineId: outline.id, power: 3 }));
    expect(power3).not.toBe(first);
    expect(power3.settings.power).toBe(3);
    expect(power3.log10K).not.toBe(first.log10K);
    const noOutline = await svc.surface(ts.demoSiteId, kSurfaceQuerySchema.parse({}));
    expect(noOutline.settings.outlineId).toBeNull();
  });

  it('follows the outline: a viewer link’s frozen surface changes with it, also twice within a second, and comes back with it', async () => {
    const before = await viewSurface();
    expect(await viewSurface()).toEqual(before);
    const original = outline.geometry;
    await lead.patch(`${base()}/outlines/${outline.id}`, { crs: 'wgs84', geometry: scaled(original, 0.8) }).expect(200);
    const smaller = await viewSurface();
    expect(smaller.log10K).not.toBe(before.log10K);
    // The grid spans the outline's box: a smaller outline, a smaller cell for ~200 cells across.
    expect(smaller.minX).toBeGreaterThan(before.minX);
    // A second change at once (the outline's updatedAt has whole seconds: the cache must not key on it).
    await lead.patch(`${base()}/outlines/${outline.id}`, { crs: 'wgs84', geometry: scaled(original, 0.6) }).expect(200);
    const smallest = await viewSurface();
    expect(smallest.minX).toBeGreaterThan(smaller.minX);
    expect((await siteSurface()).log10K).toBe(smallest.log10K);
    await lead.patch(`${base()}/outlines/${outline.id}`, { crs: 'wgs84', geometry: original }).expect(200);
    expect(await viewSurface()).toEqual(before);
  });

  it('follows Well K: a checked fit’s K changed by any write path changes the surface', async () => {
    const before = await viewSurface();
    const [fit] = (await ts.ds.query(`SELECT "id", "kMetersPerSecond" FROM "fits" WHERE "siteId" = ? AND "status" = 'checked' AND "supersededAt" IS NULL LIMIT 1`, [ts.demoSiteId])) as { id: string; kMetersPerSecond: number }[];
    await ts.ds.query(`UPDATE "fits" SET "kMetersPerSecond" = ? WHERE "id" = ?`, [fit.kMetersPerSecond * 100, fit.id]);
    try {
      const after = await viewSurface();
      expect(after.log10K).not.toBe(before.log10K);
      expect(after.geometricMeanK).toBeGreaterThan(before.geometricMeanK);
      expect((await siteSurface()).log10K).toBe(after.log10K);
    } finally {
      await ts.ds.query(`UPDATE "fits" SET "kMetersPerSecond" = ? WHERE "id" = ?`, [fit.kMetersPerSecond, fit.id]);
    }
    expect((await viewSurface()).log10K).toBe(before.log10K);
  });

  it('follows the wells: a well moved changes the surface', async () => {
    const before = await viewSurface();
    const [well] = (await ts.ds.query(
      `SELECT w."id", w."siteX" FROM "wells" w WHERE w."siteId" = ? AND EXISTS (SELECT 1 FROM "fits" f WHERE f."wellId" = w."id" AND f."status" = 'checked') LIMIT 1`,
      [ts.demoSiteId],
    )) as { id: string; siteX: number }[];
    await ts.ds.query(`UPDATE "wells" SET "siteX" = ? WHERE "id" = ?`, [well.siteX + 150, well.id]);
    try {
      expect((await viewSurface()).log10K).not.toBe(before.log10K);
    } finally {
      await ts.ds.query(`UPDATE "wells" SET "siteX" = ? WHERE "id" = ?`, [well.siteX, well.id]);
    }
    expect((await viewSurface()).log10K).toBe(before.log10K);
  });
});
