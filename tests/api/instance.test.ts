import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeKey } from '../../server/lib/route';
import { startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('instance', () => {
  it('reports health with the database checked', async () => {
    const r = await ts.client().get('/api/health').expect(200);
    expect(r.body).toMatchObject({ status: 'ok', database: 'ok' });
  });

  it('answers an unknown API route with the JSON error shape', async () => {
    const r = await ts.client().get('/api/no-such-thing');
    expect(r.status).toBe(404);
    expect(r.body.error).toMatchObject({ code: 'NOT_FOUND', message: expect.any(String) });
  });

  it('sends a CSP that lets map workers run from self and blob: and nothing from elsewhere', async () => {
    const r = await ts.client().get('/api/health');
    const csp = String(r.headers['content-security-policy']);
    expect(csp).toMatch(/worker-src 'self' blob:/);
    expect(csp).toMatch(/default-src 'self'/);
    expect(csp).not.toMatch(/https?:\/\//);
  });

  it('publishes an OpenAPI 3.1 document listing every route with its request and response schemas', async () => {
    const doc = (await ts.client().get('/api/openapi.json').expect(200)).body;
    expect(doc.openapi).toBe('3.1.0');
    for (const route of ts.kfield.routes) {
      const p = route.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}');
      const op = doc.paths[p]?.[route.method];
      expect(op, routeKey(route.method, route.path)).toBeTruthy();
      if (route.body) expect(op.requestBody.content['application/json'].schema, `${routeKey(route.method, route.path)} body`).toBeTruthy();
      const ok = String(route.status ?? 200);
      expect(op.responses[ok], `${routeKey(route.method, route.path)} ${ok}`).toBeTruthy();
      for (const m of route.path.matchAll(/:([A-Za-z0-9_]+)/g)) {
        expect(op.parameters.some((x: { name: string; in: string }) => x.name === m[1] && x.in === 'path')).toBe(true);
      }
    }
    const create = doc.paths['/api/sites'].post;
    expect(create.requestBody.content['application/json'].schema.properties.epsgCode).toBeTruthy();
    expect(create.responses['201'].content['application/json'].schema.properties.crsName).toBeTruthy();
  });
});
