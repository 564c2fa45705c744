/// <reference lib="dom" />
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { K_CHANGING_CODES } from '../../shared/hydraulics/flag-answers';
import { Membership } from '../../server/features/sites/membership.entity';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail } from '../support/test-server';
import { SCREENSHOTS, startE2E, type E2E } from './driver';

type MapFeature = {
  id: string;
  geometry: { coordinates: [number, number] };
  properties: { name: string; hydroUnit: string | null; wellK: number | null; log10K: number | null; count: number };
};
type RGB = [number, number, number];

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(async () => e2e?.close());

let lead: Awaited<ReturnType<E2E['ts']['as']>> | undefined;
async function mapWells(siteId: string): Promise<MapFeature[]> {
  lead ??= await e2e.ts.as(demoEmail('Lead'));
  return (await lead.get(`/api/sites/${siteId}/map/wells`).expect(200)).body.features;
}

/** Wells with a Well K and no other well within 20 m (nested wells share a spot and cover each other), by Well K. */
async function isolatedWellsWithK(siteId: string): Promise<MapFeature[]> {
  const all = await mapWells(siteId);
  const metres = (a: MapFeature, b: MapFeature) => {
    const [x1, y1] = a.geometry.coordinates;
    const [x2, y2] = b.geometry.coordinates;
    return Math.hypot((x2 - x1) * 111_320 * Math.cos((y1 * Math.PI) / 180), (y2 - y1) * 111_320);
  };
  return all
    .filter((w) => w.properties.wellK !== null && all.every((o) => o === w || metres(o, w) > 20))
    .sort((a, b) => a.properties.wellK! - b.properties.wellK!);
}

/** Waits until maplibre has drawn everything it was asked to (tiles, wells, labels). */
async function mapIdle(page: Page, timeout = 30_000) {
  await page.locator('[data-testid="kmap-view"][data-map-state="idle"]').waitFor({ timeout });
}

async function openMap(page: Page, siteId: string, timeout = 30_000) {
  await page.goto(`/sites/${siteId}/map`);
  await page.getByRole('heading', { name: 'K map', level: 1 }).waitFor({ timeout });
  await page.locator('[data-testid="kmap-view"] canvas.maplibregl-canvas').waitFor({ timeout });
  await mapIdle(page, timeout);
}

/** The pixel drawn at the centre of the map's canvas (the map keeps its drawing buffer for the PNG export). */
function centrePixel(page: Page): Promise<RGB> {
  return page.evaluate(() => {
    const c = document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!;
    const copy = document.createElement('canvas');
    copy.width = c.width;
    copy.height = c.height;
    const ctx = copy.getContext('2d')!;
    ctx.drawImage(c, 0, 0);
    const d = ctx.getImageData(Math.floor(c.width / 2), Math.floor(c.height / 2), 1, 1).data;
    return [d[0], d[1], d[2]] as RGB;
  });
}

/**
 * The legend's colour for a K (m/s), read as a person reads the legend: its decade ticks give
 * the position along the colour bar, and the bar's pixel there is the colour. Also returns the
 * ticks' pixel positions, to check that every decade is the same distance along the bar.
 */
function legendColour(page: Page, kMetersPerSecond: number): Promise<{ colour: RGB; tickXs: number[]; decades: number[] }> {
  return page.evaluate((k) => {
    const bar = document.querySelector<HTMLCanvasElement>('[data-testid="k-colour-bar"]')!;
    const ticks = [...document.querySelectorAll<HTMLElement>('[data-testid="k-legend"] [data-decade]')];
    const decades = ticks.map((t) => Number(t.dataset.decade));
    const tickXs = ticks.map((t) => {
      const r = t.getBoundingClientRect();
      return r.left + r.width / 2;
    });
    const from = decades[0];
    const to = decades[decades.length - 1];
    const box = bar.getBoundingClientRect();
    // The demo site's legend is in m/s (SI display units).
    const fraction = (Math.log10(k) - from) / (to - from);
    const x = Math.min(bar.width - 1, Math.max(0, Math.floor(fraction * bar.width)));
    const d = bar.getContext('2d')!.getImageData(x, Math.floor(bar.height / 2), 1, 1).data;
    return { colour: [d[0], d[1], d[2]] as RGB, tickXs: tickXs.map((t) => t - box.left), decades };
  }, kMetersPerSecond);
}

async function findWell(page: Page, name: string) {
  const search = page.getByLabel('Find a well');
  await search.fill(name);
  await search.press('Enter');
  await page.getByRole('heading', { name, level: 3 }).waitFor();
  // The map eases to the well; wait for the move to end and the redraw.
  await page.waitForTimeout(700);
  await mapIdle(page);
}

/**
 * Frame times (ms between requestAnimationFrame callbacks) over about five seconds of panning by
 * drag and zooming by wheel, in and out, through the page's own input events.
 */
async function panAndZoom(page: Page): Promise<number[]> {
  const box = (await page.getByTestId('kmap-map').boundingBox())!;
  const cx = box.x + box.width / 2;
  const cy = box.y + box.height / 2;
  await page.evaluate(() => {
    const w = window as unknown as { __frames: number[]; __recording: boolean };
    w.__frames = [];
    w.__recording = true;
    const tick = (t: number) => {
      w.__frames.push(t);
      if (w.__recording) requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
  });
  const started = Date.now();
  for (let round = 0; round < 3; round++) {
    await page.mouse.move(cx, cy);
    await page.mouse.down();
    for (let s = 1; s <= 20; s++) await page.mouse.move(cx + s * 12 * (round % 2 ? -1 : 1), cy + s * 6);
    await page.mouse.up();
    for (let s = 0; s < 8; s++) {
      await page.mouse.wheel(0, round % 2 ? 120 : -120);
      await page.waitForTimeout(60);
    }
  }
  await page.waitForTimeout(Math.max(0, 5000 - (Date.now() - started)));
  const frames: number[] = await page.evaluate(() => {
    const w = window as unknown as { __frames: number[]; __recording: boolean };
    w.__recording = false;
    return w.__frames;
  });
  // 20,000 wells on a busy machine's software renderer can take a while to settle.
  await mapIdle(page, 90_000);
  return frames
    .slice(1)
    .map((t, i) => t - frames[i])
    .sort((a, b) => a - b);
}

const quantile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
const median = (sorted: number[]) => quantile(sorted, 0.5);
const describeFrames = (d: number[]) =>
  `${d.length} frames: median ${median(d).toFixed(1)} ms, 90th percentile ${quantile(d, 0.9).toFixed(1)} ms, 99th ${quantile(d, 0.99).toFixed(1)} ms, longest ${d[d.length - 1].toFixed(1)} ms`;

const distance = (a: RGB, b: RGB) => Math.max(...a.map((v, i) => Math.abs(v - b[i])));

describe('the K map in the browser', () => {
  it('shows the demo site’s basemap with labels and the wells coloured by K with a legend, all from the app’s own origin', async () => {
    const page = await e2e.newPage();
    e2e.requests.length = 0;
    await e2e.signIn(page, demoEmail('Lead'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}`);
    await page.getByRole('link', { name: 'K map' }).first().click();
    await page.waitForURL(/\/map$/);
    await openMap(page, e2e.ts.demoSiteId);
    await e2e.shot(page, 'kmap-demo-site-1280');

    const legend = page.getByTestId('k-legend');
    expect(await legend.getByText('Well K').isVisible()).toBe(true);
    expect(await legend.getByText('(m/s, log scale)').isVisible()).toBe(true);
    expect(await legend.locator('[data-decade]').count()).toBeGreaterThanOrEqual(2);
    // The basemap's labels are drawn from the app's glyphs: the style asked for them.
    expect(e2e.requests.some((u) => u.includes('/tiles/glyphs/'))).toBe(true);
    expect(e2e.requests.some((u) => /\/tiles\/\d+\/\d+\/\d+\.pbf/.test(u))).toBe(true);

    // Farther out: the site among the invented town's streets, the wells as small dots without names.
    await page.getByRole('button', { name: 'Zoom out' }).click();
    await page.getByRole('button', { name: 'Zoom out' }).click();
    await page.getByRole('button', { name: 'Zoom out' }).click();
    await page.waitForTimeout(600);
    await mapIdle(page);
    await e2e.shot(page, 'kmap-demo-site-wide-1280');
    await page.getByRole('button', { name: 'Fit to site' }).click();
    await page.waitForTimeout(800);
    await mapIdle(page);

    // The view as a PNG, with the legend drawn under the map.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export view as PNG' }).click()]);
    expect(download.suggestedFilename()).toMatch(/k-map\.png$/);
    const file = path.join(SCREENSHOTS, 'kmap-export-1280.png');
    await download.saveAs(file);
    const png = fs.readFileSync(file);
    expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
    const canvasHeight = await page.evaluate(() => document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!.height);
    // PNG header: width and height are big-endian at bytes 16 and 20.
    expect(png.readUInt32BE(20)).toBeGreaterThan(canvasHeight + 100);

    const origin = new URL(e2e.ts.baseUrl).origin;
    const foreign = e2e.requests.filter((u) => !u.startsWith('data:') && !u.startsWith('blob:') && new URL(u).origin !== origin);
    expect(foreign).toEqual([]);
  });

  it('draws a well in the legend’s colour for its Well K, on a legend where every decade is the same length', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Lead'));
    await openMap(page, e2e.ts.demoSiteId);
    const wells = await isolatedWellsWithK(e2e.ts.demoSiteId);
    expect(wells.length).toBeGreaterThan(3);
    // The lowest, a middle and the highest Well K among them.
    for (const w of [wells[0], wells[Math.floor(wells.length / 2)], wells[wells.length - 1]]) {
      await findWell(page, w.properties.name);
      const drawn = await centrePixel(page);
      const { colour, tickXs } = await legendColour(page, w.properties.wellK!);
      console.log(`${w.properties.name}: Well K ${w.properties.wellK!.toExponential(2)} m/s, drawn rgb(${drawn}), legend rgb(${colour})`);
      expect(distance(drawn, colour), `${w.properties.name}: drawn ${drawn} vs legend ${colour}`).toBeLessThanOrEqual(3);
      const steps = tickXs.slice(1).map((x, i) => x - tickXs[i]);
      for (const s of steps) expect(Math.abs(s - steps[0])).toBeLessThan(1.5);
    }
    await e2e.shot(page, 'kmap-well-selected-1280');
  });

  it('changes a well’s colour when a new fit of it is checked', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Lead'));
    await openMap(page, e2e.ts.demoSiteId);
    const wells = await isolatedWellsWithK(e2e.ts.demoSiteId);
    const target = wells[Math.floor(wells.length / 2)];
    await findWell(page, target.properties.name);
    const before = await centrePixel(page);

    // A new record and fit far above the well's K, fitted by the Analyst and checked by the Checker.
    const analyst = await e2e.ts.as(demoEmail('Analyst'));
    const checker = await e2e.ts.as(demoEmail('Checker'));
    const newK = Math.min(5e-3, target.properties.wellK! * 1000);
    const { recordId } = await insertSyntheticRecord(e2e.ts.ds, target.id, { kMetersPerSecond: newK });
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
    // The target's geometry may raise a flag that changes K (the intake radius): answered with a reason.
    const reasons = Object.fromEntries((fit.flags as { code: string }[]).filter((f) => K_CHANGING_CODES.has(f.code)).map((f) => [f.code, 'Kept as fitted for this test.']));
    await analyst.post(`/api/fits/${fit.id}/submit`, { reasons }).expect(200);
    await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' }).expect(200);

    const after = (await mapWells(e2e.ts.demoSiteId)).find((w) => w.id === target.id)!;
    expect(after.properties.count).toBe(target.properties.count + 1);
    await page.reload();
    await openMap(page, e2e.ts.demoSiteId);
    await findWell(page, target.properties.name);
    const drawn = await centrePixel(page);
    const { colour } = await legendColour(page, after.properties.wellK!);
    console.log(`${target.properties.name}: Well K ${target.properties.wellK!.toExponential(2)} → ${after.properties.wellK!.toExponential(2)} m/s; rgb(${before}) → rgb(${drawn}), legend rgb(${colour})`);
    expect(distance(before, drawn)).toBeGreaterThan(30);
    expect(distance(drawn, colour)).toBeLessThanOrEqual(3);
    await e2e.shot(page, 'kmap-after-new-fit-1280');
  });

  it('links the histogram and the map both ways, and filters, unit, layers and basemap change what is drawn', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Lead'));
    await openMap(page, e2e.ts.demoSiteId);
    const all = await mapWells(e2e.ts.demoSiteId);
    const legend = page.getByTestId('k-legend');

    // The pointer's position in UTM 32N (metres) and in latitude/longitude.
    const box = (await page.getByTestId('kmap-map').boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await expect.poll(() => page.getByTestId('cursor-site').textContent()).toMatch(/^x 5\d\d,\d{3}\.\d m, y 5,2\d\d,\d{3}\.\d m$/);
    await expect.poll(() => page.getByTestId('cursor-latlon').textContent()).toMatch(/^47\.\d{5}° N, 9\.\d{5}° E$/);

    // Pointing at a bar rings its wells (orange) on the map.
    const orange = () =>
      page.evaluate(() => {
        const c = document.querySelector<HTMLCanvasElement>('[data-testid="kmap-view"] canvas.maplibregl-canvas')!;
        const copy = document.createElement('canvas');
        copy.width = c.width;
        copy.height = c.height;
        const ctx = copy.getContext('2d')!;
        ctx.drawImage(c, 0, 0);
        const d = ctx.getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        // The ring colour, #ea580c, give or take the antialiasing.
        for (let i = 0; i < d.length; i += 4) if (d[i] > 200 && d[i + 1] > 60 && d[i + 1] < 120 && d[i + 2] < 60) n++;
        return n;
      });
    expect(await orange()).toBe(0);
    const counts = await legend.locator('button[data-bin]').evaluateAll((bs) => bs.map((b) => Number(/^(\d+)/.exec(b.getAttribute('aria-label') ?? '')?.[1] ?? 0)));
    const bin = counts.indexOf(Math.max(...counts));
    await legend.locator(`button[data-bin="${bin}"]`).hover();
    await expect.poll(() => legend.getByText(/ringed on the map/).isVisible()).toBe(true);
    await mapIdle(page);
    // The ring is drawn on the next frame after the hover, which may come after the idle mark.
    await expect.poll(orange, { timeout: 15_000 }).toBeGreaterThan(30);
    await e2e.shot(page, 'kmap-bin-hover-1280');

    // Shift-drag over the whole map selects every drawn well; their bars are marked.
    await page.mouse.move(box.x + 8, box.y + 60);
    await page.keyboard.down('Shift');
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2, { steps: 4 });
    await page.mouse.move(box.x + box.width - 8, box.y + box.height - 8, { steps: 4 });
    await page.mouse.up();
    await page.keyboard.up('Shift');
    await expect.poll(() => page.getByRole('heading', { name: /^\d+ wells selected$/ }).isVisible()).toBe(true);
    expect(await legend.locator('button[aria-pressed="true"]').count()).toBeGreaterThan(0);
    await e2e.shot(page, 'kmap-box-selection-1280');
    await page.getByRole('button', { name: 'Clear selection' }).click();

    // A unit filter: fewer wells, and the legend and histogram follow.
    const silt = all.filter((w) => w.properties.hydroUnit === 'Silt').length;
    await page.getByRole('checkbox', { name: 'Sand and gravel' }).uncheck();
    await page.getByRole('checkbox', { name: 'Buried channel gravel' }).uncheck();
    await expect.poll(() => page.getByText(`Showing ${silt} of ${all.length} wells.`).isVisible()).toBe(true);
    const histogramTotal = async () =>
      (await legend.locator('button[data-bin]').evaluateAll((bs) => bs.map((b) => Number(/^(\d+)/.exec(b.getAttribute('aria-label') ?? '')?.[1] ?? 0)))).reduce((a, b) => a + b, 0);
    const siltWithK = all.filter((w) => w.properties.hydroUnit === 'Silt' && w.properties.wellK !== null).length;
    expect(await histogramTotal()).toBe(siltWithK);
    await mapIdle(page);
    await e2e.shot(page, 'kmap-filter-silt-1280');
    await page.getByRole('checkbox', { name: 'Sand and gravel' }).check();
    await page.getByRole('checkbox', { name: 'Buried channel gravel' }).check();

    // A screen-elevation range that no screen reaches empties the map.
    await page.getByLabel('Screen elevation from').fill('500');
    await expect.poll(() => page.getByText(`Showing 0 of ${all.length} wells.`).isVisible()).toBe(true);
    await page.getByRole('button', { name: 'Clear', exact: true }).click();
    await expect.poll(() => page.getByText(`Showing ${all.length} of ${all.length} wells.`).isVisible()).toBe(true);

    // The legend in ft/d: whole decades of ft/d, and the same colour for a given K.
    const before = await legend.locator('[data-decade]').evaluateAll((ts) => ts.map((t) => Number((t as HTMLElement).dataset.decade)));
    await page.getByLabel('K unit').selectOption('ft/d');
    await expect.poll(() => legend.getByText('(ft/d, log scale)').isVisible()).toBe(true);
    const after = await legend.locator('[data-decade]').evaluateAll((ts) => ts.map((t) => Number((t as HTMLElement).dataset.decade)));
    // 1 m/s = 283 465 ft/d: about 5.45 decades up.
    expect(after[0]).toBeGreaterThanOrEqual(before[0] + 5);
    expect(after[0]).toBeLessThanOrEqual(before[0] + 6);
    await e2e.shot(page, 'kmap-ft-per-day-1280');
    await page.getByLabel('K unit').selectOption('m/s');

    // Layer list and basemap switch.
    await page.getByRole('button', { name: 'Layers' }).click();
    await page.getByLabel('Basemap').selectOption('plain');
    await page.getByRole('checkbox', { name: 'Wells without a Checked fit' }).uncheck();
    await mapIdle(page);
    expect(await page.getByTestId('kmap-attribution').count()).toBe(0);
    expect(await page.getByRole('checkbox', { name: 'Well names (close zooms)' }).isEnabled()).toBe(true);
    await e2e.shot(page, 'kmap-plain-basemap-1280');
  });

  it('fits a phone screen, with the legend and panels under the map', async () => {
    const page = await e2e.newPage({ width: 390, height: 844 });
    await e2e.signIn(page, demoEmail('Lead'));
    await openMap(page, e2e.ts.demoSiteId);
    const map = await page.getByTestId('kmap-map').boundingBox();
    const legend = await page.getByTestId('k-legend').boundingBox();
    expect(map!.width).toBeLessThanOrEqual(390);
    expect(legend!.y).toBeGreaterThan(map!.y + map!.height);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await e2e.shot(page, 'kmap-demo-site-390');
  });

  it('stays responsive with 20,000 wells while panning and zooming', { timeout: 600_000 }, async () => {
    const WELLS = 20_000;
    // Only Admins create sites by default: the Admin creates it and makes the demo Lead its Lead.
    const admin = await e2e.ts.as(demoEmail('Admin'));
    const site = (await admin.post('/api/sites', { name: 'Big network (generated)', epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body;
    const ds = e2e.ts.ds;
    const leadId: string = (await ds.query(`SELECT id FROM users WHERE email = ?`, [demoEmail('Lead')]))[0].id;
    await ds.getRepository(Membership).insert({ siteId: site.id, userId: leadId, role: 'Lead' });
    const template = await ds.getRepository(Well).findOneByOrFail({ siteId: e2e.ts.demoSiteId });
    const analystId: string = (await ds.query(`SELECT id FROM users WHERE email = ?`, [demoEmail('Analyst')]))[0].id;
    const recordId: string = (await ds.query(`SELECT id FROM records LIMIT 1`))[0].id;
    await ds.transaction(async (m) => {
      for (let i = 0; i < WELLS; i += 500) {
        const batch = [];
        for (let j = i; j < Math.min(WELLS, i + 500); j++) {
          const { id: _i, createdAt: _c, updatedAt: _u, ...t } = template;
          batch.push(m.getRepository(Well).create({ ...t, id: randomUUID(), siteId: site.id, name: `G-${j}`, lon: t.lon + (j % 200) * 1.5e-4, lat: t.lat + Math.floor(j / 200) * 1e-4 }));
        }
        await m.createQueryBuilder().insert().into(Well).values(batch).updateEntity(false).execute();
      }
      const ids: { id: string }[] = await m.query(`SELECT id FROM wells WHERE siteId = ?`, [site.id]);
      const now = new Date().toISOString();
      for (const [k, w] of ids.entries()) {
        if (k % 3 === 0) continue;
        await m.query(
          `INSERT INTO fits (id, siteId, wellId, recordId, chainId, revision, status, method, line, geometry, options, note, result, flags, kMetersPerSecond, preparedById, createdAt, updatedAt)
           VALUES (?, ?, ?, ?, ?, 1, 'checked', 'hvorslev', 'anchored', '{}', '{}', '', '{}', '[]', ?, ?, ?, ?)`,
          [`g-${k}`, site.id, w.id, recordId, `g-${k}`, 10 ** (-7 + (k % 50) / 10), analystId, now, now],
        );
      }
    });

    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Lead'));
    await openMap(page, e2e.ts.demoSiteId);
    const demoWells = (await mapWells(e2e.ts.demoSiteId)).length;
    const baseline = await panAndZoom(page);

    const opened = Date.now();
    await openMap(page, site.id, 90_000);
    const loadMs = Date.now() - opened;
    await e2e.shot(page, 'kmap-20k-wells-1280');

    const big = await panAndZoom(page);
    await e2e.shot(page, 'kmap-20k-wells-after-pan-zoom-1280');

    console.log(`20,000 wells: map idle ${loadMs} ms after opening`);
    console.log(`demo site (${demoWells} wells): ${describeFrames(baseline)}`);
    console.log(`20,000 wells: ${describeFrames(big)}`);
    expect(big.length).toBeGreaterThan(50);
    /*
     * Headless chromium draws WebGL with SwiftShader on the CPU: a profile of this run spends about
     * 95 % of the page's time in the renderer's native code and little in scripts, so frame times
     * follow the machine's load. The target is a median under 50 ms; where even the demo site's
     * 24 wells cannot be drawn that fast (a busy machine), 20,000 wells may take no more than twice
     * the demo site's median, measured the same way in the same run.
     */
    expect(median(big)).toBeLessThan(Math.max(50, 2 * median(baseline)));
    expect(quantile(big, 0.9)).toBeLessThan(Math.max(150, 3 * quantile(baseline, 0.9)));
  });
});
