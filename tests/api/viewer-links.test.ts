import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashToken } from '../../server/auth/tokens';
import { ViewerLinkEntity } from '../../server/features/viewer-links/viewer-link.entity';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let lead: ApiClient;
let otherSiteId = '';

const ALL = { wells: true, surface: true, outlines: true, sketches: true };
const tokenOf = (url: string) => url.split('/view/')[1];
const VIEW_PATHS = ['', '/wells', '/k-surface', '/outlines', '/capture-sketches'];

async function makeLink(body: Record<string, unknown> = {}) {
  const r = await lead.post(`/api/sites/${ts.demoSiteId}/viewer-links`, { label: 'Regulator', layers: { wells: true }, ...body }).expect(201);
  return { link: r.body, token: tokenOf(r.body.url) };
}

beforeAll(async () => {
  ts = await startTestServer();
  lead = await ts.as(demoEmail('Lead'));
  const admin = await ts.as(demoEmail('Admin'));
  otherSiteId = (await admin.post('/api/sites', { name: 'Another site', epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body.id;
  await admin.post(`/api/sites/${otherSiteId}/wells`, { name: 'OTHER-SITE-WELL', crs: 'wgs84', x: 9.1, y: 45.1, groundElevationM: 100, measuringPointElevationM: 100.5, screenTopDepthM: 5, screenBottomDepthM: 8, casingRadiusM: 0.025, screenRadiusM: 0.05 });
});
afterAll(async () => ts.close());

describe('viewer links: making, listing, revoking', () => {
  it('lets a Lead make a link whose URL (on PUBLIC_URL) carries a 256-bit token shown once, of which only the SHA-256 is stored', async () => {
    const { link, token } = await makeLink({ label: 'Regional regulator' });
    expect(link.url).toBe(`${ts.config.PUBLIC_URL.replace(/\/$/, '')}/view/${token}`);
    // 32 bytes in base64url without padding: 43 characters, 256 bits.
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(token, 'base64url').length).toBe(32);
    const row = await ts.ds.getRepository(ViewerLinkEntity).findOneByOrFail({ id: link.id });
    expect(row.tokenHash).not.toBe(token);
    expect(row.tokenHash).toBe(hashToken(token));
    expect(JSON.stringify(row)).not.toContain(token);
    expect(link).toMatchObject({ label: 'Regional regulator', showNames: false, showConstruction: false, viewCount: 0, revokedAt: null, lastViewedAt: null });
    const days = (Date.parse(link.expiresAt) - Date.parse(link.createdAt)) / 86_400_000;
    expect(days).toBeCloseTo(30, 2); // the default expiry, 30 days
    const list = (await lead.get(`/api/sites/${ts.demoSiteId}/viewer-links`).expect(200)).body.links;
    const listed = list.find((l: { id: string }) => l.id === link.id);
    expect(listed).toMatchObject({ label: 'Regional regulator', createdBy: expect.any(String), viewCount: 0 });
    expect(listed.createdBy.length).toBeGreaterThan(0);
    expect(JSON.stringify(list)).not.toContain(token);
    expect(listed.url).toBeUndefined();
  });

  it('refuses an expiry over a year and a label over 120 characters, naming the field', async () => {
    const r1 = await lead.post(`/api/sites/${ts.demoSiteId}/viewer-links`, { label: 'x', expiresInDays: 366, layers: { wells: true } }).expect(400);
    expect(Object.keys(r1.body.error.fields ?? {})).toContain('expiresInDays');
    const r2 = await lead.post(`/api/sites/${ts.demoSiteId}/viewer-links`, { label: 'x'.repeat(121), layers: { wells: true } }).expect(400);
    expect(Object.keys(r2.body.error.fields ?? {})).toContain('label');
  });

  it('counts a view of the link (lastViewedAt, viewCount)', async () => {
    const { link, token } = await makeLink();
    await ts.client().get(`/api/view/${token}`).expect(200);
    await ts.client().get(`/api/view/${token}`).expect(200);
    const listed = (await lead.get(`/api/sites/${ts.demoSiteId}/viewer-links`).expect(200)).body.links.find((l: { id: string }) => l.id === link.id);
    expect(listed.viewCount).toBe(2);
    expect(listed.lastViewedAt).not.toBeNull();
  });

  it('revokes a link at once: its next request is 404', async () => {
    const { link, token } = await makeLink();
    await ts.client().get(`/api/view/${token}/wells`).expect(200);
    await lead.delete(`/api/viewer-links/${link.id}`).expect(204);
    for (const p of VIEW_PATHS) await ts.client().get(`/api/view/${token}${p}`).expect(404);
    const listed = (await lead.get(`/api/sites/${ts.demoSiteId}/viewer-links`).expect(200)).body.links.find((l: { id: string }) => l.id === link.id);
    expect(listed.revokedAt).not.toBeNull();
  });

  it('ends a link at its expiry: 404 once expiresAt is past', async () => {
    const { link, token } = await makeLink();
    await ts.client().get(`/api/view/${token}`).expect(200);
    await ts.ds.getRepository(ViewerLinkEntity).update({ id: link.id }, { expiresAt: new Date(Date.now() - 1000) });
    await ts.client().get(`/api/view/${token}`).expect(404);
  });

  it('answers unknown, malformed, expired and revoked tokens with the identical 404', async () => {
    const expired = await makeLink();
    await ts.ds.getRepository(ViewerLinkEntity).update({ id: expired.link.id }, { expiresAt: new Date(Date.now() - 1000) });
    const revoked = await makeLink();
    await lead.delete(`/api/viewer-links/${revoked.link.id}`).expect(204);
    const unknown = Buffer.alloc(32, 7).toString('base64url');
    const answers = [];
    for (const t of [unknown, 'short', expired.token, revoked.token]) {
      const r = await ts.client().get(`/api/view/${t}`);
      answers.push({ status: r.status, body: r.body, referrer: r.headers['referrer-policy'], cache: r.headers['cache-control'] });
    }
    expect(answers[0].status).toBe(404);
    for (const a of answers) expect(a).toEqual(answers[0]);
  });

  it('lets neither a Viewer nor an Analyst make, list, e-mail or revoke links', async () => {
    const { link, token } = await makeLink();
    for (const role of ['Viewer', 'Analyst'] as const) {
      const c = await ts.as(demoEmail(role));
      expect((await c.post(`/api/sites/${ts.demoSiteId}/viewer-links`, { label: 'x', layers: { wells: true } })).status).toBe(403);
      expect((await c.get(`/api/sites/${ts.demoSiteId}/viewer-links`)).status).toBe(403);
      expect((await c.delete(`/api/viewer-links/${link.id}`)).status).toBe(403);
      expect((await c.post(`/api/viewer-links/${link.id}/email`, { to: ['a@example.org'], url: link.url })).status).toBe(403);
    }
    await ts.client().get(`/api/view/${token}`).expect(200);
  });
});

describe('viewer links: e-mail', () => {
  it('queues one message per address in the outbox with the URL, given the URL shown at creation', async () => {
    const { link } = await makeLink();
    const r = await lead.post(`/api/viewer-links/${link.id}/email`, { to: ['reg@example.org', 'owner@example.org'], url: link.url }).expect(200);
    expect(r.body.queued).toBe(2);
    for (const a of ['reg@example.org', 'owner@example.org']) {
      const mail = await ts.outbox(a);
      expect(mail).toHaveLength(1);
      expect(mail[0].toAddresses).toEqual([a]);
      expect(mail[0].text).toContain(link.url);
    }
  });

  it('refuses to mail without this link’s URL or token (the server cannot show the token again)', async () => {
    const a = await makeLink();
    const b = await makeLink();
    const r = await lead.post(`/api/viewer-links/${a.link.id}/email`, { to: ['wrong@example.org'], url: b.link.url }).expect(400);
    expect(r.body.error.code).toBe('VIEWER_LINK_MISMATCH');
    await lead.post(`/api/viewer-links/${a.link.id}/email`, { to: ['wrong@example.org'] }).expect(400);
    expect(await ts.outbox('wrong@example.org')).toHaveLength(0);
    await lead.post(`/api/viewer-links/${a.link.id}/email`, { to: ['right@example.org'], token: a.token }).expect(200);
    expect(await ts.outbox('right@example.org')).toHaveLength(1);
  });

  it('holds back the same link to the same address within minutes, and says which addresses it held', async () => {
    const { link } = await makeLink();
    await lead.post(`/api/viewer-links/${link.id}/email`, { to: ['twice@example.org'], url: link.url }).expect(200);
    const again = await lead.post(`/api/viewer-links/${link.id}/email`, { to: ['twice@example.org', 'new@example.org'], url: link.url }).expect(200);
    expect(again.body).toEqual({ queued: 1, held: ['twice@example.org'] });
    expect(await ts.outbox('twice@example.org')).toHaveLength(1);
    expect(await ts.outbox('new@example.org')).toHaveLength(1);
  });

  it('refuses with 429, queueing nothing, once an account has mailed links to 100 addresses in an hour', async () => {
    const own = await startTestServer();
    try {
      const l = await own.as(demoEmail('Lead'));
      const made = (await l.post(`/api/sites/${own.demoSiteId}/viewer-links`, { label: 'Flood', layers: { wells: true } }).expect(201)).body;
      const batch = (n: number) => Array.from({ length: 20 }, (_, i) => `flood-${n}-${i}@example.org`);
      for (let n = 0; n < 5; n++) await l.post(`/api/viewer-links/${made.id}/email`, { to: batch(n), url: made.url }).expect(200);
      const over = await l.post(`/api/viewer-links/${made.id}/email`, { to: batch(5), url: made.url });
      expect(over.status).toBe(429);
      expect(over.body.error.code).toBe('RATE_LIMITED');
      expect(over.headers['retry-after']).toBe('3600');
      expect(await own.outbox('flood-5-0@example.org')).toHaveLength(0);
      expect((await own.outbox()).filter((m) => m.toAddresses[0]?.startsWith('flood-'))).toHaveLength(100);
    } finally {
      await own.close();
    }
  });
});

describe('viewer links: what a token opens', () => {
  it('shows only the layers the link allows, with the site, cautions and expiry', async () => {
    const { token } = await makeLink({ layers: { wells: true } });
    const info = (await ts.client().get(`/api/view/${token}`).expect(200)).body;
    expect(info).toMatchObject({ layers: { wells: true, surface: false, outlines: false, sketches: false }, showNames: false, showConstruction: false, epsgCode: expect.any(Number) });
    expect(info.siteName.length).toBeGreaterThan(0);
    expect(info.cautions.length).toBe(3); // shared/cautions.ts
    expect(info.basemapStyleUrl).toContain('style.json');
    await ts.client().get(`/api/view/${token}/wells`).expect(200);
    await ts.client().get(`/api/view/${token}/k-surface`).expect(404);
    await ts.client().get(`/api/view/${token}/outlines`).expect(404);
    await ts.client().get(`/api/view/${token}/capture-sketches`).expect(404);
  });

  it('removes well names and construction unless the link shows them, and shows nothing of another site', async () => {
    const hidden = await makeLink({ layers: { wells: true } });
    const fc = (await ts.client().get(`/api/view/${hidden.token}/wells`).expect(200)).body;
    expect(fc.features.length).toBeGreaterThan(10); // about 24 demo wells
    for (const f of fc.features) {
      expect(Object.keys(f.properties).sort()).toEqual(['count', 'hydroUnit', 'id', 'log10K', 'log10StdDev', 'status', 'wellK']);
    }
    expect(fc.features.some((f: { properties: { wellK: number | null } }) => f.properties.wellK !== null)).toBe(true);
    const shown = await makeLink({ layers: { wells: true }, showNames: true, showConstruction: true });
    const fc2 = (await ts.client().get(`/api/view/${shown.token}/wells`).expect(200)).body;
    expect(fc2.features[0].properties).toHaveProperty('name');
    expect(fc2.features[0].properties).toHaveProperty('screenTopElevationM');
    const names = await makeLink({ layers: { wells: true }, showNames: true });
    const fc3 = (await ts.client().get(`/api/view/${names.token}/wells`).expect(200)).body;
    expect(fc3.features[0].properties).toHaveProperty('name');
    expect(fc3.features[0].properties).not.toHaveProperty('screenTopDepthM');
    expect(JSON.stringify(fc2)).not.toContain('OTHER-SITE-WELL');
  });

  it('serves the frozen K surface, the outlines and the sketches with no @ anywhere in any view answer', async () => {
    const { token } = await makeLink({ layers: { ...ALL, surfaceSettings: { power: 3 } }, showNames: true, showConstruction: true });
    const s = (await ts.client().get(`/api/view/${token}/k-surface?power=1`).expect(200)).body;
    expect(s.settings.power).toBe(3); // frozen at creation; the query is ignored
    const o = (await ts.client().get(`/api/view/${token}/outlines`).expect(200)).body;
    expect(o.outlines.length).toBeGreaterThan(0);
    expect(o.outlines[0]).not.toHaveProperty('createdBy');
    const k = (await ts.client().get(`/api/view/${token}/capture-sketches`).expect(200)).body;
    expect(k.sketches.length).toBeGreaterThan(0);
    expect(k.sketches[0]).not.toHaveProperty('createdBy');
    expect(k.sketches[0]).not.toHaveProperty('createdById');
    for (const p of VIEW_PATHS) {
      const r = await ts.client().get(`/api/view/${token}${p}`).expect(200);
      expect(r.text, p).not.toContain('@');
      expect(r.text, p).not.toContain(otherSiteId);
      expect(r.headers['referrer-policy'], p).toBe('no-referrer');
      expect(r.headers['cache-control'], p).toBe('no-store');
    }
  });

  it('opens no other API route: the token as a cookie, a bearer header or a query does not sign in', async () => {
    const { token } = await makeLink({ layers: ALL });
    const routes = [`/api/sites/${ts.demoSiteId}/wells`, `/api/sites/${ts.demoSiteId}/map/wells`, `/api/sites/${ts.demoSiteId}`, `/api/sites/${ts.demoSiteId}/viewer-links`, '/api/auth/me'];
    for (const url of routes) {
      const c = ts.client();
      expect((await c.get(url).set('Cookie', `kfield.sid=${token}`)).status, url).toBe(401);
      expect((await c.get(url).set('Authorization', `Bearer ${token}`)).status, url).toBe(401);
      expect((await c.get(`${url}?token=${token}`)).status, url).toBe(401);
    }
  });

  it('limits view requests per client address (page and API), answering the one error shape with Retry-After', async () => {
    const small = await startTestServer({ VIEW_REQUESTS_PER_MINUTE: '3' });
    try {
      const c = small.client();
      for (let i = 0; i < 3; i++) expect((await c.get('/api/view/short')).status).toBe(404);
      const r = await c.get('/api/view/short');
      expect(r.status).toBe(429);
      expect(r.body).toEqual({ error: { code: 'RATE_LIMITED', message: expect.stringMatching(/viewer/) } });
      expect(r.headers['retry-after']).toBe('60');
      for (let i = 0; i < 3; i++) expect((await c.get('/view/short')).status).toBe(404);
      expect((await c.get('/view/short')).status).toBe(429);
      // Other routes are not held back by the view limit.
      expect((await c.get('/api/health')).status).toBe(200);
    } finally {
      await small.close();
    }
  });
});

describe('viewer links: no session for a viewer', () => {
  it('reads and writes no session on the view routes and the page, even with a signed-in cookie', async () => {
    const { token } = await makeLink({ layers: ALL });
    // The Lead's own agent carries a session cookie, which a rolling session would re-send on any route under it.
    expect((await lead.get(`/api/sites/${ts.demoSiteId}`)).headers['set-cookie']).toBeDefined();
    for (const p of VIEW_PATHS) {
      const r = await lead.get(`/api/view/${token}${p}`);
      expect(r.status, p).toBe(200);
      expect(r.headers['set-cookie'], p).toBeUndefined();
    }
    expect((await lead.get(`/view/${token}`)).headers['set-cookie']).toBeUndefined();
  });
});

describe('viewer links: the page', () => {
  it('serves the page at /view/:token with 200 for a working link, no referrer and no-store, without counting a view', async () => {
    const { link, token } = await makeLink();
    const r = await ts.client().get(`/view/${token}`);
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toMatch(/text\/html/);
    expect(r.headers['referrer-policy']).toBe('no-referrer');
    expect(r.headers['cache-control']).toBe('no-store');
    const listed = (await lead.get(`/api/sites/${ts.demoSiteId}/viewer-links`).expect(200)).body.links.find((l: { id: string }) => l.id === link.id);
    expect(listed.viewCount).toBe(0);
  });

  it('answers the page of an unknown, malformed, expired or revoked link with status 404 and the identical page', async () => {
    const expired = await makeLink();
    await ts.ds.getRepository(ViewerLinkEntity).update({ id: expired.link.id }, { expiresAt: new Date(Date.now() - 1000) });
    const revoked = await makeLink();
    await ts.client().get(`/view/${revoked.token}`).expect(200);
    await lead.delete(`/api/viewer-links/${revoked.link.id}`).expect(204);
    const answers = [];
    for (const t of [Buffer.alloc(32, 9).toString('base64url'), 'x', expired.token, revoked.token]) {
      const r = await ts.client().get(`/view/${t}`);
      answers.push({ status: r.status, body: r.text, type: r.headers['content-type'], referrer: r.headers['referrer-policy'], cache: r.headers['cache-control'] });
    }
    expect(answers[0]).toMatchObject({ status: 404, referrer: 'no-referrer', cache: 'no-store' });
    expect(answers[0].type).toMatch(/text\/html/);
    for (const a of answers) expect(a).toEqual(answers[0]);
  });
});
