import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Membership } from '../../server/features/sites/membership.entity';
import { User } from '../../server/features/users/user.entity';
import { demoEmail } from '../support/test-server';
import { startE2E, tmpDir, type E2E } from './driver';

const FIXTURE = path.resolve('tests/fixtures/demo-wells.csv');

let e2e: E2E;
let siteId = '';
beforeAll(async () => {
  e2e = await startE2E();
  // A new, empty US-units site led by the demo Analyst, for the import. Only Admins create sites by
  // default: the Admin creates it and makes the Analyst its Lead.
  const admin = await e2e.ts.as(demoEmail('Admin'));
  const r = await admin.post('/api/sites', {
    name: 'Willow Bend import check (fictional)',
    epsgCode: 32632,
    displayUnits: 'US',
    hydroUnits: ['Sand and gravel', 'Buried channel gravel', 'Silt'],
  });
  expect(r.status).toBe(201);
  siteId = r.body.id;
  const analystId = (await e2e.ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Analyst') })).id;
  await e2e.ts.ds.getRepository(Membership).insert({ siteId, userId: analystId, role: 'Lead' });
});
afterAll(async () => e2e?.close());

const rowsShown = (page: Page) => page.locator('table:has(caption:text("Monitoring wells")) tbody tr').count();

async function importFixture(page: Page, width: number) {
  await page.goto(`/sites/${siteId}/wells`);
  await page.getByRole('heading', { name: 'Monitoring wells' }).waitFor();
  await expect.poll(() => page.getByText('No wells yet').isVisible()).toBe(true);
  await e2e.shot(page, `wells-empty-${width}`);
  await page.getByRole('link', { name: 'Import CSV' }).click();
  await page.waitForURL(/\/wells\/import$/);
  await page.getByLabel('Wells file (CSV or TXT)').setInputFiles(FIXTURE);
  await page.getByRole('list', { name: 'Columns in the header' }).waitFor();
  // The mapping is prefilled from the header names, and the units and coordinates from the header too.
  expect(await page.getByLabel('Latitude *').inputValue()).toBe('Latitude');
  expect(await page.getByLabel('Name *').inputValue()).toBe('Well');
  expect(await page.getByLabel('Static water depth', { exact: true }).inputValue()).toBe('DTW (ft below TOC)');
  expect(await page.getByLabel('Coordinates in the file').inputValue()).toBe('latlon');
  expect(await page.getByLabel('Radii', { exact: true }).inputValue()).toBe('in');
  expect(await page.getByLabel('Elevations', { exact: true }).inputValue()).toBe('ft');
  await expect.poll(() => page.getByRole('table', { name: 'Preview of the first rows' }).locator('tbody tr').count()).toBe(5);
  await e2e.shot(page, `wells-import-mapping-${width}`);
  await page.getByRole('button', { name: 'Check the file' }).click();
  await expect.poll(() => page.getByText('All 24 rows are ready to import.').isVisible()).toBe(true);
  await e2e.shot(page, `wells-import-checked-${width}`);
  await page.getByRole('button', { name: 'Import 24 wells' }).click();
  await page.waitForURL(new RegExp(`/sites/${siteId}/wells$`));
  await expect.poll(() => rowsShown(page)).toBe(24);
}

describe('wells in the browser', () => {
  it('imports the demo wells CSV through the mapping preview, then searches, filters and opens a well (1280 px)', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await importFixture(page, 1280);
    await expect.poll(() => page.getByText('Imported 24 wells.').isVisible()).toBe(true);
    // US site: feet in the headers, radii in inches.
    expect(await page.getByRole('columnheader', { name: /Ground \(ft\)/ }).count()).toBe(1);
    expect(await page.getByRole('columnheader', { name: /Casing radius \(in\)/ }).count()).toBe(1);
    await e2e.shot(page, 'wells-table-1280');

    await page.getByLabel('Filter by hydrostratigraphic unit').selectOption('Silt');
    await expect.poll(() => rowsShown(page)).toBe(4);
    await page.getByLabel('Filter by hydrostratigraphic unit').selectOption('');
    await page.getByLabel('Search wells').fill('mw-08');
    await expect.poll(() => rowsShown(page)).toBe(1);
    await e2e.shot(page, 'wells-table-search-1280');
    await page.getByLabel('Search wells').fill('');

    // Numbers sort largest first on the first click (TanStack Table's default for numeric columns).
    await page.getByRole('button', { name: /Screen bottom depth/ }).click();
    expect(await page.getByRole('columnheader', { name: /Screen bottom depth/ }).getAttribute('aria-sort')).toBe('descending');
    await expect.poll(() => page.locator('tbody tr').first().locator('td').first().textContent()).toBe('MW-14D');

    await page.getByText('Columns (', { exact: false }).click();
    await page.getByLabel('Latitude (°)').check();
    expect(await page.getByRole('columnheader', { name: /Latitude/ }).count()).toBe(1);
    await e2e.shot(page, 'wells-table-columns-1280');
    await page.getByText('Columns (', { exact: false }).click();

    await page.getByRole('link', { name: 'MW-08', exact: true }).click();
    await page.waitForURL(/\/wells\/[0-9a-f-]{36}$/);
    await page.getByRole('img', { name: 'Construction of MW-08' }).waitFor();
    await expect.poll(() => page.getByText('Buried channel gravel').first().isVisible()).toBe(true);
    // 4.51 m = 14.80 ft; the 4-inch well's casing radius is 2 in.
    expect(await page.locator('dd', { hasText: '14.80 ft to 29.79 ft below ground' }).count()).toBe(1);
    expect(await page.getByText('2.00 in', { exact: true }).first().isVisible()).toBe(true);
    await e2e.shot(page, 'well-page-1280');

    await page.getByRole('button', { name: 'Edit well' }).click();
    const bottom = page.getByLabel('Screen bottom (depth below ground)', { exact: true });
    await bottom.fill('5');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await expect.poll(() => page.getByText('Screen bottom must be below the screen top (a greater depth)').isVisible()).toBe(true);
    await e2e.shot(page, 'well-edit-error-1280');
    // A check only the server can make (the system's area of use) is shown beside the coordinates.
    await bottom.fill('30');
    await page.getByLabel('Latitude (°)').fill('40.7');
    await page.getByLabel('Longitude (°)').fill('-74');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await expect.poll(() => page.getByText(/outside the area of use of the site's system EPSG:32632/).isVisible()).toBe(true);
    await e2e.shot(page, 'well-edit-server-error-1280');
    await page.getByLabel('Latitude (°)').fill('47.76228031');
    await page.getByLabel('Longitude (°)').fill('9.15652795');
    await bottom.fill('30');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await expect.poll(() => page.getByText('Well MW-08 saved.').isVisible()).toBe(true);
    await expect.poll(() => page.locator('dd', { hasText: '14.80 ft to 30.00 ft below ground' }).count()).toBe(1);
  });

  it('lists every row’s problems by line number before anything is imported', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    const lines = fs.readFileSync(FIXTURE, 'utf8').trimEnd().split('\n');
    lines[3] = lines[3].replace(/,unconfined,/, ',artesian,');
    lines[5] = lines[5].split(',').slice(0, 5).join(',');
    const file = path.join(tmpDir(), 'wells-with-problems.csv');
    fs.writeFileSync(file, `${lines.map((l) => l.replace(/^MW-/, 'PW-')).join('\n')}\n`);
    await page.goto(`/sites/${siteId}/wells/import`);
    await page.getByLabel('Wells file (CSV or TXT)').setInputFiles(file);
    await page.getByRole('button', { name: 'Check the file' }).click();
    const problems = page.getByRole('table', { name: 'Problems by line' });
    await problems.waitFor();
    expect(await problems.locator('tbody tr').count()).toBe(2);
    expect(await problems.locator('tbody tr').first().textContent()).toMatch(/^4Aquifer condition.*"artesian" is not one of confined, unconfined, leaky/);
    expect(await problems.locator('tbody tr').nth(1).textContent()).toMatch(/^6Whole lineHas 5 values; the header has 17/);
    expect(await page.getByRole('button', { name: 'Import' }).isDisabled()).toBe(true);
    await e2e.shot(page, 'wells-import-problems-1280');
  });

  it('shows the wells table, a well and the import at 390 px wide', async () => {
    const page = await e2e.newPage({ width: 390, height: 844 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await page.goto(`/sites/${siteId}/wells`);
    await expect.poll(() => rowsShown(page)).toBe(24);
    await e2e.shot(page, 'wells-table-390');
    await page.getByLabel('Sort wells by').selectOption({ label: 'Screen bottom depth (ft) ↓' });
    await expect.poll(() => page.locator('tbody tr').first().locator('td').first().textContent()).toMatch(/MW-14D/);
    await page.locator('tbody tr').first().click();
    await page.getByRole('img', { name: 'Construction of MW-14D' }).waitFor();
    await e2e.shot(page, 'well-page-390');
    await page.getByRole('button', { name: 'Edit well' }).click();
    await e2e.shot(page, 'well-edit-390');
    await page.goto(`/sites/${siteId}/wells/import`);
    await page.getByLabel('Wells file (CSV or TXT)').setInputFiles(FIXTURE);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await expect.poll(() => page.getByText('24 problems in 24 rows').isVisible()).toBe(true);
    await e2e.shot(page, 'wells-import-390');
  });

  it('shows the demo site’s wells and construction drawings in SI units', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Viewer'));
    await page.getByRole('link', { name: /Willow Bend former fuel depot/ }).first().click();
    await page.getByRole('link', { name: 'Wells table' }).click();
    await expect.poll(() => rowsShown(page)).toBe(24);
    expect(await page.getByRole('link', { name: 'Import CSV' }).count()).toBe(0);
    expect(await page.getByRole('columnheader', { name: /Ground \(m\)/ }).count()).toBe(1);
    await e2e.shot(page, 'demo-wells-viewer-1280');
    await page.getByRole('link', { name: 'MW-01', exact: true }).click();
    await page.getByRole('img', { name: 'Construction of MW-01' }).waitFor();
    expect(await page.getByRole('button', { name: 'Edit well' }).count()).toBe(0);
    await e2e.shot(page, 'demo-well-viewer-1280');
    expect(e2e.requests.filter((u) => !u.startsWith(e2e.ts.baseUrl) && !u.startsWith('data:') && !u.startsWith('blob:'))).toEqual([]);
  });
});
