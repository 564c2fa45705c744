import type { Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-server';
import { SCREENSHOTS, startE2E, type E2E } from './driver';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(async () => e2e?.close());

/** Wait until the preview map has finished drawing at the given zoom. */
async function idleAt(map: Locator, zoom: string) {
  await expect.poll(() => map.getAttribute('data-map-zoom'), { timeout: 60_000 }).toBe(zoom);
  await expect.poll(() => map.getAttribute('data-map-state'), { timeout: 60_000 }).toBe('idle');
}

async function view(page: Page, map: Locator, name: string, zoom: number, lat: number, lon: number) {
  await page.evaluate((h) => {
    window.location.hash = h;
  }, `view=${zoom}/${lat}/${lon}`);
  await idleAt(map, zoom.toFixed(1));
  await map.screenshot({ path: `${SCREENSHOTS}/basemap-${name}.png` });
}

describe('the basemap in the browser', () => {
  it('draws Kfield’s own basemap with labels at several zoom levels, every request to the app’s own origin', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Admin'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Basemaps' }).click();
    await page.waitForURL(/\/admin\/basemaps$/);
    await page.getByRole('heading', { name: 'Basemaps', level: 1 }).waitFor();
    await page.getByRole('cell', { name: /^Built-in basemap/ }).waitFor();
    const map = page.getByTestId('basemap-preview');
    await map.waitFor();
    // The built-in basemap opens at the invented demo area, zoom 13.
    await idleAt(map, '13.0');
    await e2e.shot(page, 'basemap-admin-page');
    await map.screenshot({ path: `${SCREENSHOTS}/basemap-z13-demo-area.png` });

    await view(page, map, 'z15-depot', 15, 47.76335, 9.16005);
    await view(page, map, 'z17-tank-field', 17, 47.76595, 9.16348);
    await view(page, map, 'z15-town', 15, 47.7623, 9.1348);
    await view(page, map, 'z14-river', 14, 47.7706, 9.1495);
    await view(page, map, 'z11-region', 11, 47.7633, 9.1601);
    await view(page, map, 'z5-europe', 5, 47.5, 9.5);

    const foreign = e2e.requests.filter((u) => !u.startsWith(e2e.ts.baseUrl) && !u.startsWith('data:') && !u.startsWith('blob:'));
    expect(foreign).toEqual([]);
    expect(e2e.requests.some((u) => u.startsWith(`${e2e.ts.baseUrl}/tiles/glyphs/`))).toBe(true);
    expect(e2e.requests.filter((u) => /\/tiles\/\d+\/\d+\/\d+\.pbf/.test(u)).length).toBeGreaterThan(10);
  });

  it('refuses a file that is not a vector MBTiles in the upload form, with the reason beside the file', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Admin'));
    await page.goto('/admin/basemaps');
    const png = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(4096, 3)]);
    await page.getByLabel('MBTiles file').setInputFiles({ name: 'aerial.png', mimeType: 'image/png', buffer: png });
    await page.getByRole('button', { name: 'Upload basemap' }).click();
    await page.getByText('The file is not an SQLite file (it looks like a PNG image)').waitFor();
    expect(await page.getByLabel('MBTiles file').getAttribute('aria-invalid')).toBe('true');
    await e2e.shot(page, 'basemap-upload-refused');
  });

  it('lets a Lead choose the site’s basemap on the site’s edit form', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Lead'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}`);
    await page.getByRole('button', { name: 'Edit site' }).click();
    const select = page.getByLabel('Basemap');
    await expect.poll(() => select.locator('option').count()).toBeGreaterThan(1);
    expect(await select.inputValue()).toBe('');
    await select.selectOption('default');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText('Site details saved.').waitFor();
    const r = await (await e2e.ts.as(demoEmail('Lead'))).get(`/api/sites/${e2e.ts.demoSiteId}`).expect(200);
    expect(r.body).toMatchObject({ basemapId: 'default', basemapStyleUrl: '/tiles/style.json' });
  });
});
