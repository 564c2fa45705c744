import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-server';
import { startE2E, type E2E } from './driver';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
}, 60_000);
afterAll(async () => e2e?.close());

describe('exports in chromium', () => {
  it('the K map’s Export menu gives a Viewer the GeoTIFF of the surface with the settings shown, as a dated attachment', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Viewer'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}/map`);
    await page.getByRole('heading', { name: 'K map', level: 1 }).waitFor({ timeout: 30_000 });
    await page.locator('[data-testid="kmap-view"][data-map-state="idle"]').waitFor({ timeout: 30_000 });
    await page.getByTestId('export-menu').locator('summary').click();
    const tif = page.getByRole('link', { name: /K surface \(GeoTIFF\)/ });
    await tif.waitFor();
    await e2e.shot(page, 'exports-kmap-menu');
    expect(await tif.getAttribute('href')).toMatch(new RegExp(`^/api/sites/${e2e.ts.demoSiteId}/exports/k-surface\\.tif\\?.*power=`));
    const [download] = await Promise.all([page.waitForEvent('download'), tif.click()]);
    expect(download.suggestedFilename()).toMatch(/^[a-z0-9-]+-k-surface-\d{4}-\d\d-\d\d\.tif$/);
  }, 90_000);
});
