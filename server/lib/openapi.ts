import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import type { MountedRoute } from './route';

type Json = Record<string, unknown>;

const schemaOf = (s: z.ZodType, io: 'input' | 'output'): Json =>
  z.toJSONSchema(s, { io, unrepresentable: 'any', target: 'draft-2020-12' }) as Json;

const toOpenApiPath = (p: string) => p.replace(/:([A-Za-z0-9_]+)/g, '{$1}');

function parameters(def: MountedRoute): Json[] {
  const out: Json[] = [];
  for (const [where, schema] of [['path', def.params], ['query', def.query]] as const) {
    if (!schema) continue;
    const js = schemaOf(schema, 'input') as { properties?: Record<string, Json>; required?: string[] };
    for (const [name, prop] of Object.entries(js.properties ?? {})) {
      out.push({ name, in: where, required: where === 'path' || (js.required ?? []).includes(name), schema: prop });
    }
  }
  // Path parameters without a schema still need declaring.
  for (const m of def.path.matchAll(/:([A-Za-z0-9_]+)/g)) {
    if (!out.some((p) => p.name === m[1] && p.in === 'path')) out.push({ name: m[1], in: 'path', required: true, schema: { type: 'string' } });
  }
  return out;
}

function security(def: MountedRoute): string {
  const r = def.policy.rule;
  if (r.kind === 'public') return 'Anyone';
  if (r.kind === 'signedIn') return 'Any signed-in user';
  if (r.kind === 'admin') return 'Instance Admin';
  if (r.kind === 'site') return `Site roles: ${r.roles.join(', ')} (and Admin)`;
  return 'Nobody';
}

/** OpenAPI 3.1 from the mounted routes and the shared zod schemas. */
export function buildOpenApi(routes: MountedRoute[], version: string): Json {
  const paths: Record<string, Record<string, Json>> = {};
  for (const def of routes) {
    const p = (paths[toOpenApiPath(def.path)] ??= {});
    const responses: Record<string, Json> = {};
    for (const [status, r] of Object.entries(def.responses)) {
      const media = r.contentType ?? 'application/json';
      responses[status] = r.schema
        ? { description: r.description, content: { [media]: { schema: schemaOf(r.schema, 'output') } } }
        : r.contentType
          ? { description: r.description, content: { [media]: { schema: { type: 'string', format: 'binary' } } } }
          : { description: r.description };
    }
    if (def.policy.rule.kind !== 'public') responses['401'] ??= { description: 'Signed out', content: { 'application/json': { schema: schemaOf(errorBodySchema, 'output') } } };
    if (def.method !== 'get') responses['403'] ??= { description: 'Missing CSRF token or not allowed', content: { 'application/json': { schema: schemaOf(errorBodySchema, 'output') } } };
    p[def.method] = {
      operationId: `${def.method}${def.path.replace(/[/:{}-]+(.)?/g, (_m, c: string | undefined) => (c ? c.toUpperCase() : ''))}`,
      summary: def.summary,
      tags: [def.tag],
      description: `Who may call it: ${security(def)}.`,
      parameters: parameters(def),
      ...(def.body ? { requestBody: { required: true, content: { 'application/json': { schema: schemaOf(def.body, 'input') } } } } : {}),
      ...(!def.body && def.requestBodies
        ? { requestBody: { required: true, content: Object.fromEntries(Object.entries(def.requestBodies).map(([media, s]) => [media, { schema: schemaOf(s, 'input') }])) } }
        : {}),
      responses,
    };
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Kfield API',
      version,
      description:
        'Hydraulic conductivity of monitoring-well networks. Every state-changing call needs the x-csrf-token header from GET /api/auth/csrf. Errors share one shape: { error: { code, message, fields? } }.',
    },
    components: {
      securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'kfield.sid' }, csrf: { type: 'apiKey', in: 'header', name: 'x-csrf-token' } },
    },
    security: [{ session: [] }],
    paths,
  };
}
