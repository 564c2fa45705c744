import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('the K map wells layer', () => {
  it('lists every well as GeoJSON with Well K from Checked fits only', async () => {
    const analyst = await ts.as(demoEmail('Analyst'));
    const checker = await ts.as(demoEmail('Checker'));
    const well = await ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: ts.demoSiteId }, order: { name: 'ASC' } });
    const before = (await analyst.get(`/api/sites/${ts.demoSiteId}/map/wells`).expect(200)).body;
    expect(before.type).toBe('FeatureCollection');
    expect(before.features.length).toBe(await ts.ds.getRepository(Well).countBy({ siteId: ts.demoSiteId }));
    const f0 = before.features.find((f: { id: string }) => f.id === well.id);
    expect(f0.geometry.coordinates[0]).toBeCloseTo(well.lon, 7);
    expect(f0.geometry.coordinates[1]).toBeCloseTo(well.lat, 7);
    expect(f0.properties.screenBottomElevationM).toBe(well.screenBottomElevationM);

    const { recordId } = await insertSyntheticRecord(ts.ds, well.id, { kMetersPerSecond: 3e-4 });
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
    await analyst.post(`/api/fits/${fit.id}/submit`).expect(200);
    const mid = (await analyst.get(`/api/sites/${ts.demoSiteId}/map/wells`)).body.features.find((f: { id: string }) => f.id === well.id);
    expect(mid.properties.count).toBe(f0.properties.count);
    await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' }).expect(200);

    const after = (await analyst.get(`/api/sites/${ts.demoSiteId}/map/wells`)).body.features.find((f: { id: string }) => f.id === well.id);
    const wk = (await analyst.get(`/api/wells/${well.id}/k`)).body;
    expect(after.properties.count).toBe(f0.properties.count + 1);
    // The same geometric mean as the Well K route (Freeze 1975), to 1e-12 relative.
    expect(after.properties.wellK / wk.kMetersPerSecond).toBeCloseTo(1, 12);
    expect(after.properties.log10K).toBeCloseTo(Math.log10(wk.kMetersPerSecond), 12);
  });

  it('answers 304 to an unchanged layer and a fresh body after a well changes', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    const url = `/api/sites/${ts.demoSiteId}/map/wells`;
    const first = await lead.get(url).expect(200);
    const etag = first.headers.etag;
    expect(etag).toBeTruthy();
    await lead.get(url).set('If-None-Match', etag).expect(304);
    const well = await ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: ts.demoSiteId }, order: { name: 'DESC' } });
    // A write that bypasses the services still invalidates the layer (the triggers see every write).
    await ts.ds.query('UPDATE wells SET name = ? WHERE id = ?', ['Renamed by SQL', well.id]);
    const fresh = await lead.get(url).set('If-None-Match', etag).expect(200);
    expect(fresh.headers.etag).not.toBe(etag);
    expect(fresh.body.features.map((f: { properties: { name: string } }) => f.properties.name)).toContain('Renamed by SQL');
  });

  it('hides the layer from non-members', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    await admin.post('/api/admin/users', { email: 'map.outsider@demo.kfield.example', name: 'Map Outsider', password: 'outsider-password-1' }).expect(201);
    const outsider = await ts.as('map.outsider@demo.kfield.example', 'outsider-password-1');
    expect((await outsider.get(`/api/sites/${ts.demoSiteId}/map/wells`)).status).toBe(404);
  });
});
