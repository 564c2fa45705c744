import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, demoEmail, HttpSession, LOGGER_SETTINGS, loggerCsv, multipart, send, signedIn, startServerProcess, tempDir, type MultipartPart, type ServerProcess } from './support';

const TARGET_REQUESTS = 10_000;
const TIME_BUDGET_MS = 240_000;
const CONCURRENCY = 8;
const HEALTH_EVERY = 200;
const REQUEST_TIMEOUT_MS = 30_000;
// A fixed seed by default, so that CI runs the same 10,000 inputs each time and a failure can be
// replayed; FUZZ_SEED=<n> (or FUZZ_SEED=random) explores other inputs.
/** A generated value as query text; an array parameter's values joined (some generated objects have no string form). */
const queryText = (v: unknown): string => {
  if (Array.isArray(v)) return v.map(queryText).join(',');
  try {
    return typeof v === 'object' && v !== null ? JSON.stringify(v) : String(v);
  } catch {
    return '';
  }
};
const SEED = process.env.FUZZ_SEED === 'random' ? Date.now() % 1_000_000 : Number(process.env.FUZZ_SEED ?? 20261203);

/*
 * Left out, because they would make the rest of the run meaningless (not because they are safe):
 * - DELETE /api/admin/outbox: not sent at all.
 * - Sign-in, sign-out, password reset and invitation acceptance: sent from a fresh anonymous
 *   session each time, never from a role's session (a sign-out or a new sign-in would end it).
 * - Real user ids on PATCH /api/admin/users/:userId, POST /api/admin/users/:userId/reset and the
 *   member routes: only a throw-away account made for the run (disabling or resetting the Admin
 *   or a demo member would sign the fuzzer's own sessions out or drop their roles).
 * - Real ids on DELETE /api/wells/:wellId and DELETE /api/records/:recordId: only bad or unknown
 *   ids (deleting the demo wells and records would leave the later routes nothing but 404s).
 */
const EXCLUDED = new Set(['DELETE /api/admin/outbox']);
const FRESH_SESSION = new Set(['POST /api/auth/login', 'POST /api/auth/logout', 'POST /api/auth/password/reset', 'POST /api/invitations/accept']);
const NO_REAL_IDS = new Set(['DELETE /api/wells/{wellId}', 'DELETE /api/records/{recordId}']);

type Role = 'anonymous' | 'Viewer' | 'Analyst' | 'Checker' | 'Lead' | 'Admin';
const ROLES: Role[] = ['anonymous', 'Viewer', 'Analyst', 'Checker', 'Lead', 'Admin'];
type Schema = Record<string, unknown> & {
  type?: string | string[];
  properties?: Record<string, Schema>;
  required?: string[];
  items?: Schema;
  enum?: unknown[];
  const?: unknown;
  anyOf?: Schema[];
  oneOf?: Schema[];
  minimum?: number;
  maximum?: number;
  minLength?: number;
  maxLength?: number;
  format?: string;
  additionalProperties?: Schema | boolean;
  contentSchema?: Schema;
};
interface Operation {
  parameters: { name: string; in: 'path' | 'query'; schema: Schema }[];
  requestBody?: { content: Record<string, { schema: Schema }> };
}
interface Route {
  method: string;
  path: string;
  key: string;
  op: Operation;
}
interface FuzzRequest {
  route: Route;
  role: Role;
  url: string;
  headers: Record<string, string>;
  body?: string | Buffer[];
  withCsrf: boolean;
  excerpt: string;
}
interface Failure {
  key: string;
  role: Role;
  url: string;
  excerpt: string;
  status: number | string;
  message: string;
  serverLog?: string;
  req: FuzzRequest;
}

// ---- values -----------------------------------------------------------------------------------

const nasty = fc.constantFrom(
  '', ' ', '..', '../..', '../../etc/passwd', '..%2F..%2Fetc%2Fpasswd', '%00', '\u0000', 'null', 'undefined', 'NaN', 'Infinity', '-1', '0', '1e309', '9007199254740993',
  '__proto__', 'constructor', 'prototype', '[]', '{}', "' OR 1=1 --", '"; DROP TABLE users; --', '%', '%zz', '%E0%A4%A', '\ud800', '\udfff', '\u202e\u0644\u0627', 'Ω≈ç√∫˜µ≤', '👩‍👩‍👧‍👦🏳️‍🌈', 'e\u0301\u0301\u0301', '\r\n\r\n', '<script>alert(1)</script>', 'C:\\con\\nul',
);
const repeated = (min: number, max: number) => fc.tuple(fc.constantFrom('x', 'é', '🌊', 'ab\u0000', '%'), fc.integer({ min, max })).map(([u, n]) => u.repeat(n));
const strings = (huge: fc.Arbitrary<string>) =>
  fc.oneof(
    { weight: 3, arbitrary: fc.string({ maxLength: 40 }) },
    { weight: 2, arbitrary: fc.string({ unit: 'grapheme', maxLength: 40 }) },
    { weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
    { weight: 2, arbitrary: nasty },
    { weight: 1, arbitrary: huge },
  );
const anyString = strings(repeated(1_000, 200_000));
// In a URL: long, but mostly under Node's 16 KB header limit so that the app sees it; now and then far over it.
const urlString = strings(fc.oneof({ weight: 6, arbitrary: repeated(200, 1_500) }, { weight: 1, arbitrary: repeated(20_000, 60_000) }));
const NODE_HEADER_LIMIT = 16 * 1024;
// Node's limit covers the request line and every header (cookie, CSRF token, content type): a URL this close to it may push the whole over.
const HEADER_ROOM = 2 * 1024;
const JSON_LIMIT = 1024 * 1024;
const oddNumber = fc.oneof(fc.constantFrom(0, -0, -1, 1e308, -1e308, 5e-324, 2 ** 53 + 1, 0.5, -1e-9), fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer());
// Deeper values go in as text (deepText): JSON.stringify here would overflow the test's own stack.
const deepValue = fc.integer({ min: 50, max: 1_000 }).map((n) => {
  let v: unknown = 'bottom';
  for (let i = 0; i < n; i++) v = i % 2 ? [v] : { a: v };
  return v;
});
const deepText = fc.tuple(fc.integer({ min: 2_000, max: 100_000 }), fc.boolean()).map(([n, arrays]) => (arrays ? '['.repeat(n) + ']'.repeat(n) : '{"a":'.repeat(n) + '1' + '}'.repeat(n)));
const wrongValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
  { weight: 2, arbitrary: anyString },
  { weight: 2, arbitrary: oddNumber },
  { weight: 1, arbitrary: fc.constantFrom(null, true, false, [], {}, [null], { __proto__: null }) },
  { weight: 1, arbitrary: deepValue },
);

const typesOf = (s: Schema): string[] => (Array.isArray(s.type) ? s.type : s.type ? [s.type] : []);

/** Values shaped by a JSON schema, each part sometimes of the wrong type or out of range. */
function fromSchema(s: Schema, pools: Pools, depth = 0, name = ''): fc.Arbitrary<unknown> {
  const right = rightValue(s, pools, depth, name);
  return fc.oneof({ weight: 5, arbitrary: right }, { weight: 1, arbitrary: wrongValue });
}

function rightValue(s: Schema, pools: Pools, depth: number, name: string): fc.Arbitrary<unknown> {
  if (depth > 6) return fc.constant(null);
  if (s.const !== undefined) return fc.constant(s.const);
  if (s.enum) return fc.constantFrom(...s.enum);
  const alts = s.anyOf ?? s.oneOf;
  if (alts?.length) return fc.oneof(...alts.map((a) => rightValue(a, pools, depth + 1, name)));
  const types = typesOf(s);
  if (!types.length) return fc.jsonValue({ maxDepth: 2 });
  return fc.oneof(
    ...types.map((t): fc.Arbitrary<unknown> => {
      switch (t) {
        case 'object': {
          const props = Object.entries(s.properties ?? {});
          const required = new Set(s.required ?? []);
          const record = fc.record(Object.fromEntries(props.map(([k, p]) => [k, fromSchema(p, pools, depth + 1, k)])), {
            requiredKeys: props.map(([k]) => k).filter((k) => required.has(k) || Math.random() < 0.3),
          });
          const extra = fc.dictionary(fc.oneof(fc.string({ maxLength: 10 }), fc.constantFrom('__proto__', 'constructor', 'prototype', 'id', 'isAdmin', 'siteId')), wrongValue, { maxKeys: 2 });
          return fc.tuple(record, fc.oneof({ weight: 4, arbitrary: fc.constant({}) }, { weight: 1, arbitrary: extra })).map(([a, b]) => ({ ...b, ...a }));
        }
        case 'array': {
          const items = s.items ? fromSchema(s.items, pools, depth + 1, name) : fc.jsonValue({ maxDepth: 1 });
          return fc.oneof({ weight: 6, arbitrary: fc.array(items, { maxLength: 8 }) }, { weight: 1, arbitrary: fc.array(items, { minLength: 500, maxLength: 3000 }) });
        }
        case 'string':
          return stringFor(s, pools, name);
        case 'integer':
          return fc.oneof(fc.integer({ min: s.minimum ?? -1e6, max: s.maximum ?? 1e6 }), oddNumber);
        case 'number':
          return fc.oneof(fc.double({ min: s.minimum ?? -1e6, max: s.maximum ?? 1e6, noNaN: true }), oddNumber);
        case 'boolean':
          return fc.boolean();
        case 'null':
          return fc.constant(null);
        default:
          return fc.jsonValue({ maxDepth: 1 });
      }
    }),
  );
}

function stringFor(s: Schema, pools: Pools, name: string): fc.Arbitrary<string> {
  const lower = name.toLowerCase();
  if (lower.includes('email')) return fc.oneof(fc.constantFrom(...pools.emails), fc.emailAddress(), anyString);
  if (lower.includes('password')) return fc.oneof(fc.constant(DEMO_PASSWORD), fc.string({ minLength: 8, maxLength: 80 }), anyString);
  if (s.format === 'uuid' || lower.endsWith('id')) return fc.oneof(fc.constantFrom(...pools.anyIds), fc.uuid(), anyString);
  if (s.format === 'date') return fc.oneof(fc.date({ noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10)), anyString);
  if (s.format === 'date-time') return fc.oneof(fc.date({ noInvalidDate: true }).map((d) => d.toISOString()), anyString);
  if (s.contentSchema) return fc.oneof({ weight: 4, arbitrary: fromSchema(s.contentSchema, pools, 1).map((v) => JSON.stringify(v) ?? 'null') }, { weight: 1, arbitrary: anyString });
  return fc.oneof({ weight: 3, arbitrary: fc.string({ minLength: s.minLength ?? 0, maxLength: Math.min(s.maxLength ?? 30, 30) }) }, { weight: 2, arbitrary: anyString });
}

// ---- requests ---------------------------------------------------------------------------------

interface Pools {
  byParam: Record<string, string[]>;
  anyIds: string[];
  emails: string[];
  smallCsv: Buffer;
  emptySqlite: Buffer;
  oddSqlite: Buffer;
}

/** encodeURIComponent, with a lone surrogate sent as the invalid UTF-8 bytes ED A0 80 instead of throwing. */
const enc = (v: string) => encodeURIComponent(v.replace(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, '\u0001LONE\u0001')).replaceAll('%01LONE%01', '%ED%A0%80');
const raw = (v: string) => /^[\x21-\x7e]*$/.test(v) && !v.includes('?') && !v.includes('#');

function paramValue(route: Route, name: string, pools: Pools): fc.Arbitrary<string> {
  const real = NO_REAL_IDS.has(route.key) ? [] : (pools.byParam[name] ?? []);
  const bad = fc.oneof(fc.uuid(), urlString, fc.integer().map(String)).map((v) => ({ v, enc: true }));
  const badRaw = nasty.filter(raw).map((v) => ({ v, enc: false }));
  const arbs: fc.WeightedArbitrary<{ v: string; enc: boolean }>[] = [
    { weight: 3, arbitrary: bad },
    { weight: 1, arbitrary: badRaw },
  ];
  if (real.length) arbs.push({ weight: 5, arbitrary: fc.constantFrom(...real).map((v) => ({ v, enc: true })) });
  return fc.oneof(...arbs).map(({ v, enc: encode }) => (encode ? enc(v) : v));
}

function queryString(route: Route, pools: Pools): fc.Arbitrary<string> {
  const declared = route.op.parameters.filter((p) => p.in === 'query');
  const pair = fc.oneof(
    ...declared.map((p) => fc.tuple(fc.constant(p.name), fc.oneof(rightValue(p.schema, pools, 0, p.name).map(queryText), urlString))),
    fc.tuple(fc.oneof(fc.constantFrom('__proto__', 'constructor', 'a[b]', 'points[]', '__proto__[isAdmin]', 'which', 'dryRun', ''), fc.string({ maxLength: 8 })), urlString),
  );
  return fc.array(pair, { maxLength: declared.length ? 5 : 2 }).map((pairs) => (pairs.length ? `?${pairs.map(([k, v]) => `${enc(k)}=${enc(v)}`).join('&')}` : ''));
}

const WRONG_TYPES = ['text/plain', 'application/x-www-form-urlencoded', 'application/xml', 'application/json; charset=utf-16', 'application/json; charset=koi8-r', 'multipart/form-data', 'multipart/form-data; boundary=nope', 'application/vnd.api+json', '*/*', 'application/octet-stream'];

function jsonBody(schema: Schema | undefined, pools: Pools): fc.Arbitrary<{ text: string; type: string }> {
  const shaped = schema ? fromSchema(schema, pools) : fc.jsonValue({ maxDepth: 3 });
  const text = fc.oneof(
    { weight: 6, arbitrary: shaped.map((v) => JSON.stringify(v) ?? 'null') },
    { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 4 }).map((v) => JSON.stringify(v) ?? 'null') },
    { weight: 1, arbitrary: fc.integer({ min: 100, max: 200_000 }).map((n) => '['.repeat(n) + ']'.repeat(n)) },
    { weight: 1, arbitrary: fc.integer({ min: 100, max: 50_000 }).map((n) => '{"a":'.repeat(n) + '1' + '}'.repeat(n)) },
    { weight: 1, arbitrary: shaped.map((v) => `{"__proto__":{"isAdmin":true,"role":"Admin"},"constructor":{"prototype":{"x":1}},"body":${JSON.stringify(v) ?? 'null'}}`) },
    { weight: 1, arbitrary: shaped.map((v) => (v && typeof v === 'object' && !Array.isArray(v) ? JSON.stringify(v).replace(/^\{/, '{"__proto__":{"polluted":1},') : '{"__proto__":[]}')) },
    { weight: 1, arbitrary: fc.tuple(shaped, deepText).map(([v, d]) => (v && typeof v === 'object' && !Array.isArray(v) ? JSON.stringify(v).replace(/^\{/, `{"deep":${d},`) : d)) },
    { weight: 1, arbitrary: fc.string({ maxLength: 60 }) },
    { weight: 1, arbitrary: fc.integer({ min: 200_000, max: 1_500_000 }).map((n) => `{"name":"${'x'.repeat(n)}"}`) },
  );
  const type = fc.oneof({ weight: 6, arbitrary: fc.constant('application/json') }, { weight: 1, arbitrary: fc.constantFrom(...WRONG_TYPES) });
  return fc.record({ text, type });
}

function multipartBody(schema: Schema, pools: Pools): fc.Arbitrary<{ parts: MultipartPart[] }> {
  const props = schema.properties ?? {};
  const fileNames = Object.entries(props).filter(([, p]) => p.format === 'binary').map(([k]) => k);
  const fieldNames = Object.entries(props).filter(([, p]) => p.format !== 'binary').map(([k]) => k);
  const content = fc.oneof(
    fc.constant(pools.smallCsv),
    fc.constant(pools.emptySqlite),
    fc.constant(pools.oddSqlite),
    fc.uint8Array({ maxLength: 4096 }).map((a) => Buffer.from(a)),
    fc.constant(Buffer.alloc(0)),
    anyString.map((s) => Buffer.from(s)),
  );
  const filePart = fc.record({
    name: fc.oneof(fc.constantFrom(...(fileNames.length ? fileNames : ['file'])), fc.string({ maxLength: 10 })),
    value: content,
    filename: fc.oneof(fc.constantFrom('record.csv', 'tiles.mbtiles', '../../etc/passwd', '', 'ünïcødé 🌊.csv', 'a'.repeat(300), 'x"; name="evil'), fc.string({ maxLength: 20 })),
    contentType: fc.constantFrom('text/csv', 'application/octet-stream', 'application/x-sqlite3', 'application/json', 'image/png'),
  });
  const fieldPart = fc.oneof(
    ...fieldNames.map((k) => fc.record({ name: fc.constant(k), value: stringFor(props[k], pools, k) as fc.Arbitrary<string | Buffer> })),
    fc.record({ name: fc.constant('settings'), value: fc.constant(JSON.stringify(LOGGER_SETTINGS)) as fc.Arbitrary<string | Buffer> }),
    fc.record({ name: fc.oneof(fc.string({ maxLength: 10 }), fc.constantFrom('__proto__', 'settings[]', 'constructor')), value: anyString as fc.Arbitrary<string | Buffer> }),
  );
  // Repeated fields come from drawing the same names more than once.
  return fc.record({ parts: fc.array(fc.oneof(filePart, fieldPart), { maxLength: 8 }) });
}

function requestFor(route: Route, pools: Pools): fc.Arbitrary<FuzzRequest> {
  const pathParams = route.op.parameters.filter((p) => p.in === 'path');
  const pathArb = fc.tuple(...pathParams.map((p) => paramValue(route, p.name, pools))).map((vals) => {
    let p = route.path;
    pathParams.forEach((param, i) => (p = p.replace(`{${param.name}}`, vals[i])));
    return p;
  });
  const content = route.op.requestBody?.content ?? {};
  const mp = content['multipart/form-data'];
  type BodyChoice = { body?: string | Buffer[]; type?: string; excerpt: string };
  const bodies: fc.Arbitrary<BodyChoice>[] = [];
  if (content['application/json'] || !mp) {
    bodies.push(jsonBody(content['application/json']?.schema, pools).map(({ text, type }) => ({ body: text, type, excerpt: `${type} ${text.slice(0, 2400)}${text.length > 2400 ? `… (${text.length} chars)` : ''}` })));
  }
  if (mp) {
    bodies.push(
      multipartBody(mp.schema, pools).map(({ parts }) => {
        const m = multipart(parts);
        const excerpt = `multipart [${parts.map((p) => `${p.name}${p.filename !== undefined ? `(file ${JSON.stringify(p.filename).slice(0, 40)}, ${p.value.length} B)` : `=${JSON.stringify(String(p.value)).slice(0, 80)}`}`).join(', ')}]`;
        return { body: m.body, type: m.contentType, excerpt };
      }),
    );
  }
  const noBody = fc.constant<BodyChoice>({ excerpt: '(no body)' });
  const bodyArb = route.method === 'GET' ? fc.oneof({ weight: 9, arbitrary: noBody }, { weight: 1, arbitrary: bodies[0] }) : route.op.requestBody ? fc.oneof({ weight: 1, arbitrary: noBody }, ...bodies.map((b) => ({ weight: 8, arbitrary: b }))) : fc.oneof({ weight: 3, arbitrary: noBody }, { weight: 1, arbitrary: bodies[0] });
  return fc
    .record({
      path: pathArb,
      query: queryString(route, pools),
      body: bodyArb,
      role: fc.constantFrom(...ROLES),
      withCsrf: fc.oneof({ weight: 9, arbitrary: fc.constant(true) }, { weight: 1, arbitrary: fc.constant(false) }),
    })
    .map(({ path: p, query, body, role, withCsrf }): FuzzRequest => ({
      route,
      role: FRESH_SESSION.has(route.key) ? 'anonymous' : role,
      withCsrf,
      url: p + query,
      headers: body.type ? { 'content-type': body.type } : ({} as Record<string, string>),
      body: body.body,
      excerpt: body.excerpt,
    }));
}

/** An endless supply of requests for one route, drawn by fast-check in small seeded batches. */
function supply(route: Route, pools: Pools, seed: number) {
  const arb = requestFor(route, pools);
  let batch: FuzzRequest[] = [];
  let n = 0;
  return () => {
    if (!batch.length) batch = fc.sample(arb, { numRuns: 20, seed: seed + n++ * 7919 });
    return batch.pop()!;
  };
}

// ---- the run ----------------------------------------------------------------------------------

let server: ServerProcess;
const dir = tempDir('kfield-fuzz-');
let routes: Route[];
let pools: Pools;
const sessions = new Map<Role, HttpSession>();

beforeAll(async () => {
  server = await startServerProcess({
    dbPath: path.join(dir, 'kfield.sqlite'),
    // Failed sign-ins are part of the input; the limiter would otherwise answer 429 to most of them.
    env: { LOGIN_MAX_FAILURES: '1000000', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '1000000', LOGIN_SLOWDOWN_AFTER_PER_ADDRESS: '1000000' },
  });
  const doc = (await send(`${server.baseUrl}/api/openapi.json`)).json<{ paths: Record<string, Record<string, Operation>> }>();
  routes = Object.entries(doc.paths).flatMap(([p, ops]) => Object.entries(ops).map(([m, op]) => ({ method: m.toUpperCase(), path: p, key: `${m.toUpperCase()} ${p}`, op })));
  sessions.set('anonymous', await new HttpSession(server.baseUrl).refreshCsrf());
  for (const role of ROLES.slice(1)) sessions.set(role, await signedIn(server.baseUrl, role as Exclude<Role, 'anonymous'>));

  const admin = sessions.get('Admin')!;
  const lead = sessions.get('Lead')!;
  const target = await admin.post('/api/admin/users', { email: 'fuzz-target@fuzz.kfield.example', name: 'Fuzz target (invented)' });
  if (target.status !== 201) throw new Error(`could not make the throw-away account: ${target.status} ${target.text().slice(0, 300)}`);
  const { sites } = await lead.getJson<{ sites: { id: string }[] }>('/api/sites');
  const siteId = sites[0].id;
  const { wells } = await lead.getJson<{ wells: { id: string }[] }>(`/api/sites/${siteId}/wells`);
  const recordIds: string[] = [];
  const fitIds: string[] = [];
  for (const w of wells.slice(0, 8)) {
    recordIds.push(...(await lead.getJson<{ records: { id: string }[] }>(`/api/wells/${w.id}/records`)).records.map((r) => r.id));
    fitIds.push(...(await lead.getJson<{ fits: { id: string }[] }>(`/api/wells/${w.id}/fits`)).fits.map((f) => f.id));
  }
  const mem = new Database(':memory:');
  const emptySqlite = mem.serialize();
  mem.exec("CREATE TABLE metadata (name text, value text); INSERT INTO metadata VALUES ('format', 'pbf'), ('name', '🌊'); CREATE TABLE tiles (zoom_level integer, tile_column integer, tile_row integer, tile_data blob); INSERT INTO tiles VALUES (99, -1, 'x', x'1f8b00');");
  const oddSqlite = mem.serialize();
  mem.close();
  const targetId = target.json<{ id: string }>().id;
  pools = {
    byParam: {
      siteId: [siteId],
      wellId: wells.map((w) => w.id),
      recordId: recordIds,
      fitId: fitIds,
      userId: [targetId],
      code: ['32632', '4326', '3857', '27700', '2056'],
      z: ['0', '5', '14', '22'],
      x: ['0', '17', '4100'],
      y: ['0', '11', '2800'],
      fontstack: ['Roboto Flex Regular', 'Roboto Flex Bold', 'Roboto Flex Regular,Roboto Flex Bold'],
      range: ['0-255', '256-511', '65280-65535'],
    },
    anyIds: [siteId, ...wells.slice(0, 3).map((w) => w.id), ...recordIds.slice(0, 3), ...fitIds.slice(0, 3), targetId],
    emails: [...ROLES.slice(1).map((r) => demoEmail(r as 'Lead')), 'fuzz-target@fuzz.kfield.example'],
    smallCsv: loggerCsv(400),
    emptySqlite,
    oddSqlite,
  };
}, 180_000);

afterAll(async () => {
  await server?.stop();
  fs.rmSync(dir, { recursive: true, force: true });
});

async function fire(req: FuzzRequest): Promise<{ status: number; message: string }> {
  const session = FRESH_SESSION.has(req.route.key) ? await new HttpSession(server.baseUrl).refreshCsrf() : sessions.get(req.role)!;
  const a = await session.request(req.route.method, req.url, { body: req.body, headers: req.headers, withCsrf: req.withCsrf, timeoutMs: REQUEST_TIMEOUT_MS });
  return { status: a.status, message: a.text().slice(0, 300) };
}

describe('a fuzzer over every route of the OpenAPI document', () => {
  it(`answers ${TARGET_REQUESTS.toLocaleString('en-US')} generated requests without a 5xx and stays healthy`, async () => {
    const usable = routes.filter((r) => !EXCLUDED.has(r.key));
    expect(usable.length).toBeGreaterThan(50);
    const supplies = usable.map((r, i) => supply(r, pools, SEED + i * 104_729));
    const failures: Failure[] = [];
    const healthFailures: string[] = [];
    const perRoute = new Map<string, { sent: number; statuses: Map<number, number> }>();
    const started = performance.now();
    let next = 0;
    let done = 0;
    let skipped = 0;
    let cutOversized = 0;

    const health = async () => {
      const t = performance.now();
      try {
        const a = await send(`${server.baseUrl}/api/health`, { timeoutMs: 5000 });
        if (a.status !== 200) healthFailures.push(`after ${done} requests: health answered ${a.status} ${a.text().slice(0, 200)}`);
      } catch (e) {
        healthFailures.push(`after ${done} requests: health did not answer (${(e as Error).message}) in ${(performance.now() - t).toFixed(0)} ms`);
      }
    };

    const worker = async () => {
      while (next < TARGET_REQUESTS && performance.now() - started < TIME_BUDGET_MS && healthFailures.length < 3) {
        const i = next++;
        const req = supplies[i % supplies.length]();
        const stats = perRoute.get(req.route.key) ?? { sent: 0, statuses: new Map<number, number>() };
        perRoute.set(req.route.key, stats);
        let outcome: { status: number | string; message: string };
        try {
          outcome = await fire(req);
        } catch (e) {
          const message = (e as Error).message;
          // The client refusing to send a header or path is not the server's answer.
          if ((e as NodeJS.ErrnoException).code === 'ERR_INVALID_CHAR' || /unescaped characters|Invalid character/.test(message)) {
            skipped++;
            next--;
            continue;
          }
          const bodyBytes = typeof req.body === 'string' ? Buffer.byteLength(req.body) : (req.body ?? []).reduce((n, b) => n + b.length, 0);
          // Over a limit, Node (431), the JSON parser (413) or the drain of an unread body (1 MB, then
          // Connection: close) answers and closes while we are still sending: the client may see the
          // reset before the answer. Counted, not a failure, as long as health holds. Only a route that
          // takes multipart streams any size to its own limit, so there a reset is a failure.
          const takesMultipart = Boolean(req.route.op.requestBody?.content?.['multipart/form-data']);
          if (/ECONNRESET|EPIPE/.test(message) && (req.url.length > NODE_HEADER_LIMIT - HEADER_ROOM || (bodyBytes > JSON_LIMIT && !(takesMultipart && req.headers['content-type']?.startsWith('multipart/'))))) {
            cutOversized++;
            next--;
            continue;
          }
          outcome = { status: 'no answer', message };
        }
        stats.sent++;
        if (typeof outcome.status === 'number') stats.statuses.set(outcome.status, (stats.statuses.get(outcome.status) ?? 0) + 1);
        if (typeof outcome.status !== 'number' || outcome.status >= 500) {
          failures.push({ key: req.route.key, role: req.role, url: req.url.slice(0, 200), excerpt: `${req.withCsrf ? '' : '[no CSRF] '}${req.excerpt}`, status: outcome.status, message: outcome.message, req });
        }
        if (++done % HEALTH_EVERY === 0) await health();
      }
    };
    await Promise.all(Array.from({ length: CONCURRENCY }, worker));
    await health();
    const seconds = (performance.now() - started) / 1000;

    // Each distinct failing route once more, alone, for the server's own account of the error.
    const seen = new Set<string>();
    for (const f of failures) {
      if (seen.has(f.key) || seen.size >= 25) continue;
      seen.add(f.key);
      const before = server.output().length;
      await fire(f.req).catch(() => undefined);
      await new Promise((r) => setTimeout(r, 100));
      f.serverLog = server.output().slice(before).slice(0, 1500) || undefined;
    }

    console.log(`fuzz (seed ${SEED}): ${done} requests over ${usable.length} routes in ${seconds.toFixed(0)} s (${(done / seconds).toFixed(0)}/s), ${skipped} not sendable, ${cutOversized} over a size limit cut off by the server; ${failures.length} answered 5xx or not at all; ${healthFailures.length} health failures`);
    for (const [key, s] of [...perRoute].sort()) {
      console.log(`  ${key.padEnd(52)} ${String(s.sent).padStart(4)}  ${[...s.statuses].sort((a, b) => a[0] - b[0]).map(([st, n]) => `${st}×${n}`).join(' ')}`);
    }
    for (const f of failures.slice(0, 60)) console.log(`  FAIL ${f.key} as ${f.role}: ${f.url}\n       body: ${f.excerpt}\n       answer: ${f.status} ${f.message}${f.serverLog ? `\n       server: ${f.serverLog.replace(/\n/g, '\n               ')}` : ''}`);
    for (const h of healthFailures) console.log(`  HEALTH ${h}`);

    expect(healthFailures).toEqual([]);
    expect(failures.map((f) => `${f.status} ${f.key} as ${f.role}: ${f.url} ${f.excerpt.slice(0, 120)} → ${f.message.slice(0, 120)}`)).toEqual([]);
    expect(done, `only ${done} requests within ${TIME_BUDGET_MS / 1000} s`).toBeGreaterThanOrEqual(TARGET_REQUESTS);
  });
});
