import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hvorslevT0Seconds } from '../../shared/hydraulics/hvorslev';
import { wellGeometry } from '../../server/features/fits/fits.service';
import { Well } from '../../server/features/wells/well.entity';
import { gaussian } from '../support/gaussian';
import { demoEmail } from '../support/test-server';
import { startE2E, tmpDir, type E2E } from './driver';

let e2e: E2E;
let siteId = '';
let packed: Well;
const dir = tmpDir();

beforeAll(async () => {
  e2e = await startE2E();
  siteId = e2e.ts.demoSiteId;
  const wells = await e2e.ts.ds.getRepository(Well).find({ where: { siteId }, order: { name: 'ASC' } });
  // A well with a filter pack (borehole wider than the screen): its intake is the borehole by default.
  packed = wells.find((w) => w.boreholeRadiusM > w.screenRadiusM * 1.2 && w.intakeRadius === 'borehole')!;
  expect(packed, 'a demo well with a filter pack').toBeDefined();
});
afterAll(async () => e2e?.close());

interface LoggerFileOptions {
  name: string;
  kMetersPerSecond: number;
  /** Readings before the step; 0 is a logger started late. */
  preTestSeconds: number;
  /** A barometric-like drift of the level after recovery, m/s. */
  driftMPerS?: number;
  /** Scatter of the pre-test readings, m (a logger disturbed while it was lowered). */
  preTestScatterM?: number;
  seed: number;
}

/**
 * An invented vented-logger export (timestamps, elapsed seconds, head above the sensor in m) of a
 * slug-out test on `packed`, made from the Hvorslev (1951) model with the well's geometry and a
 * known K; noise 0.2 % of H0. No settings but the columns are needed to read it.
 */
function loggerFile(o: LoggerFileOptions): { file: string; t0Seconds: number } {
  const t0 = hvorslevT0Seconds(wellGeometry(packed), o.kMetersPerSecond);
  const h0 = 0.6;
  const head = 3.2;
  const noise = gaussian(o.seed);
  const lines = ['Invented example export for Kfield tests (no real instrument or site)', 'Instrument,Fictional vented level logger VL-2', 'Sample interval,1 s', '', 'Timestamp,Seconds,Level', ',s,m'];
  const start = Date.UTC(2026, 10, 20, 9, 0, 0);
  const total = o.preTestSeconds + Math.ceil(8 * t0);
  for (let i = 0; i <= total; i++) {
    const t = i - o.preTestSeconds;
    const recovery = t < 0 ? 0 : -h0 * Math.exp(-t / t0);
    const drift = o.driftMPerS && t > 5 * t0 ? o.driftMPerS * (t - 5 * t0) : 0;
    const scatter = t < 0 && o.preTestScatterM ? o.preTestScatterM * Math.sin(i * 1.7) : 0;
    const level = head + recovery + drift + scatter + 0.002 * h0 * noise();
    const stamp = new Date(start + i * 1000).toISOString().replace('T', ' ').slice(0, 19);
    lines.push(`${stamp},${i},${level.toFixed(5)}`);
  }
  const file = path.join(dir, o.name);
  fs.writeFileSync(file, `${lines.join('\n')}\n`);
  return { file, t0Seconds: t0 };
}

async function openUpload(page: Page, file: string) {
  await page.goto(`/sites/${siteId}/wells/${packed.id}/records/new/logger`);
  await page.getByRole('heading', { name: 'Upload a logger file' }).waitFor();
  await page.getByLabel('Logger file (CSV or text export)').setInputFiles(file);
  await page.getByRole('heading', { name: '2. Layout and columns of the logger file' }).waitFor();
  await page.getByTestId('preview-curve').waitFor();
}

describe('records as they come from the field', () => {
  it('a filter-packed well’s logger file with nothing entered but what Kfield detects gives the right K by default', async () => {
    const K = 4e-5;
    const { file } = loggerFile({ name: 'packed-well.csv', kMetersPerSecond: K, preTestSeconds: 60, seed: 11 });
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await openUpload(page, file);
    await page.getByTestId('suggestion').waitFor();
    expect(await page.getByTestId('suggestion').textContent()).toMatch(/Detected from the data, not entered/);
    await page.locator('[data-testid="preview-curve"] [data-marker="detected"]').waitFor();
    await e2e.shot(page, 'field-records-preview-detected');
    await page.getByRole('button', { name: 'Upload and save the record' }).click();
    await page.waitForURL(/\/sites\/[^/]+\/records\/[^/]+$/);
    const recordId = page.url().split('/').pop()!;

    await page.goto(`/sites/${siteId}/records/${recordId}/fit`);
    await page.getByTestId('k-value').waitFor();
    await page.getByRole('button', { name: 'Save fit' }).click();
    await page.waitForURL(/\/fits\/[0-9a-f-]{36}$/);
    const fitId = page.url().split('/').pop()!;
    const api = await e2e.ts.as(demoEmail('Analyst'));
    const fit = (await api.get(`/api/fits/${fitId}`).expect(200)).body;
    expect(fit.geometry.intake).toBe('borehole');
    // Hvorslev (1951) model record of K = 4e-5 m/s; detected start and static level; default window.
    expect(Math.abs(fit.result.kMetersPerSecond / K - 1)).toBeLessThan(0.05);
    expect(await page.getByText(/detected/i).first().isVisible()).toBe(true);
    await e2e.shot(page, 'field-records-fit-default');
  }, 120_000);

  it('a logger started late, with no static level, is refused with that reason and asks for the static level', async () => {
    const { file } = loggerFile({ name: 'late-logger.csv', kMetersPerSecond: 4e-5, preTestSeconds: 0, seed: 12 });
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await openUpload(page, file);
    const problem = page.getByText(/No readings before the test start and no static level entered/);
    await problem.first().waitFor();
    expect(await page.getByText(/reading\(s\)/).count()).toBe(0);
    await e2e.shot(page, 'field-records-late-logger');
  }, 120_000);

  it('a level that drifts after recovery gets the drift note on its fit, not an oscillation', async () => {
    const { file, t0Seconds } = loggerFile({ name: 'drifting.csv', kMetersPerSecond: 4e-5, preTestSeconds: 60, driftMPerS: 0.6 / 2000, seed: 13 });
    expect(t0Seconds).toBeGreaterThan(5);
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await openUpload(page, file);
    await page.getByTestId('suggestion').waitFor();
    await page.getByRole('button', { name: 'Upload and save the record' }).click();
    await page.waitForURL(/\/sites\/[^/]+\/records\/[^/]+$/);
    const recordId = page.url().split('/').pop()!;
    await page.goto(`/sites/${siteId}/records/${recordId}/fit`);
    await page.getByTestId('k-value').waitFor();
    await page.locator('[data-flag="drift-after-recovery"]').waitFor();
    expect(await page.locator('[data-flag="oscillation"]').count()).toBe(0);
    expect(await page.getByText('The record oscillates').count()).toBe(0);
    expect(await page.locator('[data-flag="drift-after-recovery"]').textContent()).toMatch(/keeps moving after recovery/);
    await e2e.shot(page, 'field-records-drift');
  }, 120_000);

  it('a record whose start cannot be found asks for it, with the candidates on the curve; one click fills the start', async () => {
    const { file } = loggerFile({ name: 'disturbed.csv', kMetersPerSecond: 4e-5, preTestSeconds: 60, preTestScatterM: 0.12, seed: 14 });
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await openUpload(page, file);
    await page.getByText(/Could not find the test start/).first().waitFor();
    const candidates = page.locator('[data-testid="preview-curve"] [data-marker="candidate"]');
    await expect.poll(() => candidates.count()).toBeGreaterThan(0);
    await e2e.shot(page, 'field-records-candidates');
    await page.getByTestId('start-candidates').getByRole('button').first().click();
    await page.locator('[data-testid="preview-curve"] [data-marker="entered"]').waitFor();
    expect(Number(await page.getByLabel(/^Test start/).inputValue())).toBeGreaterThan(0);
  }, 120_000);

  it('takes the static level in the logger’s pressure unit and the test start as the clock time the crew wrote down', async () => {
    const { file } = loggerFile({ name: 'crew-notes.csv', kMetersPerSecond: 4e-5, preTestSeconds: 60, seed: 15 });
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await openUpload(page, file);
    await page.getByTestId('suggestion').waitFor();
    // 3.2 m of water above the sensor is 31.38 kPa (ρ = 1000 kg/m³, g = 9.80665 m/s², common practice).
    await page.locator('select[id$="-static-unit"]').selectOption('kPa');
    await page.getByLabel('Static level, head above the sensor').fill('31.38');
    // The crew noted the slug pulled at 09:01:00 on the logger's clock (UTC), 60 s after its first reading.
    await page.getByLabel(/^Test start/).fill('09:01:00');
    await page.getByText(/the start you entered \(09:01:00\) is placed on the record’s clock/).waitFor();
    expect(await page.locator('[data-testid="preview-curve"] [data-marker="detected"]').count()).toBe(0);
    await e2e.shot(page, 'field-records-crew-units');
    await page.getByRole('button', { name: 'Upload and save the record' }).click();
    await page.waitForURL(/\/sites\/[^/]+\/records\/[^/]+$/);
    const recordId = page.url().split('/').pop()!;
    const api = await e2e.ts.as(demoEmail('Analyst'));
    const record = (await api.get(`/api/records/${recordId}`).expect(200)).body;
    expect(record.staticSource).toBe('entered');
    expect(record.staticLevelM).toBeCloseTo(31.38e3 / (1000 * 9.80665), 6);
    expect(record.testStartSource).toBe('entered');
    expect(record.testStartSeconds).toBeCloseTo(60, 6);
    expect(Math.abs(record.h0M) / 0.6).toBeCloseTo(1, 1);
  }, 120_000);
});
