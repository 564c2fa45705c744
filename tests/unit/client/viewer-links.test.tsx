// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { act } from 'react';
import { setCsrfToken } from '@/lib/api-client';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { readAddresses } from '@/features/viewer-links/components/addresses';
import { CreateViewerLinkForm } from '@/features/viewer-links/components/create-viewer-link-form';
import { CreatedLinkPanel } from '@/features/viewer-links/components/created-link-panel';
import { layerWords, viewerLinkStatus } from '@/features/viewer-links/components/link-status';
import { ViewerLinksTable } from '@/features/viewer-links/components/viewer-links-table';
import type { ViewerLink, ViewerLinkCreated } from '@shared/schemas/viewer-links';
import { cleanup, click, getButton, getByLabel, jsonResponse, render, stubApi, type, waitFor } from './helpers';

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await cleanup();
  vi.unstubAllGlobals();
});

const NOW = Date.parse('2026-03-10T12:00:00.000Z');
const day = 86_400_000;
const iso = (t: number) => new Date(t).toISOString();

function link(over: Partial<ViewerLink> = {}): ViewerLink {
  return {
    id: 'l1',
    siteId: 's1',
    label: 'County water board',
    layers: { wells: true, surface: false, surfaceSettings: null, outlines: false, sketches: false },
    showNames: false,
    showConstruction: false,
    createdBy: 'Lena Lead',
    createdAt: iso(NOW - 2 * day),
    expiresAt: iso(NOW + 28 * day),
    revokedAt: null,
    lastViewedAt: null,
    viewCount: 0,
    ...over,
  };
}

/** A URL as the server makes it: PUBLIC_URL + /view/ + 43 base64url characters. */
const URL_SHOWN = 'http://localhost:3000/view/AbCdEfGhIjKlMnOpQrStUvWxYz0123456789-_abcde';

describe('viewer link status', () => {
  it('is Active before the expiry, Expired from the expiry on, and Revoked once revoked whatever the date', () => {
    expect(viewerLinkStatus(link(), NOW)).toBe('Active');
    expect(viewerLinkStatus(link({ expiresAt: iso(NOW) }), NOW)).toBe('Expired');
    expect(viewerLinkStatus(link({ expiresAt: iso(NOW - day) }), NOW)).toBe('Expired');
    expect(viewerLinkStatus(link({ revokedAt: iso(NOW - day) }), NOW)).toBe('Revoked');
    expect(viewerLinkStatus(link({ revokedAt: iso(NOW - 3 * day), expiresAt: iso(NOW - day) }), NOW)).toBe('Revoked');
  });

  it('names the layers in the K map’s order', () => {
    expect(layerWords({ wells: true, surface: true, outlines: false, sketches: true })).toEqual(['Wells', 'K surface', 'Capture sketches']);
  });
});

describe('addresses typed into one box', () => {
  it('splits on commas, semicolons, spaces and new lines and drops repeats ignoring case', () => {
    expect(readAddresses(' a@example.test, b@example.test;c@example.test\n\nd@example.test  A@EXAMPLE.test ')).toEqual({
      addresses: ['a@example.test', 'b@example.test', 'c@example.test', 'd@example.test'],
      error: null,
    });
  });

  it('names each address that is not one', () => {
    expect(readAddresses('a@example.test bob@ nobody').error).toBe('“bob@”, “nobody” are not valid e-mail addresses');
    expect(readAddresses('bob@').error).toBe('“bob@” is not a valid e-mail address');
  });

  it('asks for at least one and at most 20 (VIEWER_LINK_MAX_ADDRESSES)', () => {
    expect(readAddresses(' \n, ').error).toBe('Give at least one address');
    const twenty = Array.from({ length: 20 }, (_, i) => `p${i}@example.test`);
    expect(readAddresses(twenty.join(',')).error).toBeNull();
    expect(readAddresses([...twenty, 'p20@example.test'].join(',')).error).toBe('At most 20 addresses at a time (21 given)');
  });
});

describe('viewer links list', () => {
  it('lists active, expired and revoked links with their status, greys the ended ones and offers Revoke only for the active one', async () => {
    vi.useFakeTimers({ now: NOW, toFake: ['Date'] });
    stubApi({
      'GET /api/sites/s1/viewer-links': () =>
        jsonResponse({
          links: [
            link({ id: 'a', label: 'Regulator', lastViewedAt: iso(NOW - day), viewCount: 3, showNames: true }),
            link({ id: 'e', label: 'Old neighbour', expiresAt: iso(NOW - day) }),
            link({ id: 'r', label: 'Consultant', revokedAt: iso(NOW - day) }),
          ],
        }),
    });
    const { container } = await render(
      <QueryBoundary>
        <ViewerLinksTable siteId="s1" />
      </QueryBoundary>,
    );
    const list = await waitFor(() => {
      const el = container.querySelector('[data-testid="viewer-links-list"] tbody');
      if (!el) throw new Error('no list yet');
      return el;
    });
    vi.useRealTimers();
    const rows = Array.from(list.querySelectorAll('tr'));
    expect(rows.map((r) => r.getAttribute('data-status'))).toEqual(['Active', 'Expired', 'Revoked']);
    expect(rows.map((r) => r.classList.contains('opacity-60'))).toEqual([false, true, true]);
    expect(rows[0].textContent).toContain('Names');
    expect(rows[1].textContent).toContain('(expired)');
    expect(rows[1].textContent).toContain('never');
    expect(rows.map((r) => r.querySelector('button')?.textContent ?? null)).toEqual(['Revoke', null, null]);
  });

  it('says what a viewer link is when the site has none', async () => {
    stubApi({ 'GET /api/sites/s1/viewer-links': () => jsonResponse({ links: [] }) });
    const { container } = await render(
      <QueryBoundary>
        <ViewerLinksTable siteId="s1" />
      </QueryBoundary>,
    );
    await waitFor(() => expect(container.querySelector('[data-testid="viewer-links-list"]')?.textContent).toContain('without a Kfield account'));
  });

  it('revokes after the question and tells the page which link ended', async () => {
    const server = stubApi({
      'GET /api/sites/s1/viewer-links': () => jsonResponse({ links: [link({ expiresAt: iso(Date.now() + day) })] }),
      'DELETE /api/viewer-links/l1': () => new Response(null, { status: 204 }),
    });
    const onRevoked = vi.fn();
    const { container } = await render(
      <QueryBoundary>
        <ViewerLinksTable siteId="s1" onRevoked={onRevoked} />
      </QueryBoundary>,
    );
    await click(await waitFor(() => getButton(container, 'Revoke the link for County water board')));
    await click(getButton(container, 'Revoke'));
    await waitFor(() => expect(onRevoked).toHaveBeenCalledWith('l1'));
    expect(server.calls.filter((c) => c.method === 'DELETE')).toHaveLength(1);
  });
});

describe('making a viewer link', () => {
  it('sends the defaults (30 days, wells only, no names or construction) and hands the URL to the page only', async () => {
    const created: ViewerLinkCreated = { ...link(), url: URL_SHOWN };
    const server = stubApi({
      'POST /api/sites/s1/viewer-links': () => jsonResponse(created, 201),
      'GET /api/sites/s1/viewer-links': () => jsonResponse({ links: [link()] }),
    });
    const onCreated = vi.fn();
    const { container, queryClient } = await render(<CreateViewerLinkForm siteId="s1" onCreated={onCreated} />);

    await type(getByLabel(container, 'Label'), 'County water board');
    await click(getButton(container, 'Make viewer link'));

    await waitFor(() => expect(onCreated).toHaveBeenCalledWith(created));
    const post = server.calls.find((c) => c.method === 'POST');
    expect(JSON.parse(String(post?.init?.body))).toEqual({
      label: 'County water board',
      expiresInDays: 30,
      layers: { wells: true, surface: false, outlines: false, sketches: false, surfaceSettings: { power: 2 } },
      showNames: false,
      showConstruction: false,
    });
    const cached = JSON.stringify([
      ...queryClient.getQueryCache().getAll().map((q) => q.state.data),
      ...queryClient.getMutationCache().getAll().map((m) => m.state.data),
    ]);
    expect(cached).not.toContain(URL_SHOWN);
  });

  it('refuses a link without a label or without any layer before asking the server', async () => {
    const server = stubApi({});
    const { container } = await render(<CreateViewerLinkForm siteId="s1" onCreated={() => {}} />);
    await click(getByLabel(container, 'Wells by Well K'));
    await click(getButton(container, 'Make viewer link'));
    await waitFor(() => expect(container.textContent).toContain('Label is required'));
    expect(container.textContent).toContain('Choose at least one layer');
    expect(server.calls).toHaveLength(0);

    await click(getByLabel(container, 'Outlines'));
    await waitFor(() => expect(container.textContent).not.toContain('Choose at least one layer'));
  });

  it('shows the server’s message under the outline it names', async () => {
    const outline = { id: '7b1e6d1e-8a4e-4c53-9d0e-0f3c2a9b1c11', siteId: 's1', name: 'Plume 2025', geometry: { type: 'Polygon', coordinates: [[[0, 0], [1, 0], [1, 1], [0, 0]]] }, areaM2: 1, createdBy: 'Lena Lead', createdById: 'u1', createdAt: iso(NOW), updatedAt: iso(NOW) };
    stubApi({
      'GET /api/sites/s1/outlines': () => jsonResponse({ outlines: [outline] }),
      'POST /api/sites/s1/viewer-links': () =>
        jsonResponse({ error: { code: 'VALIDATION', message: 'No such outline on this site', fields: { 'layers.surfaceSettings.outlineId': 'No such outline on this site' } } }, 400),
    });
    const { container } = await render(<CreateViewerLinkForm siteId="s1" onCreated={() => {}} />);
    await type(getByLabel(container, 'Label'), 'Regulator');
    await click(getByLabel(container, 'K surface'));
    const select = await waitFor(() => {
      const el = getByLabel(container, 'Clip to outline') as HTMLSelectElement;
      expect(el.options.length).toBe(2);
      return el;
    });
    await act(async () => {
      select.value = outline.id;
      select.dispatchEvent(new Event('change', { bubbles: true }));
    });
    await click(getButton(container, 'Make viewer link'));
    await waitFor(() => expect(document.getElementById(`${select.id}-error`)?.textContent).toBe('No such outline on this site'));
  });
});

describe('the new link’s panel', () => {
  const created: ViewerLinkCreated = { ...link(), url: URL_SHOWN };

  it('e-mails the URL it was shown to every address and says how many messages were queued', async () => {
    const server = stubApi({ 'POST /api/viewer-links/l1/email': () => jsonResponse({ queued: 2, held: [] }) });
    const { container } = await render(<CreatedLinkPanel link={created} showOutboxHint onDone={() => {}} />);
    expect((getByLabel(container, 'Viewer link URL') as HTMLInputElement).value).toBe(URL_SHOWN);
    expect(container.textContent).toContain('Kfield cannot show it again');

    await type(getByLabel(container, 'E-mail addresses'), 'ann@example.test,\nben@example.test');
    await click(getButton(container, 'Send link'));

    await waitFor(() => expect(document.body.textContent).toContain('Queued 2 messages — see Admin → Outbox'));
    const post = server.calls.find((c) => c.method === 'POST');
    expect(JSON.parse(String(post?.init?.body))).toEqual({ to: ['ann@example.test', 'ben@example.test'], url: URL_SHOWN });
  });

  it('leaves the Admin hint out for a Lead who is not an admin, and names a bad address without sending', async () => {
    const server = stubApi({ 'POST /api/viewer-links/l1/email': () => jsonResponse({ queued: 1, held: [] }) });
    const { container } = await render(<CreatedLinkPanel link={created} showOutboxHint={false} onDone={() => {}} />);
    const box = getByLabel(container, 'E-mail addresses');
    await type(box, 'ann@example');
    await click(getButton(container, 'Send link'));
    await waitFor(() => expect(container.textContent).toContain('“ann@example” is not a valid e-mail address'));
    expect(server.calls).toHaveLength(0);

    await type(box, 'ann@example.test');
    await click(getButton(container, 'Send link'));
    await waitFor(() => expect(document.body.textContent).toContain('Queued 1 message;'));
    expect(document.body.textContent).not.toContain('Outbox');
  });

  it('names the addresses the mail limits held back', async () => {
    stubApi({ 'POST /api/viewer-links/l1/email': () => jsonResponse({ queued: 1, held: ['ben@example.test'] }) });
    const { container } = await render(<CreatedLinkPanel link={created} showOutboxHint onDone={() => {}} />);
    await type(getByLabel(container, 'E-mail addresses'), 'ann@example.test ben@example.test');
    await click(getButton(container, 'Send link'));
    await waitFor(() => expect(document.body.textContent).toContain('Queued 1 message — see Admin → Outbox. Not sent now to ben@example.test:'));
  });

  it('says how to copy by hand when the browser refuses the clipboard', async () => {
    stubApi({});
    vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText: () => Promise.reject(new Error('NotAllowedError')) } });
    const { container } = await render(<CreatedLinkPanel link={created} showOutboxHint={false} onDone={() => {}} />);
    await click(getButton(container, 'Copy'));
    await waitFor(() => expect(container.textContent).toContain('The browser did not let Kfield copy'));
  });
});
