// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { setCsrfToken } from '@/lib/api-client';
import { CreateSiteForm } from '@/features/sites/components/create-site-form';
import { cleanup, click, getButton, getByLabel, jsonResponse, render, stubApi, type, waitFor } from './helpers';

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await cleanup();
  vi.unstubAllGlobals();
});

function messagesFor(input: HTMLElement): string {
  const ids = input.getAttribute('aria-describedby')?.split(' ') ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent ?? '').join(' | ');
}

const crs32632 = {
  code: 32632,
  name: 'WGS 84 / UTM zone 32N',
  unit: 'metre',
  area: 'Between 6°E and 12°E, northern hemisphere',
  bbox: [6, 0, 12, 84],
};

describe('new site form', () => {
  it('names the CRS as the EPSG code is typed, and says when a code is unknown', async () => {
    stubApi({
      'GET /api/crs/32632': () => jsonResponse(crs32632),
      'GET /api/crs/4999': () => jsonResponse({ error: { code: 'NOT_FOUND', message: 'Unknown EPSG code' } }, 404),
    });
    const { container } = await render(<CreateSiteForm onCreated={() => {}} onCancel={() => {}} />);
    const epsg = getByLabel(container, 'EPSG code');

    await type(epsg, '32632');
    await waitFor(() => expect(messagesFor(epsg)).toContain('WGS 84 / UTM zone 32N'));

    await type(epsg, '4999');
    await waitFor(() => expect(messagesFor(epsg)).toContain('No coordinate reference system is known by EPSG:4999'));
  });

  it('shows the server’s field message beside the EPSG code and keeps what was typed', async () => {
    stubApi({
      'GET /api/crs/5555': () => jsonResponse({ ...crs32632, code: 5555, name: 'Some CRS' }),
      'POST /api/sites': () =>
        jsonResponse(
          { error: { code: 'VALIDATION', message: 'Check the form', fields: { epsgCode: 'Unknown EPSG code 5555' } } },
          400,
        ),
    });
    const onCreated = vi.fn();
    const { container } = await render(<CreateSiteForm onCreated={onCreated} onCancel={() => {}} />);

    await type(getByLabel(container, 'Site name'), 'Former fuel depot');
    await type(getByLabel(container, 'EPSG code'), '5555');
    await click(getButton(container, 'Create site'));

    await waitFor(() => expect(messagesFor(getByLabel(container, 'EPSG code'))).toContain('Unknown EPSG code 5555'));
    expect((getByLabel(container, 'Site name') as HTMLInputElement).value).toBe('Former fuel depot');
    expect(onCreated).not.toHaveBeenCalled();
  });

  it('sends hydrostratigraphic units as a list of names and refuses a repeated one beside its row', async () => {
    const site = {
      id: 's1',
      name: 'Former fuel depot',
      description: '',
      epsgCode: 32632,
      crsName: 'WGS 84 / UTM zone 32N',
      displayUnits: 'US',
      hydroUnits: ['Sand and gravel', 'Silt'],
      myRole: 'Lead',
      memberCount: 1,
      basemapId: null,
      basemapStyleUrl: '/tiles/style.json',
      createdAt: '2025-01-01T00:00:00.000Z',
    };
    const server = stubApi({
      'GET /api/crs/32632': () => jsonResponse(crs32632),
      'POST /api/sites': () => jsonResponse(site, 201),
      'GET /api/sites': () => jsonResponse({ sites: [site] }),
    });
    const onCreated = vi.fn();
    const { container } = await render(<CreateSiteForm onCreated={onCreated} onCancel={() => {}} />);

    await type(getByLabel(container, 'Site name'), 'Former fuel depot');
    await type(getByLabel(container, 'EPSG code'), '32632');
    await click(container.querySelector<HTMLInputElement>('input[type="radio"][value="US"]')!);
    await click(getButton(container, 'Add unit'));
    await type(getByLabel(container, 'Hydrostratigraphic unit 1'), 'Sand and gravel');
    await click(getButton(container, 'Add unit'));
    await type(getByLabel(container, 'Hydrostratigraphic unit 2'), 'sand and gravel');
    await click(getButton(container, 'Create site'));

    await waitFor(() =>
      expect(messagesFor(getByLabel(container, 'Hydrostratigraphic unit 2'))).toContain('already in the list'),
    );
    expect(server.calls.some((c) => c.method === 'POST')).toBe(false);

    await type(getByLabel(container, 'Hydrostratigraphic unit 2'), 'Silt');
    await click(getButton(container, 'Create site'));

    await waitFor(() => expect(onCreated).toHaveBeenCalled());
    const post = server.calls.find((c) => c.method === 'POST');
    expect(JSON.parse(String(post?.init?.body))).toEqual({
      name: 'Former fuel depot',
      description: '',
      epsgCode: 32632,
      displayUnits: 'US',
      hydroUnits: ['Sand and gravel', 'Silt'],
    });
  });
});
