/// <reference lib="dom" />
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-server';
import { startE2E, type E2E } from './driver';

type RGB = [number, number, number];

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(async () => e2e?.close());

const mapIdle = (page: Page) => page.locator('[data-testid="kmap-view"][data-map-state="idle"]').waitFor({ timeout: 30_000 });

/** The legend's colour for a K (m/s), read off its colour bar at the K's place between the decade ticks. */
function legendColour(page: Page, kMetersPerSecond: number): Promise<RGB> {
  return page.evaluate((k) => {
    const bar = document.querySelector<HTMLCanvasElement>('[data-testid="k-colour-bar"]')!;
    const decades = [...document.querySelectorAll<HTMLElement>('[data-testid="k-legend"] [data-decade]')].map((t) => Number(t.dataset.decade));
    const fraction = (Math.log10(k) - decades[0]) / (decades[decades.length - 1] - decades[0]);
    const x = Math.min(bar.width - 1, Math.max(0, Math.floor(fraction * bar.width)));
    const d = bar.getContext('2d')!.getImageData(x, Math.floor(bar.height / 2), 1, 1).data;
    return [d[0], d[1], d[2]] as RGB;
  }, kMetersPerSecond);
}

/** How many of the map canvas's pixels are within `tolerance` of each colour. */
function pixelsNear(page: Page, colours: RGB[], tolerance = 10): Promise<number[]> {
  return page.evaluate(
    ([cs, tol]) => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!;
      const copy = document.createElement('canvas');
      copy.width = c.width;
      copy.height = c.height;
      const ctx = copy.getContext('2d')!;
      ctx.drawImage(c, 0, 0);
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      return (cs as RGB[]).map(([r, g, b]) => {
        let n = 0;
        for (let i = 0; i < d.length; i += 4) if (Math.abs(d[i] - r) <= tol && Math.abs(d[i + 1] - g) <= tol && Math.abs(d[i + 2] - b) <= tol) n++;
        return n;
      });
    },
    [colours, tolerance] as const,
  );
}

/** Buttons, links and form controls a viewer must never see on the read-only page. */
const EDITING = /^(new|edit|delete|save|upload|submit|revoke|add|draw|place|check|send back|make|import)\b/i;

async function editingControls(page: Page): Promise<string[]> {
  const names = await page.locator('button, a, [role="button"]').evaluateAll((els) => els.map((e) => (e.getAttribute('aria-label') ?? e.textContent ?? '').trim()));
  return names.filter((n) => EDITING.test(n));
}

describe('viewer links in the browser', () => {
  it('a Lead makes a wells-only link and e-mails it; a browser with no session sees the coloured wells, legend and cautions and nothing to edit; revoked, it shows the 404 page', async () => {
    const leadPage = await e2e.newPage({ width: 1440, height: 900 });
    await e2e.signIn(leadPage, demoEmail('Lead'));
    await leadPage.goto(`/sites/${e2e.ts.demoSiteId}`);
    await leadPage.getByRole('link', { name: /viewer links/i }).first().click();
    await leadPage.getByRole('heading', { name: 'Viewer links', level: 1 }).waitFor();
    await leadPage.getByLabel('Label').fill('County groundwater office');
    // Wells only (the form's default); untick anything else.
    for (const other of ['K surface', 'Outlines', 'Capture sketches']) if (await leadPage.getByLabel(other, { exact: true }).isChecked()) await leadPage.getByLabel(other, { exact: true }).uncheck();
    if (!(await leadPage.getByLabel('Wells by Well K').isChecked())) await leadPage.getByLabel('Wells by Well K').check();
    await leadPage.getByRole('button', { name: 'Make viewer link' }).click();
    const urlBox = leadPage.getByLabel('Viewer link URL');
    await urlBox.waitFor();
    const url = await urlBox.inputValue();
    expect(url).toMatch(new RegExp(`^${e2e.ts.baseUrl}/view/[A-Za-z0-9_-]{43}$`));
    await e2e.shot(leadPage, 'viewer-links-created');

    await leadPage.getByLabel('E-mail addresses').fill('groundwater.office@example.org');
    await leadPage.getByRole('button', { name: /^send/i }).click();
    await leadPage.getByText(/queued 1/i).first().waitFor();
    const mailed = await e2e.ts.outbox('groundwater.office@example.org');
    expect(mailed).toHaveLength(1);
    expect(mailed[0].text).toContain(url);
    const list = leadPage.getByTestId('viewer-links-list');
    await list.getByText('County groundwater office').waitFor();
    await e2e.shot(leadPage, 'viewer-links-list');

    // The e-mailed URL, in a fresh context with no session, at 1440 px and at 390 px.
    const fromMail = /https?:\/\/\S+\/view\/[A-Za-z0-9_-]{43}/.exec(mailed[0].text)![0];
    expect(fromMail).toBe(url);
    const wells = (await (await fetch(`${url.replace('/view/', '/api/view/')}/wells`)).json()) as { features: { properties: { wellK: number | null; name?: string } }[] };
    expect(wells.features.length).toBeGreaterThan(10);
    expect(wells.features.every((f) => f.properties.name === undefined)).toBe(true);
    const withK = wells.features.map((f) => f.properties.wellK).filter((k): k is number => k !== null);

    for (const [width, height, name] of [
      [1440, 900, 'viewer-page-1440'],
      [390, 844, 'viewer-page-390'],
    ] as const) {
      const viewer = await e2e.newPage({ width, height });
      const answer = await viewer.goto(new URL(fromMail).pathname);
      expect(answer?.status()).toBe(200);
      expect(answer?.headers()['referrer-policy']).toBe('no-referrer');
      await viewer.getByTestId('view-site-name').waitFor();
      await mapIdle(viewer);
      await viewer.waitForTimeout(500);
      await expect(viewer.getByTestId('view-site-name').textContent()).resolves.toMatch(/Willow Bend/);
      await viewer.getByTestId('view-notice').waitFor();
      await viewer.getByTestId('k-legend').waitFor();
      expect(await viewer.getByTestId('view-cautions').textContent()).toMatch(/interpolated K between wells is an estimate/);
      // Wells drawn in the legend's colours: at least five wells' Well K colours are on the map.
      const colours = await Promise.all(withK.slice(0, 8).map((k) => legendColour(viewer, k)));
      const counts = await pixelsNear(viewer, colours);
      expect(counts.filter((n) => n >= 8).length, JSON.stringify({ colours, counts })).toBeGreaterThanOrEqual(5);
      expect(await editingControls(viewer)).toEqual([]);
      // No sign-in happened and nothing of the app's signed-in screens is offered.
      expect(await viewer.getByRole('link', { name: /sign in|sites|checks/i }).count()).toBe(0);
      await e2e.shot(viewer, name);
      if (width === 390) {
        const overflow = await viewer.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
        expect(overflow).toBeLessThanOrEqual(0);
      }
    }

    // The Lead revokes it; the viewer's reload gets the 404 page, with status 404.
    const viewer = await e2e.newPage({ width: 1280, height: 800 });
    await viewer.goto(new URL(url).pathname);
    await mapIdle(viewer);
    await list.getByRole('button', { name: /revoke/i }).first().click();
    const confirm = leadPage.getByRole('button', { name: /^revoke$/i });
    if (await confirm.count()) await confirm.last().click();
    await list.getByText(/revoked/i).first().waitFor();
    const reload = await viewer.reload();
    expect(reload?.status()).toBe(404);
    await viewer.getByTestId('view-not-found').waitFor();
    await e2e.shot(viewer, 'viewer-page-revoked');
  }, 180_000);
});
