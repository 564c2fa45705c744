// @vitest-environment happy-dom
import { act } from 'react';
import { createRoot } from 'react-dom/client';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { Providers } from '@/app/providers';
import { createQueryClient } from '@/app/query-client';
import { createRoutes } from '@/app/router';
import { setCsrfToken } from '@/lib/api-client';
import { reportCaughtError } from '@/lib/errors';
import { jsonResponse, stubApi, waitFor } from './helpers';

let unmount: (() => void) | null = null;

async function renderApp(path: string) {
  const queryClient = createQueryClient();
  const router = createMemoryRouter(createRoutes(queryClient), { initialEntries: [path] });
  const container = document.createElement('div');
  document.body.appendChild(container);
  const root = createRoot(container, { onCaughtError: reportCaughtError });
  await act(async () => {
    root.render(
      <Providers queryClient={queryClient}>
        <RouterProvider router={router} />
      </Providers>,
    );
  });
  unmount = () => {
    root.unmount();
    container.remove();
  };
  return { container, router };
}

const viewer = { id: 'u2', email: 'viewer@example.test', name: 'Vic Viewer', isAdmin: false };
const site = {
  id: 's1',
  name: 'Former fuel depot',
  description: 'Fictional demo site',
  epsgCode: 32632,
  crsName: 'WGS 84 / UTM zone 32N',
  displayUnits: 'SI',
  hydroUnits: [],
  myRole: 'Viewer',
  memberCount: 2,
  basemapId: null,
  basemapStyleUrl: '/tiles/style.json',
  createdAt: '2025-01-01T00:00:00.000Z',
};

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await act(async () => unmount?.());
  unmount = null;
  vi.unstubAllGlobals();
});

describe('routing', () => {
  it('sends a signed-out visitor to sign-in and keeps where they were going in ?next=', async () => {
    stubApi({ 'GET /api/auth/me': () => jsonResponse({ error: { code: 'UNAUTHENTICATED', message: 'Sign in' } }, 401) });
    const { router, container } = await renderApp('/sites/s1/members');

    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/sites/s1/members')}`);
    await waitFor(() => expect(container.querySelector('h1')?.textContent).toBe('Sign in to Kfield'));
    expect(container.querySelector('a[href="/forgot-password"]')?.textContent).toBe('Forgot password?');
  });

  it('shows a member the site without the Lead-only controls, and no Admin links', async () => {
    const server = stubApi({
      'GET /api/auth/me': () => jsonResponse({ user: viewer }),
      'GET /api/sites': () => jsonResponse({ sites: [site] }),
      'GET /api/sites/s1': () => jsonResponse(site),
      // The top bar's Checks link counts the fits awaiting the person's check.
      'GET /api/checks': () => jsonResponse({ items: [] }),
      'GET /api/sites/s1/members': () =>
        jsonResponse({
          members: [
            { userId: 'u1', name: 'Lena Lead', email: 'lead@example.test', role: 'Lead', disabled: false, since: '2025-01-01T00:00:00.000Z' },
            { userId: 'u2', name: 'Vic Viewer', email: 'viewer@example.test', role: 'Viewer', disabled: false, since: '2025-01-02T00:00:00.000Z' },
          ],
          invitations: [],
        }),
    });
    const { container } = await renderApp('/sites/s1/members');

    await waitFor(() => expect(container.textContent).toContain('Lena Lead'));
    const labels = Array.from(container.querySelectorAll('label')).map((l) => l.textContent ?? '');
    expect(labels.filter((text) => text.startsWith('Role for'))).toEqual([]);
    expect(Array.from(container.querySelectorAll('button')).map((b) => b.textContent)).not.toContain('Remove');
    expect(container.textContent).not.toContain('Invite someone');
    expect(container.querySelector('a[href="/admin/users"]')).toBeNull();
    expect(container.textContent).toContain('results support, and do not replace, the judgement of a licensed geologist or engineer');
    expect(server.unexpected).toEqual([]);
  });

  it('shows a site the person cannot see as not found, inside the app shell', async () => {
    stubApi({
      'GET /api/auth/me': () => jsonResponse({ user: viewer }),
      'GET /api/sites': () => jsonResponse({ sites: [] }),
      'GET /api/sites/nope': () => jsonResponse({ error: { code: 'NOT_FOUND', message: 'Site not found' } }, 404),
      'GET /api/sites/nope/members': () => jsonResponse({ error: { code: 'NOT_FOUND', message: 'Site not found' } }, 404),
    });
    const { container } = await renderApp('/sites/nope');

    await waitFor(() => expect(container.querySelector('h1')?.textContent).toBe('Site not found'));
    expect(container.textContent).toContain('Sign out');
  });
});
