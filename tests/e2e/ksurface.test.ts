/// <reference lib="dom" />
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { booleanPointInPolygon, point } from '@turf/turf';
import proj4 from 'proj4';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-server';
import { SCREENSHOTS, startE2E, type E2E } from './driver';
import { scatteredSite } from './scattered-site';

type RGB = [number, number, number];
type MapFeature = { id: string; geometry: { coordinates: [number, number] }; properties: { name: string; wellK: number | null; log10K: number | null } };
type Outline = { id: string; name: string; geometry: { type: 'Polygon' | 'MultiPolygon'; coordinates: number[][][] | number[][][][] } };

const UTM32N = '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(async () => e2e?.close());

async function api(role: 'Lead' | 'Analyst' | 'Admin' = 'Lead') {
  return e2e.ts.as(demoEmail(role));
}

async function mapIdle(page: Page, timeout = 30_000) {
  await page.locator('[data-testid="kmap-view"][data-map-state="idle"]').waitFor({ timeout });
}

async function openMap(page: Page, siteId: string) {
  await page.goto(`/sites/${siteId}/map`);
  await page.getByRole('heading', { name: 'K map', level: 1 }).waitFor({ timeout: 30_000 });
  await page.locator('[data-testid="kmap-view"] canvas.maplibregl-canvas').waitFor();
  await mapIdle(page);
}

async function openPanel(page: Page, title: string) {
  const button = page.getByRole('button', { name: title, exact: true });
  if ((await button.getAttribute('aria-expanded')) !== 'true') await button.click();
}

async function showSurface(page: Page) {
  await openPanel(page, 'K surface');
  await page.getByRole('checkbox', { name: /Show the K surface/ }).check();
  await page.locator('[data-testid="surface-panel"][data-surface-state="ready"]').waitFor({ timeout: 30_000 });
  await page.waitForTimeout(300);
  await mapIdle(page);
}

/** The map canvas's pixels: at one CSS point, or a count of those matching a test. */
function pixelAt(page: Page, x: number, y: number): Promise<RGB> {
  return page.evaluate(
    ([px, py]) => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!;
      const r = c.getBoundingClientRect();
      const ratio = c.width / r.width;
      const copy = document.createElement('canvas');
      copy.width = c.width;
      copy.height = c.height;
      const ctx = copy.getContext('2d')!;
      ctx.drawImage(c, 0, 0);
      const d = ctx.getImageData(Math.floor((px - r.left) * ratio), Math.floor((py - r.top) * ratio), 1, 1).data;
      return [d[0], d[1], d[2]] as RGB;
    },
    [x, y],
  );
}

function countPixels(page: Page, target: RGB, tolerance: number): Promise<number> {
  return page.evaluate(
    ([t, tol]) => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!;
      const copy = document.createElement('canvas');
      copy.width = c.width;
      copy.height = c.height;
      const ctx = copy.getContext('2d')!;
      ctx.drawImage(c, 0, 0);
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < d.length; i += 4) if (Math.abs(d[i] - t[0]) <= tol && Math.abs(d[i + 1] - t[1]) <= tol && Math.abs(d[i + 2] - t[2]) <= tol) n++;
      return n;
    },
    [target, tolerance] as const,
  );
}

/** The legend bar's colour for a K (m/s), read from its decade ticks as a person would (see kmap.test.ts). */
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

const SUPERSCRIPTS: Record<string, string> = { '⁻': '-', '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9' };
/** "2.34 × 10⁻⁴ m/s" or "0.0123 m/s" as a number of m/s. */
function parseK(text: string): number {
  const m = /^([\d.]+)(?: × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+))? m\/s$/.exec(text.trim());
  if (!m) throw new Error(`Not a K in m/s: ${text}`);
  const exponent = m[2] ? Number([...m[2]].map((c) => SUPERSCRIPTS[c]).join('')) : 0;
  return Number(m[1]) * 10 ** exponent;
}

const distance = (a: RGB, b: RGB) => Math.max(...a.map((v, i) => Math.abs(v - b[i])));

async function demoOutline(): Promise<Outline> {
  const lead = await api('Lead');
  const list: Outline[] = (await lead.get(`/api/sites/${e2e.ts.demoSiteId}/outlines`).expect(200)).body.outlines;
  const plume = list.find((o) => /plume/i.test(o.name));
  expect(plume, 'the demo site has its invented plume outline').toBeDefined();
  return plume!;
}

const outerRing = (o: Outline) => (o.geometry.type === 'Polygon' ? (o.geometry.coordinates as number[][][])[0] : (o.geometry.coordinates as number[][][][])[0][0]);

async function findWell(page: Page, name: string) {
  const search = page.getByLabel('Find a well');
  await search.fill(name);
  await search.press('Enter');
  await page.getByRole('heading', { name, level: 3 }).waitFor();
  await page.waitForTimeout(800);
  await mapIdle(page);
}

describe('the K surface, outlines and capture sketches in the browser', () => {
  it('draws the surface inside the demo plume outline in the legend’s colours, outlines a high-K zone and cross-validates it', async () => {
    const page = await e2e.newPage();
    e2e.requests.length = 0;
    await e2e.signIn(page, demoEmail('Analyst'));
    await openMap(page, e2e.ts.demoSiteId);
    const outline = await demoOutline();
    await showSurface(page);
    expect(await page.getByLabel('Clip to outline').inputValue()).toBe(outline.id);
    await expect.poll(() => page.getByTestId('surface-wells-used').textContent()).toMatch(/^Uses \d+ wells/);
    expect(await page.getByTestId('surface-panel').getByRole('complementary', { name: 'Cautions' }).textContent()).toContain('interpolated K between wells is an estimate');
    await e2e.shot(page, 'ksurface-demo-plume-1280');

    // The highest-K lone well inside the outline: the surface beside it in the legend's colour for the value read under the pointer.
    const wells: MapFeature[] = (await (await api()).get(`/api/sites/${e2e.ts.demoSiteId}/map/wells`).expect(200)).body.features;
    const ring = outerRing(outline);
    const polygon = { type: 'Polygon' as const, coordinates: [ring] };
    const metres = (a: MapFeature, b: MapFeature) =>
      Math.hypot((a.geometry.coordinates[0] - b.geometry.coordinates[0]) * 75_900, (a.geometry.coordinates[1] - b.geometry.coordinates[1]) * 111_320);
    const inside = wells
      .filter((w) => w.properties.wellK !== null && booleanPointInPolygon(point(w.geometry.coordinates), polygon) && wells.every((o) => o === w || metres(o, w) > 25))
      .sort((a, b) => b.properties.wellK! - a.properties.wellK!);
    expect(inside.length).toBeGreaterThan(2);
    const high = inside[0];
    await page.getByLabel(/^Opacity/).fill('100');
    // Saved capture sketches are drawn over the surface (the demo's envelope is wide): hidden while the colour is read.
    await openPanel(page, 'Capture sketches');
    for (const box of await page.getByRole('list', { name: 'Capture sketches' }).getByRole('checkbox').all()) await box.uncheck();
    await page.getByRole('button', { name: 'Capture sketches', exact: true }).click();
    await findWell(page, high.properties.name);
    const box = (await page.getByTestId('kmap-view').boundingBox())!;
    // Beside the well's circle, on the side away from its name (written to the right).
    const at = { x: box.x + box.width / 2 - 16, y: box.y + box.height / 2 + 16 };
    await page.mouse.move(at.x, at.y);
    await expect.poll(() => page.getByTestId('cursor-k').textContent()).toMatch(/m\/s$/);
    await page.waitForTimeout(200);
    const kText = (await page.getByTestId('cursor-k').textContent())!;
    const k = parseK(kText);
    const drawn = await pixelAt(page, at.x, at.y);
    const legend = await legendColour(page, k);
    console.log(`beside ${high.properties.name} (Well K ${high.properties.wellK!.toExponential(2)} m/s): surface ${kText}, drawn rgb(${drawn}), legend rgb(${legend})`);
    expect(Math.abs(Math.log10(k) - Math.log10(high.properties.wellK!))).toBeLessThan(0.5);
    expect(distance(drawn, legend), `drawn ${drawn} vs legend ${legend}`).toBeLessThanOrEqual(8);
    await e2e.shot(page, 'ksurface-beside-high-k-well-1280');

    // A high-permeability zone: cells above a third of that well's K, outlined in magenta with its area.
    await page.getByRole('button', { name: 'Fit to site' }).click();
    await page.waitForTimeout(800);
    await page.getByLabel(/^Opacity/).fill('75');
    await page.getByLabel(/Outline cells with K above/).fill((high.properties.wellK! / 3).toExponential(2));
    await expect.poll(() => page.getByTestId('zones-summary').textContent()).toMatch(/^\d+ cells above .*: [\d,.]+ (m²|ha), geometric mean K .* m\/s\.$/);
    await mapIdle(page);
    await expect.poll(() => countPixels(page, [192, 38, 211], 40), { timeout: 10_000 }).toBeGreaterThan(40);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('surface-panel').getByRole('button', { name: 'Export GeoJSON' }).click()]);
    const file = path.join(SCREENSHOTS, 'ksurface-high-k-zones.geojson');
    await download.saveAs(file);
    const zones = JSON.parse(fs.readFileSync(file, 'utf8'));
    expect(zones.type).toBe('FeatureCollection');
    expect(zones.features.length).toBeGreaterThan(0);
    expect(zones.features[0].geometry.type).toBe('MultiPolygon');
    expect(zones.features[0].properties.areaM2).toBeGreaterThan(0);
    await e2e.shot(page, 'ksurface-high-k-zone-1280');

    // Cross-validation: the table by power, the suggestion, the plot naming the worst wells, next-test spots.
    await openPanel(page, 'Cross-validation');
    const cv = page.getByTestId('cv-panel');
    await cv.waitFor({ timeout: 30_000 });
    expect(await cv.locator('[data-testid="cv-table"] tbody tr').count()).toBe(6);
    expect(await cv.getByText('(current)').count()).toBe(1);
    await expect.poll(() => page.getByTestId('cv-suggested').textContent()).toMatch(/^Suggested power: [\d.]+$/);
    expect(await cv.locator('[data-worst-well]').count()).toBe(3);
    const spots = await cv.locator('[data-testid="next-test-spots"] li').allTextContents();
    console.log(`next-test spots: ${spots.join(' | ')}`);
    expect(spots.length).toBeGreaterThan(0);
    expect(spots[0]).toMatch(/x [\d,]+\.\d, y [\d,]+\.\d \(EPSG:32632\); 47\.\d{5}° N, 9\.\d{5}° E; nearest well/);
    const suggested = Number(/([\d.]+)$/.exec((await page.getByTestId('cv-suggested').textContent())!)![1]);
    const use = cv.getByRole('button', { name: `Use power ${suggested}` });
    if (await use.isEnabled()) {
      await use.click();
      await page.locator(`[data-testid="surface-panel"][data-surface-power="${suggested}"]`).waitFor({ state: 'attached' });
    }
    await mapIdle(page);
    await e2e.shot(page, 'ksurface-cross-validation-1280');

    const origin = new URL(e2e.ts.baseUrl).origin;
    const foreign = e2e.requests.filter((u) => !u.startsWith('data:') && !u.startsWith('blob:') && new URL(u).origin !== origin);
    expect(foreign).toEqual([]);
  });

  it('places a trial extraction well downgradient of the plume and saves its capture sketch', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Analyst'));
    await openMap(page, e2e.ts.demoSiteId);
    const outline = await demoOutline();
    await openPanel(page, 'Capture sketches');

    // A click on the map places the trial well and reads K there.
    await page.getByRole('button', { name: 'Place a trial well on the map' }).click();
    const box = (await page.getByTestId('kmap-view').boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await expect.poll(() => page.getByTestId('trial-position').textContent()).toMatch(/^Trial well at x [\d,]+\.\d, y [\d,]+\.\d$/);

    // Typed in the site's system: 40 m east of the plume's highest-K well, downgradient (the invented heads fall east, toward the river).
    const wells: MapFeature[] = (await (await api()).get(`/api/sites/${e2e.ts.demoSiteId}/map/wells`).expect(200)).body.features;
    const polygon = { type: 'Polygon' as const, coordinates: [outerRing(outline)] };
    const high = wells.filter((w) => w.properties.wellK !== null && booleanPointInPolygon(point(w.geometry.coordinates), polygon)).sort((a, b) => b.properties.wellK! - a.properties.wellK!)[0];
    const [hx, hy] = proj4('WGS84', UTM32N, high.geometry.coordinates);
    await page.getByLabel(/^x \(EPSG/).fill((hx + 40).toFixed(1));
    await page.getByLabel('y', { exact: true }).fill(hy.toFixed(1));
    await page.getByRole('button', { name: 'Place', exact: true }).click();
    await expect.poll(() => page.getByTestId('trial-k').textContent(), { timeout: 15_000 }).toMatch(/K there: .*m\/s/);
    expect(await page.getByRole('list', { name: 'Nearest wells' }).locator('li').count()).toBeGreaterThan(0);
    await page.getByLabel('Name', { exact: true }).fill('Trial well E2E');
    await page.getByLabel('Pumping rate').fill('1.5');
    await page.getByLabel('Rate unit').selectOption('L/s');
    await page.getByLabel(/^Saturated thickness/).fill('6');
    await expect.poll(() => page.getByTestId('trial-t').textContent()).toMatch(/T = K·b = \d\.\d\de-\d m²\/s/);
    await page.getByLabel('Magnitude (m/m)').fill('0.004');
    await page.getByLabel(/Flow toward/).fill('90');
    await page.getByRole('button', { name: 'Save sketch' }).click();

    const item = page.locator('[data-sketch="Trial well E2E"]');
    await item.waitFor({ timeout: 15_000 });
    const results = (await item.getByTestId('sketch-results').textContent())!;
    console.log(`saved sketch: ${results}`);
    expect(results).toMatch(/Stagnation point[\d.]+ m downgradient/);
    expect(results).toMatch(/Capture width[\d.]+ m at the well, [\d.]+ m far upgradient/);
    expect(results).toMatch(/Drawdown[\d.]+ m at 10\.00 m/);
    expect(await item.getByRole('complementary', { name: 'Cautions' }).textContent()).toContain('capture sketches are screening estimates');
    await page.getByRole('button', { name: 'Fit to site' }).click();
    await page.waitForTimeout(800);
    await mapIdle(page);
    // The envelope's fill and line (blue) are drawn.
    await expect.poll(() => countPixels(page, [37, 99, 235], 30), { timeout: 10_000 }).toBeGreaterThan(30);
    await e2e.shot(page, 'ksurface-capture-sketch-1280');

    // Hidden and shown again; the GeoJSON export holds it.
    await item.getByRole('checkbox', { name: 'Show Trial well E2E on the map' }).uncheck();
    await item.getByRole('checkbox', { name: 'Show Trial well E2E on the map' }).check();
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('sketch-panel').getByRole('button', { name: 'Export GeoJSON' }).click()]);
    const file = path.join(SCREENSHOTS, 'ksurface-capture-sketches.geojson');
    await download.saveAs(file);
    expect(fs.readFileSync(file, 'utf8')).toContain('Trial well E2E');
  });

  it('uploads, draws, edits, renames, exports and deletes outlines, with a refusal shown in words', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Analyst'));
    await openMap(page, e2e.ts.demoSiteId);
    await openPanel(page, 'Outlines');
    const wells: MapFeature[] = (await (await api()).get(`/api/sites/${e2e.ts.demoSiteId}/map/wells`).expect(200)).body.features;
    const lon = wells.reduce((a, w) => a + w.geometry.coordinates[0], 0) / wells.length;
    const lat = wells.reduce((a, w) => a + w.geometry.coordinates[1], 0) / wells.length;

    // A line is no outline: the server's reason is shown beside the form.
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-outline-'));
    const bad = path.join(dir, 'line.geojson');
    fs.writeFileSync(bad, JSON.stringify({ type: 'LineString', coordinates: [[lon, lat], [lon + 0.001, lat]] }));
    await page.getByLabel('Name', { exact: true }).fill('E2E line');
    await page.getByLabel(/^GeoJSON file/).setInputFiles(bad);
    await page.getByRole('button', { name: 'Upload outline' }).click();
    await expect.poll(() => page.getByTestId('outline-upload-error').textContent()).toMatch(/Polygon/);

    const good = path.join(dir, 'square.geojson');
    const d = 0.0012;
    fs.writeFileSync(good, JSON.stringify({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [[[lon - d, lat - d], [lon + d, lat - d], [lon + d, lat + d], [lon - d, lat + d], [lon - d, lat - d]]] } }));
    await page.getByLabel('Name', { exact: true }).fill('E2E upload');
    await page.getByLabel(/^GeoJSON file/).setInputFiles(good);
    await page.getByRole('button', { name: 'Upload outline' }).click();
    await page.locator('[data-outline="E2E upload"]').waitFor();
    expect(await page.getByTestId('outline-upload-error').count()).toBe(0);

    // Drawn on the map: four corners and back to the first.
    const box = (await page.getByTestId('kmap-view').boundingBox())!;
    const cx = box.x + box.width / 2;
    const cy = box.y + box.height / 2;
    const corners = [
      [cx - 70, cy - 60],
      [cx + 60, cy - 70],
      [cx + 80, cy + 60],
      [cx - 60, cy + 70],
    ];
    await page.getByRole('button', { name: 'Draw on the map' }).click();
    for (const [x, y] of corners) {
      await page.mouse.move(x, y, { steps: 3 });
      await page.mouse.click(x, y);
      await page.waitForTimeout(150);
    }
    await page.mouse.move(corners[0][0], corners[0][1], { steps: 3 });
    await page.mouse.click(corners[0][0], corners[0][1]);
    await page.getByLabel('Name of the drawn outline').fill('E2E drawn');
    await e2e.shot(page, 'ksurface-outline-drawn-1280');
    await page.getByRole('button', { name: 'Save outline' }).click();
    const drawn = page.locator('[data-outline="E2E drawn"]');
    await drawn.waitFor();
    const areaBefore = (await drawn.locator('span').first().textContent())!;

    // A vertex dragged outward makes it larger.
    await drawn.getByRole('button', { name: 'Edit the shape of E2E drawn' }).click();
    await page.waitForTimeout(300);
    const [vx, vy] = corners[2];
    await page.mouse.move(vx, vy, { steps: 2 });
    await page.mouse.down();
    await page.mouse.move(vx + 30, vy + 20, { steps: 6 });
    await page.mouse.move(vx + 60, vy + 40, { steps: 6 });
    await page.mouse.up();
    await e2e.shot(page, 'ksurface-outline-editing-1280');
    await drawn.getByRole('button', { name: 'Save shape' }).click();
    await expect.poll(() => drawn.locator('span').first().textContent()).not.toBe(areaBefore);
    console.log(`drawn outline: ${areaBefore} → ${await drawn.locator('span').first().textContent()}`);

    await drawn.getByRole('button', { name: 'Rename E2E drawn' }).click();
    await drawn.getByLabel('New name').fill('E2E renamed');
    await drawn.getByRole('button', { name: 'Save' }).click();
    const renamed = page.locator('[data-outline="E2E renamed"]');
    await renamed.waitFor();
    const [download] = await Promise.all([page.waitForEvent('download'), renamed.getByRole('button', { name: 'Export' }).click()]);
    const file = path.join(dir, 'export.geojson');
    await download.saveAs(file);
    expect(fs.readFileSync(file, 'utf8')).toContain('Polygon');
    await renamed.getByRole('button', { name: 'Delete E2E renamed' }).click();
    await renamed.getByRole('button', { name: 'Delete', exact: true }).click();
    await renamed.waitFor({ state: 'detached' });
    const upload = page.locator('[data-outline="E2E upload"]');
    await upload.getByRole('button', { name: 'Delete E2E upload' }).click();
    await upload.getByRole('button', { name: 'Delete', exact: true }).click();
    await upload.waitFor({ state: 'detached' });
  });

  it('fits a phone: the panels in a bottom sheet under the map, nothing wider than the screen', async () => {
    const page = await e2e.newPage({ width: 390, height: 844 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await openMap(page, e2e.ts.demoSiteId);
    const map = (await page.getByTestId('kmap-map').boundingBox())!;
    const sheet = (await page.getByTestId('kmap-sheet').boundingBox())!;
    expect(sheet.y).toBeGreaterThan(map.y + map.height - 20);
    expect(sheet.x).toBeGreaterThanOrEqual(0);
    expect(sheet.x + sheet.width).toBeLessThanOrEqual(390);
    await showSurface(page);
    await openPanel(page, 'Cross-validation');
    await page.getByTestId('cv-panel').waitFor({ timeout: 30_000 });
    await openPanel(page, 'Capture sketches');
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await e2e.shot(page, 'ksurface-phone-390');
  });

  it('shows a Viewer the outlines, the surface and the saved sketches with no editing controls', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Viewer'));
    await openMap(page, e2e.ts.demoSiteId);
    await showSurface(page);
    await openPanel(page, 'Outlines');
    await openPanel(page, 'Capture sketches');
    await expect.poll(() => page.getByRole('list', { name: 'Outlines' }).locator('li').count()).toBeGreaterThan(0);
    await expect.poll(() => page.getByRole('list', { name: 'Capture sketches' }).locator('li').count()).toBeGreaterThan(0);
    for (const name of ['Upload outline', 'Draw on the map', 'Delete', 'Rename', 'Edit shape', 'Place a trial well on the map', 'Save sketch']) {
      expect(await page.getByRole('button', { name: new RegExp(`^${name}`) }).count(), name).toBe(0);
    }
    await e2e.shot(page, 'ksurface-viewer-1280');
  });

  it('re-renders a 200 × 200 surface from 100 wells each time the power changes', { timeout: 180_000 }, async () => {
    const site = await scatteredSite(e2e, 'Surface timing (generated)', 100);

    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Analyst'));
    await openMap(page, site.id);
    await showSurface(page);
    const cells = await page.getByTestId('surface-panel').getAttribute('data-surface-cells');
    const [cols, rows] = cells!.split('x').map(Number);
    // By default the grid is 200 cells along its longer side: a cell size that puts 200 along the shorter one makes it at least 200 × 200.
    const sizeM = Number((await page.getByTestId('surface-summary').textContent())!.match(/cells of ([\d.]+) m/)![1]);
    const cell = (Math.min(cols, rows) * sizeM) / 200;
    await page.getByLabel('Cell size (m)').fill(cell.toFixed(3));
    await page.locator('[data-testid="surface-panel"][data-surface-state="ready"]').waitFor();
    await page.waitForTimeout(500);
    const finalCells = (await page.getByTestId('surface-panel').getAttribute('data-surface-cells'))!;
    expect(await page.getByTestId('surface-wells-used').textContent()).toBe('Uses 100 wells with a Well K (the map’s filters apply).');

    // Every power change re-renders: the worker answers for the power chosen, the field shows it, the painted map changes, nothing fails.
    const canvasHash = (p: Page) =>
      p.evaluate(() => {
        const c = document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!;
        const copy = document.createElement('canvas');
        copy.width = c.width;
        copy.height = c.height;
        const ctx = copy.getContext('2d')!;
        ctx.drawImage(c, 0, 0);
        const d = ctx.getImageData(0, 0, c.width, c.height).data;
        let h = 2166136261;
        for (let i = 0; i < d.length; i++) h = Math.imul(h ^ d[i], 16777619);
        return h >>> 0;
      });
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    let painted = await canvasHash(page);
    const timings: { power: number; wallMs: number; computeMs: number; renderMs: number }[] = [];
    for (const power of [2.5, 1.5, 3, 1, 2, 2.2, 1.8]) {
      const t = await page.evaluate(async (p) => {
        const panel = document.querySelector<HTMLElement>('[data-testid="surface-panel"]')!;
        const input = document.getElementById('surface-power') as HTMLInputElement;
        const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value')!.set!;
        const started = performance.now();
        const done = new Promise<void>((resolve) => {
          const observer = new MutationObserver(() => {
            if (panel.dataset.surfaceState === 'ready' && panel.dataset.surfacePower === String(p) && panel.dataset.surfaceRenderMs) {
              observer.disconnect();
              resolve();
            }
          });
          observer.observe(panel, { attributes: true });
        });
        setter.call(input, String(p));
        input.dispatchEvent(new Event('input', { bubbles: true }));
        await done;
        // The next frame: the image is on the map.
        await new Promise((r) => requestAnimationFrame(() => r(null)));
        return { wallMs: performance.now() - started, computeMs: Number(panel.dataset.surfaceComputeMs), renderMs: Number(panel.dataset.surfaceRenderMs) };
      }, power);
      timings.push({ power, ...t });
      const panel = page.getByTestId('surface-panel');
      expect(await panel.getAttribute('data-surface-state'), `power ${power}`).toBe('ready');
      expect(await panel.getAttribute('data-surface-power'), 'the worker answered for the power chosen').toBe(String(power));
      expect(await page.locator('#surface-power').inputValue(), 'the field shows the power chosen').toBe(String(power));
      expect(await panel.getAttribute('data-surface-cells'), 'the grid stays the same').toBe(finalCells);
      await expect.poll(() => canvasHash(page), { message: `the map repaints the surface for power ${power}`, timeout: 10_000 }).not.toBe(painted);
      painted = await canvasHash(page);
      await page.waitForTimeout(150);
    }
    expect(errors, 'no page errors').toEqual([]);
    const walls = timings.map((t) => t.wallMs).sort((a, b) => a - b);
    const median = walls[Math.floor(walls.length / 2)];
    // The figure is printed for reference only; the 150 ms target is measured by `npm run bench -- surface`.
    console.log(
      `power change, ${finalCells} cells from 100 wells: ${timings.map((t) => `p=${t.power}: ${t.wallMs.toFixed(0)} ms (worker ${t.computeMs.toFixed(0)} ms, to painted ${t.renderMs.toFixed(0)} ms)`).join('; ')}; median ${median.toFixed(0)} ms`,
    );
    const [c2, r2] = finalCells.split('x').map(Number);
    expect(c2 * r2).toBeGreaterThanOrEqual(190 * 190);
    await mapIdle(page);
    await e2e.shot(page, 'ksurface-100-wells-1280');
  });
});
