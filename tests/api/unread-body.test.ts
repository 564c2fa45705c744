import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { send } from '../reliability/support';
import { startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

// Bodies a route does not read: the client must still get the answer, not a reset while it sends.
const cases = [
  { what: 'a body sent with a GET of a large answer', method: 'GET', url: '/api/openapi.json', type: 'application/vnd.api+json', size: 600_000, status: 200 },
  { what: 'a body of a type no parser reads', method: 'POST', url: '/api/auth/password/forgot', type: 'text/plain', size: 900_000, status: 403 },
  { what: 'a multipart body to a route without uploads, refused before it is read', method: 'GET', url: '/api/auth/me', type: 'multipart/form-data; boundary=x', size: 900_000, status: 401 },
];

describe('a request whose body no route reads', () => {
  for (const c of cases) {
    it(`answers ${c.status} to ${c.what}`, async () => {
      const statuses: number[] = [];
      for (let i = 0; i < 3; i++) {
        const a = await send(ts.baseUrl + c.url, { method: c.method, headers: { 'content-type': c.type }, body: `{"name":"${'x'.repeat(c.size)}"}` });
        statuses.push(a.status);
      }
      expect(statuses).toEqual([c.status, c.status, c.status]);
    });
  }
});
