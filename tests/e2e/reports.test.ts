import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import { demoEmail } from '../support/test-server';
import { SCREENSHOTS, startE2E, tmpDir, type E2E } from './driver';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(async () => e2e?.close());

describe('reports in the browser', () => {
  it('a Lead downloads the demo site report from the K map; its pages show the map figure, the wells table and fit pages', async () => {
    const page = await e2e.newPage({ width: 1440, height: 900 });
    await e2e.signIn(page, demoEmail('Lead'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}/map`);
    await page.getByRole('heading', { name: 'K map', level: 1 }).waitFor();
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.getByRole('button', { name: 'Site report (PDF)' }).click()]);
    expect(download.suggestedFilename()).toMatch(/^willow-bend.*-site-report-\d{4}-\d{2}-\d{2}\.pdf$/);
    const dir = tmpDir();
    const file = path.join(dir, 'site-report.pdf');
    await download.saveAs(file);
    const bytes = fs.readFileSync(file);
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');

    const parser = new PDFParse({ data: new Uint8Array(bytes) });
    const text = (await parser.getText()).text.replace(/\s+/g, ' ');
    await parser.destroy();
    expect(text).toMatch(/Willow Bend/);
    expect(text).toMatch(/MW-01/);
    expect(text).toMatch(/Hvorslev/);
    expect(text).toMatch(/interpolated K between wells is an estimate/);

    // Pages 1–4 (cover, wells table, map figure, histogram) and the first appendix page, as PNG.
    execFileSync('pdftoppm', ['-png', '-r', '60', '-f', '1', '-l', '6', file, path.join(SCREENSHOTS, 'reports-site-page')]);
    const pngs = fs.readdirSync(SCREENSHOTS).filter((f) => f.startsWith('reports-site-page'));
    expect(pngs.length).toBeGreaterThanOrEqual(5);
  }, 180_000);
});
