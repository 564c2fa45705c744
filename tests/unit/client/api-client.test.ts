// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, setCsrfToken } from '@/lib/api-client';
import { login } from '@/features/auth/api';
import { z } from 'zod';
import { jsonResponse, stubApi } from './helpers';

const okBody = z.object({ ok: z.literal(true) });

function headerOf(init: RequestInit | undefined, name: string): string | undefined {
  return (init?.headers as Record<string, string> | undefined)?.[name];
}

beforeEach(() => setCsrfToken(null));
afterEach(() => vi.unstubAllGlobals());

describe('api client', () => {
  it('fetches the CSRF token once and sends it with every state-changing request', async () => {
    const server = stubApi({
      'GET /api/auth/csrf': () => jsonResponse({ csrfToken: 'tok-1' }),
      'POST /api/things': () => jsonResponse({ ok: true }),
      'DELETE /api/things/1': () => new Response(null, { status: 204 }),
    });

    await api.post('/api/things', { a: 1 }, okBody);
    await api.delete('/api/things/1');

    expect(server.calls.map((c) => `${c.method} ${c.url}`)).toEqual([
      'GET /api/auth/csrf',
      'POST /api/things',
      'DELETE /api/things/1',
    ]);
    expect(headerOf(server.calls[1].init, 'x-csrf-token')).toBe('tok-1');
    expect(headerOf(server.calls[2].init, 'x-csrf-token')).toBe('tok-1');
    expect(server.calls.every((c) => c.init?.credentials === 'same-origin')).toBe(true);
  });

  it('does not send a CSRF token with a GET', async () => {
    const server = stubApi({ 'GET /api/things': () => jsonResponse({ ok: true }) });
    await api.get('/api/things', okBody);
    expect(server.calls).toHaveLength(1);
    expect(headerOf(server.calls[0].init, 'x-csrf-token')).toBeUndefined();
  });

  it('refetches the token and retries once after CSRF_INVALID', async () => {
    let tokenCalls = 0;
    const server = stubApi({
      'GET /api/auth/csrf': () => jsonResponse({ csrfToken: `tok-${++tokenCalls}` }),
      'POST /api/things': (init) =>
        headerOf(init, 'x-csrf-token') === 'tok-2'
          ? jsonResponse({ ok: true })
          : jsonResponse({ error: { code: 'CSRF_INVALID', message: 'Stale token' } }, 403),
    });

    await expect(api.post('/api/things', {}, okBody)).resolves.toEqual({ ok: true });
    expect(server.calls.map((c) => `${c.method} ${c.url}`)).toEqual([
      'GET /api/auth/csrf',
      'POST /api/things',
      'GET /api/auth/csrf',
      'POST /api/things',
    ]);
  });

  it('gives up after one retry when the token is refused again', async () => {
    const server = stubApi({
      'GET /api/auth/csrf': () => jsonResponse({ csrfToken: 'tok' }),
      'POST /api/things': () => jsonResponse({ error: { code: 'CSRF_INVALID', message: 'Stale token' } }, 403),
    });

    await expect(api.post('/api/things', {}, okBody)).rejects.toMatchObject({ status: 403, code: 'CSRF_INVALID' });
    expect(server.calls.filter((c) => c.method === 'POST')).toHaveLength(2);
  });

  it('does not retry other 403s', async () => {
    const server = stubApi({
      'GET /api/auth/csrf': () => jsonResponse({ csrfToken: 'tok' }),
      'POST /api/things': () => jsonResponse({ error: { code: 'FORBIDDEN', message: 'Leads only' } }, 403),
    });
    await expect(api.post('/api/things', {}, okBody)).rejects.toMatchObject({ code: 'FORBIDDEN' });
    expect(server.calls.filter((c) => c.method === 'POST')).toHaveLength(1);
  });

  it('turns the error body into an ApiError with its code, message, fields and Retry-After', async () => {
    stubApi({
      'GET /api/auth/csrf': () => jsonResponse({ csrfToken: 'tok' }),
      'POST /api/sites': () =>
        jsonResponse(
          { error: { code: 'VALIDATION', message: 'Check the form', fields: { epsgCode: 'Unknown EPSG code 1234' } } },
          400,
          { 'retry-after': '30' },
        ),
    });

    const error = await api.post('/api/sites', {}, okBody).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({
      status: 400,
      code: 'VALIDATION',
      message: 'Check the form',
      fields: { epsgCode: 'Unknown EPSG code 1234' },
      retryAfterSeconds: 30,
    });
  });

  it('still gives an ApiError when the error body is not JSON', async () => {
    stubApi({ 'GET /api/health': () => new Response('<h1>Bad gateway</h1>', { status: 502, statusText: 'Bad Gateway' }) });
    await expect(api.get('/api/health', okBody)).rejects.toMatchObject({ status: 502, code: 'HTTP_502' });
  });

  it('reports an unreachable server as NETWORK_ERROR', async () => {
    vi.stubGlobal('fetch', vi.fn().mockRejectedValue(new TypeError('Failed to fetch')));
    await expect(api.get('/api/health', okBody)).rejects.toMatchObject({ status: 0, code: 'NETWORK_ERROR' });
  });

  it('refuses an answer that does not match the schema', async () => {
    stubApi({ 'GET /api/things': () => jsonResponse({ ok: 'yes' }) });
    await expect(api.get('/api/things', okBody)).rejects.toMatchObject({ code: 'BAD_RESPONSE' });
  });

  it('uses the fresh token from the sign-in answer for the next request', async () => {
    const server = stubApi({
      'GET /api/auth/csrf': () => jsonResponse({ csrfToken: 'before-sign-in' }),
      'POST /api/auth/login': () =>
        jsonResponse({ user: { id: 'u1', email: 'a@example.test', name: 'A', isAdmin: false }, csrfToken: 'after-sign-in' }),
      'POST /api/things': () => jsonResponse({ ok: true }),
    });

    await login({ email: 'a@example.test', password: 'correct horse battery' });
    await api.post('/api/things', {}, okBody);

    const last = server.calls.at(-1);
    expect(headerOf(last?.init, 'x-csrf-token')).toBe('after-sign-in');
    expect(server.calls.filter((c) => c.url === '/api/auth/csrf')).toHaveLength(1);
  });
});
