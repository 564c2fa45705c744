import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Well } from '../../server/features/wells/well.entity';
import { demoEmail } from '../support/test-server';
import { startE2E, type E2E } from './driver';

const LOGGERS = path.resolve('tests/fixtures/loggers');

let e2e: E2E;
let siteId = '';
const wellIds = new Map<string, string>();
beforeAll(async () => {
  e2e = await startE2E();
  siteId = e2e.ts.demoSiteId;
  for (const w of await e2e.ts.ds.getRepository(Well).find({ where: { siteId } })) wellIds.set(w.name, w.id);
});
afterAll(async () => e2e?.close());

/** The curve's path has a point per plotted reading: "M x,y L x,y …". */
const curvePoints = async (page: Page) => ((await page.getByTestId('recovery-curve').getAttribute('d')) ?? '').split(/[ML]/).filter(Boolean).length;

async function uploadAbsolute(page: Page, well: string, width: number) {
  await page.goto(`/sites/${siteId}/wells/${wellIds.get(well)}`);
  await page.getByRole('heading', { name: 'Records' }).waitFor();
  await e2e.shot(page, `records-well-page-${width}`);
  await page.getByRole('link', { name: 'Upload logger file' }).click();
  await page.waitForURL(/\/records\/new\/logger$/);
  await page.getByRole('heading', { name: 'Upload a logger file' }).waitFor();
  await e2e.shot(page, `records-logger-empty-${width}`);

  await page.getByLabel('Logger file (CSV or text export)').setInputFiles(path.join(LOGGERS, 'absolute-semicolon.csv'));
  await page.getByRole('heading', { name: '2. Layout and columns of the logger file' }).waitFor();
  // What Kfield read, shown for confirmation: semicolons, decimal commas, DD.MM.YYYY, mbar, absolute.
  expect(await page.getByLabel('Delimiter').first().inputValue()).toBe('semicolon');
  expect(await page.getByLabel('Decimal comma').first().isChecked()).toBe(true);
  expect(await page.getByLabel('Header line').first().inputValue()).toBe('6');
  expect(await page.getByLabel('Date layout').first().inputValue()).toBe('dmy');
  expect(await page.getByLabel('Unit of the value column').inputValue()).toBe('mbar');
  expect(await page.getByLabel('The value column measures').inputValue()).toBe('absolute');
  await expect.poll(() => page.getByRole('table', { name: 'First readings of the logger file' }).locator('tbody tr').count()).toBe(12);
  await expect.poll(() => page.getByText('An absolute (non-vented) sensor reads water and air pressure together').isVisible()).toBe(true);

  await page.getByLabel('Barometric file (for an absolute sensor)').setInputFiles(path.join(LOGGERS, 'baro-tab.txt'));
  await page.getByRole('heading', { name: '3. Barometric file' }).waitFor();
  await expect.poll(() => page.getByRole('table', { name: 'First readings of the barometric file' }).isVisible()).toBe(true);
  expect(await page.getByLabel('Unit of the pressure column').inputValue()).toBe('kPa');
  // The step at the fifth reading, 8 s after the first, is suggested and filled in.
  await expect.poll(() => page.getByTestId('suggestion').isVisible()).toBe(true);
  await expect.poll(() => page.getByLabel(/^Test start/).inputValue()).toBe('8');
  expect(await page.getByTestId('suggestion').textContent()).toMatch(/H0 = 0\.5\d\d m, rising-head/);
  await page.getByLabel('Field crew').fill('Browser test (invented)');
  await e2e.shot(page, `records-logger-preview-${width}`);

  await page.getByRole('button', { name: 'Upload and save the record' }).click();
  await page.waitForURL(/\/sites\/[^/]+\/records\/[^/]+$/);
  await page.getByRole('heading', { name: 'Normalized head H/H0' }).waitFor();
  await expect.poll(() => curvePoints(page)).toBe(76);
  expect(await page.getByRole('link', { name: 'Download absolute-semicolon.csv' }).getAttribute('href')).toMatch(/\/file\?which=raw$/);
  expect(await page.getByRole('link', { name: 'Download baro-tab.txt' }).getAttribute('href')).toMatch(/\/file\?which=barometric$/);
  expect(await page.getByRole('complementary', { name: 'Cautions' }).textContent()).toMatch(/Slug-test K describes only the formation close to the screen/);
  await e2e.shot(page, `records-record-absolute-${width}`);
}

async function typeTape(page: Page, well: string, width: number) {
  await page.goto(`/sites/${siteId}/wells/${wellIds.get(well)}`);
  await page.getByRole('link', { name: 'Add tape readings' }).click();
  await page.waitForURL(/\/records\/new\/tape$/);
  await page.getByLabel('Test type').selectOption('bail-down');
  await page.getByLabel('Depth unit').selectOption('ft');
  await page.getByLabel(/Static water level/).fill('13.99');
  // Two readings typed, the rest pasted from a spreadsheet (time and depth, tab-separated).
  await page.getByLabel('Time of reading 1', { exact: true }).fill('0:00');
  await page.getByLabel('Depth of reading 1', { exact: true }).fill('14.87');
  await page.getByLabel('Time of reading 2', { exact: true }).fill('0:01');
  await page.getByLabel('Depth of reading 2', { exact: true }).fill('14.59');
  const block = ['0:02\t14.37', '0:03\t14.20', '0:04\t14.11', '0:05\t14.05', '0:06\t14.03', '0:07\t14.01', '0:08\t14.00'].join('\n');
  await page.getByLabel('Time of reading 3', { exact: true }).evaluate((el, text) => {
    const data = new DataTransfer();
    data.setData('text/plain', text);
    el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
  }, block);
  await expect.poll(() => page.getByLabel('Depth of reading 9', { exact: true }).inputValue()).toBe('14.00');
  await expect.poll(() => page.getByText('Pasted 7 rows from row 3.').isVisible()).toBe(true);
  await e2e.shot(page, `records-tape-form-${width}`);
  await page.getByRole('button', { name: 'Save the readings' }).click();
  await page.waitForURL(/\/sites\/[^/]+\/records\/[^/]+$/);
  await page.getByRole('heading', { name: 'Normalized head H/H0' }).waitFor();
  // Nine readings, the last one above static: all nine on the log axis.
  await expect.poll(() => curvePoints(page)).toBe(9);
  await e2e.shot(page, `records-record-tape-${width}`);
}

describe('records in the browser', () => {
  it('uploads an absolute-pressure logger file with a barometric file through the mapping preview and shows the normalized-head curve (1280 px)', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await uploadAbsolute(page, 'MW-09', 1280);
  });

  it('takes typed and pasted tape readings and shows their curve (1280 px)', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await typeTape(page, 'MW-09', 1280);
  });

  it('does both on a 390 px screen', async () => {
    const page = await e2e.newPage({ width: 390, height: 844 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await uploadAbsolute(page, 'MW-16', 390);
    await typeTape(page, 'MW-16', 390);
  });

  it('shows a demo record of every kind: the long 10 Hz file drawn downsampled, and the oscillating well', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Viewer'));
    for (const [well, name] of [['MW-19D', 'long'], ['MW-08', 'oscillating'], ['MW-03D', 'absolute-demo']] as const) {
      await page.goto(`/sites/${siteId}/wells/${wellIds.get(well)}`);
      await page.getByRole('link', { name: /^Open the record/ }).first().click();
      await page.getByRole('heading', { name: 'Normalized head H/H0' }).waitFor();
      await expect.poll(() => curvePoints(page)).toBeGreaterThan(20);
      // Viewers read records but do not change them.
      expect(await page.getByRole('button', { name: 'Delete' }).count()).toBe(0);
      await e2e.shot(page, `records-demo-${name}-1280`);
      if (name === 'long') expect(await page.getByText('200,000', { exact: true }).isVisible()).toBe(true);
      if (name === 'oscillating') {
        // Below static half the time: said so, and shown whole on the linear axis.
        await expect.poll(() => page.getByText(/the water overshot static/).isVisible()).toBe(true);
        await page.getByRole('button', { name: 'Linear axis' }).click();
        await expect.poll(() => page.getByRole('button', { name: 'Linear axis' }).getAttribute('aria-pressed')).toBe('true');
        await expect.poll(() => curvePoints(page)).toBeGreaterThan(400);
        await e2e.shot(page, 'records-demo-oscillating-linear-1280');
      }
    }
    expect(e2e.requests.every((u) => u.startsWith(e2e.ts.baseUrl))).toBe(true);
  });
});
