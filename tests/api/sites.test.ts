import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Site } from '../../server/features/sites/site.entity';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const valid = { name: 'North yard', description: 'Test site', epsgCode: 27700, displayUnits: 'US', hydroUnits: ['Alluvium', 'Chalk'] };

describe('sites', () => {
  it('creates a site with its CRS name and makes the creator its Lead', async () => {
    const c = await ts.as(demoEmail('Admin'));
    const r = await c.post('/api/sites', valid).expect(201);
    expect(r.body).toMatchObject({ name: 'North yard', epsgCode: 27700, crsName: 'OSGB36 / British National Grid', myRole: 'Lead', memberCount: 1, displayUnits: 'US' });
    const list = await c.get('/api/sites').expect(200);
    expect(list.body.sites.map((s: { name: string }) => s.name)).toContain('North yard');
  });

  it('lists only the sites I belong to, and all sites for an Admin', async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const mine = (await viewer.get('/api/sites').expect(200)).body.sites;
    expect(mine).toHaveLength(1);
    expect(mine[0].myRole).toBe('Viewer');
    const admin = await ts.as(demoEmail('Admin'));
    const all = (await admin.get('/api/sites').expect(200)).body.sites;
    expect(all.length).toBe(await ts.ds.getRepository(Site).count());
  });

  it('refuses an unknown EPSG code with a field message and saves nothing', async () => {
    const c = await ts.as(demoEmail('Admin'));
    const before = await ts.ds.getRepository(Site).count();
    const r = await c.post('/api/sites', { ...valid, name: 'Nowhere', epsgCode: 99999 });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.epsgCode).toMatch(/Unknown EPSG code 99999/);
    expect(await ts.ds.getRepository(Site).count()).toBe(before);
  });

  it.each([
    [{ ...valid, name: '' }, 'name', /required/],
    [{ ...valid, name: 'x'.repeat(121) }, 'name', /at most 120/],
    [{ ...valid, epsgCode: 'abc' }, 'epsgCode', /number/],
    [{ ...valid, epsgCode: 12.5 }, 'epsgCode', /whole number/],
    [{ ...valid, displayUnits: 'imperial' }, 'displayUnits', /SI or US/],
    [{ ...valid, hydroUnits: ['Sand', 'sand'] }, 'hydroUnits', /unique/],
    [{ ...valid, description: 42 }, 'description', /string/i],
  ])('refuses bad input %# naming the field', async (body, field, message) => {
    const c = await ts.as(demoEmail('Admin'));
    const r = await c.post('/api/sites', body);
    expect(r.status).toBe(400);
    expect(r.body.error.fields[field]).toMatch(message);
  });

  it('lets a Lead rename the site and change its CRS, and refuses an Analyst', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    const r = await lead.patch(`/api/sites/${ts.demoSiteId}`, { epsgCode: 25832, description: 'Moved to ETRS89' }).expect(200);
    expect(r.body.crsName).toBe('ETRS89 / UTM zone 32N');
    const analyst = await ts.as(demoEmail('Analyst'));
    const denied = await analyst.patch(`/api/sites/${ts.demoSiteId}`, { name: 'Mine now' });
    expect(denied.status).toBe(403);
    expect((await lead.get(`/api/sites/${ts.demoSiteId}`)).body.name).not.toBe('Mine now');
    await lead.patch(`/api/sites/${ts.demoSiteId}`, { epsgCode: 32632 }).expect(200);
  });

  it('hides a site from a signed-in user who is not a member (404, not 403)', async () => {
    const owner = await ts.as(demoEmail('Admin'));
    const created = (await owner.post('/api/sites', { ...valid, name: 'Admin private' }).expect(201)).body;
    const other = await ts.as(demoEmail('Viewer'));
    const r = await other.get(`/api/sites/${created.id}`);
    expect(r.status).toBe(404);
    expect(r.body.error.message).toBe('The site was not found');
  });

  it('looks up a CRS by EPSG code with its area of use', async () => {
    const c = await ts.as(demoEmail('Viewer'));
    const r = await c.get('/api/crs/4326').expect(200);
    expect(r.body.name).toBe('WGS 84');
    const utm = await c.get('/api/crs/32632').expect(200);
    expect(utm.body.bbox).toEqual([6, 0, 12, 84]);
    expect((await c.get('/api/crs/99999')).status).toBe(404);
    expect((await c.get('/api/crs/abc')).status).toBe(400);
  });
});

// Issue 16 item 4: only Admins create sites by default; SITE_CREATORS=leads also lets anyone who
// leads a site create one; a Viewer never can.
describe('who may create a site', () => {
  it('lets only Admins create sites by default, and says so in /api/auth/me', async () => {
    for (const role of ['Lead', 'Analyst', 'Checker', 'Viewer'] as const) {
      const c = await ts.as(demoEmail(role));
      expect((await c.get('/api/auth/me').expect(200)).body.user.canCreateSites, role).toBe(false);
      const r = await c.post('/api/sites', { ...valid, name: `By ${role}` });
      expect(r.status, role).toBe(403);
      expect(r.body.error.code).toBe('SITE_CREATOR_REQUIRED');
    }
    const admin = await ts.as(demoEmail('Admin'));
    expect((await admin.get('/api/auth/me').expect(200)).body.user.canCreateSites).toBe(true);
  });

  it('with SITE_CREATORS=leads, lets a Lead of any site create one, and still no Viewer', async () => {
    const leads = await startTestServer({ SITE_CREATORS: 'leads' });
    try {
      const lead = await leads.as(demoEmail('Lead'));
      expect((await lead.get('/api/auth/me').expect(200)).body.user.canCreateSites).toBe(true);
      await lead.post('/api/sites', { ...valid, name: 'By the Lead' }).expect(201);
      for (const role of ['Analyst', 'Viewer'] as const) {
        const c = await leads.as(demoEmail(role));
        expect((await c.get('/api/auth/me').expect(200)).body.user.canCreateSites, role).toBe(false);
        expect((await c.post('/api/sites', { ...valid, name: `By ${role}` })).status, role).toBe(403);
      }
    } finally {
      await leads.close();
    }
  });
});
