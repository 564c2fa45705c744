import { randomUUID } from 'node:crypto';
import type { Router } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { policyTable } from '../../server/auth/policy';
import { routeKey } from '../../server/lib/route';
import { Membership } from '../../server/features/sites/membership.entity';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { ApiClient, demoEmail, startTestServer, type TestServer } from '../support/test-server';

type Principal = 'anonymous' | 'Viewer' | 'Analyst' | 'Checker' | 'Lead' | 'Admin' | 'outsider';
const PRINCIPALS: Principal[] = ['anonymous', 'Viewer', 'Analyst', 'Checker', 'Lead', 'Admin', 'outsider'];
const OUTSIDER = 'outsider@demo.kfield.example';

let ts: TestServer;
const clients = new Map<Principal, ApiClient>();
let demoWellId = '';
/** A permitted DELETE removes its well, so each DELETE of a well gets a throwaway copy of a demo well. */
const spareWellIds: string[] = [];
let recordId = '';
let fitId = '';
let viewerLinkId = '';
const spareRecordIds: string[] = [];

async function clientFor(p: Principal): Promise<ApiClient> {
  if (p === 'anonymous') return ts.client().refreshCsrf();
  return p === 'outsider' ? ts.as(OUTSIDER, 'policy-walk-secret-1') : ts.as(demoEmail(p));
}

beforeAll(async () => {
  ts = await startTestServer({ LOGIN_MAX_FAILURES: '1000', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '1000', LOGIN_SLOWDOWN_AFTER_PER_ADDRESS: '1000' });
  // The outsider leads a site of their own and belongs to no other. Only Admins create sites
  // (SITE_CREATORS=admins, the default): the Admin creates it and makes the outsider its Lead.
  const admin = await ts.as(demoEmail('Admin'));
  const outsiderId = (await admin.post('/api/admin/users', { email: OUTSIDER, name: 'Olive Outsider', password: 'policy-walk-secret-1' }).expect(201)).body.id;
  const another = (await admin.post('/api/sites', { name: 'Another site', epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body;
  await ts.ds.getRepository(Membership).insert({ siteId: another.id, userId: outsiderId, role: 'Lead' });
  const outsider = await ts.as(OUTSIDER, 'policy-walk-secret-1');
  for (const p of PRINCIPALS) clients.set(p, p === 'outsider' ? outsider : await clientFor(p));
  const wells = ts.ds.getRepository(Well);
  const { id, createdAt: _c, updatedAt: _u, ...template } = await wells.findOneByOrFail({ siteId: ts.demoSiteId });
  demoWellId = id;
  for (let i = 0; i < 4 * PRINCIPALS.length; i++) spareWellIds.push((await wells.save(wells.create({ ...template, name: `Policy walk ${i}` }))).id);
  recordId = (await insertSyntheticRecord(ts.ds, demoWellId, { kMetersPerSecond: 2e-5 })).recordId;
  for (let i = 0; i < 2 * PRINCIPALS.length; i++) spareRecordIds.push((await insertSyntheticRecord(ts.ds, demoWellId, { kMetersPerSecond: 2e-5 })).recordId);
  fitId = (await clients.get('Analyst')!.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body.id;
  viewerLinkId = (await clients.get('Lead')!.post(`/api/sites/${ts.demoSiteId}/viewer-links`, { label: 'Policy walk', layers: { wells: true } }).expect(201)).body.id;
});
afterAll(async () => ts.close());

/** Every route the Express app really serves, read from its router stacks. */
function servedRoutes(): string[] {
  const out: string[] = [];
  const walk = (stack: Router['stack']) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const m of Object.keys((layer.route as unknown as { methods: Record<string, boolean> }).methods)) {
          out.push(routeKey(m, String(layer.route.path)));
        }
      } else if ((layer.handle as unknown as { stack?: Router['stack'] }).stack) {
        walk((layer.handle as unknown as { stack: Router['stack'] }).stack);
      }
    }
  };
  walk((ts.kfield.app as unknown as { router: Router }).router.stack);
  return out.filter((k) => k.includes(' /api/') || k.includes(' /tiles/'));
}

function concretePath(path: string, method = 'GET'): string {
  return path
    .replace(':siteId', ts.demoSiteId)
    .replace(':wellId', () => (method.toUpperCase() === 'DELETE' ? (spareWellIds.pop() ?? randomUUID()) : demoWellId))
    .replace(':recordId', () => (method.toUpperCase() === 'DELETE' ? (spareRecordIds.pop() ?? randomUUID()) : recordId))
    .replace(':fitId', fitId)
    .replace(':linkId', () => viewerLinkId)
    .replace(':code', '32632')
    .replace(':token', 'policy-test-token-0000')
    // A tile of the invented demo area at zoom 14, of the built-in basemap.
    .replace(':basemapId', 'default')
    .replace(':z', '14')
    .replace(':x', '8608')
    .replace(':y', '5711')
    .replace(':fontstack', encodeURIComponent('Roboto Flex Regular'))
    .replace(':range', '0-255')
    .replace(/:[A-Za-z]+Id/g, () => randomUUID());
}

const isSiteNotFound = (status: number, body: { error?: { message?: string } }) =>
  status === 404 && body?.error?.message === 'The site was not found';
/** A refusal by the policy itself (services refuse with codes of their own, e.g. SELF_CHECK). */
const isPolicyForbidden = (status: number, body: { error?: { code?: string } }) =>
  status === 403 && ['ROLE_REQUIRED', 'ADMIN_REQUIRED'].includes(String(body?.error?.code));

describe('the policy table', () => {
  it('names a policy for every route the server serves, and every policy belongs to a served route', () => {
    const served = servedRoutes();
    expect(served.length).toBeGreaterThan(20);
    const missing = served.filter((k) => !(k in policyTable));
    expect(missing, 'routes without a policy (deny by default; add them to server/auth/policy.ts)').toEqual([]);
    const stale = Object.keys(policyTable).filter((k) => !served.includes(k));
    expect(stale, 'policies for routes that do not exist').toEqual([]);
  });

  it('gives every principal the status its policy promises on every route', async () => {
    const failures: string[] = [];
    for (const route of ts.kfield.routes) {
      const key = routeKey(route.method, route.path);
      const rule = policyTable[key];
      for (const p of PRINCIPALS) {
        let c = clients.get(p)!;
        const r = await c.send(route.method, concretePath(route.path, route.method), {});
        if (key === 'POST /api/auth/logout') clients.set(p, (c = await clientFor(p)));
        const s = r.status;
        const denied = s === 401 || isPolicyForbidden(s, r.body) || (s === 403 && r.body?.error?.code === 'CSRF_INVALID') || isSiteNotFound(s, r.body);
        let ok: boolean;
        let expected: string;
        if (rule.kind === 'public') [ok, expected] = [!(s === 401 || s === 403), 'not 401/403'];
        else if (p === 'anonymous') [ok, expected] = [s === 401, '401'];
        else if (rule.kind === 'signedIn') [ok, expected] = [!denied, 'allowed'];
        else if (rule.kind === 'admin') [ok, expected] = p === 'Admin' ? [!denied, 'allowed'] : [isPolicyForbidden(s, r.body), '403'];
        else if (rule.kind === 'site') {
          if (p === 'Admin') [ok, expected] = [!denied, 'allowed'];
          else if (p === 'outsider') [ok, expected] = [isSiteNotFound(s, r.body), '404 (site hidden)'];
          else if (rule.roles.includes(p)) [ok, expected] = [!denied, 'allowed'];
          else [ok, expected] = [isPolicyForbidden(s, r.body), '403'];
        } else [ok, expected] = [s === 403, '403 (deny)'];
        if (!ok) failures.push(`${key} as ${p}: got ${s}, expected ${expected}`);
        expect(s, `${key} as ${p}`).toBeLessThan(500);
      }
    }
    expect(failures).toEqual([]);
  });

  it('matches the expected matrix on the routes that guard a site', async () => {
    const matrix: Record<string, Record<Principal, number>> = {
      'GET /api/sites/:siteId': { anonymous: 401, Viewer: 200, Analyst: 200, Checker: 200, Lead: 200, Admin: 200, outsider: 404 },
      'PATCH /api/sites/:siteId': { anonymous: 401, Viewer: 403, Analyst: 403, Checker: 403, Lead: 200, Admin: 200, outsider: 404 },
      'GET /api/admin/users': { anonymous: 401, Viewer: 403, Analyst: 403, Checker: 403, Lead: 403, Admin: 200, outsider: 403 },
      'POST /api/sites/:siteId/invitations': { anonymous: 401, Viewer: 403, Analyst: 403, Checker: 403, Lead: 400, Admin: 400, outsider: 404 },
      'GET /api/wells/:wellId': { anonymous: 401, Viewer: 200, Analyst: 200, Checker: 200, Lead: 200, Admin: 200, outsider: 404 },
      'DELETE /api/wells/:wellId': { anonymous: 401, Viewer: 403, Analyst: 204, Checker: 403, Lead: 204, Admin: 204, outsider: 404 },
    };
    for (const [key, want] of Object.entries(matrix)) {
      const [method, path] = key.split(' ');
      for (const p of PRINCIPALS) {
        const r = await clients.get(p)!.send(method, concretePath(path, method), method === 'PATCH' ? { description: `set by ${p}` } : {});
        expect(`${key} as ${p}: ${r.status}`).toBe(`${key} as ${p}: ${want[p]}`);
      }
    }
  });
});
