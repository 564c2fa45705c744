/// <reference lib="dom" />
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, type ApiClient } from '../support/test-server';
import { startE2E, type E2E } from './driver';

let e2e: E2E;
let analyst: ApiClient;
let wellId = '';
beforeAll(async () => {
  e2e = await startE2E();
  analyst = await e2e.ts.as(demoEmail('Analyst'));
  wellId = (await e2e.ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: e2e.ts.demoSiteId }, order: { name: 'ASC' } })).id;
});
afterAll(async () => e2e?.close());

/** A Draft over H/H0 0.6–0.1, wider than Hvorslev's recommended 0.25–0.15: the window flag changes K. */
async function wideWindowDraft(): Promise<string> {
  const { recordId } = await insertSyntheticRecord(e2e.ts.ds, wellId, { kMetersPerSecond: 3e-5 });
  const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', window: { kind: 'head', upper: 0.6, lower: 0.1 } }).expect(201)).body;
  expect(fit.flags.map((f: { code: string }) => f.code)).toContain('window-outside-recommended');
  return fit.id;
}

describe('flags that change K, in the fit workspace', () => {
  it('holds Submit until the analyst applies the suggested window in one click; the flag then shows as resolved', async () => {
    const fitId = await wideWindowDraft();
    const page = await e2e.newPage({ width: 1440, height: 1000 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}/fits/${fitId}`);
    const flag = page.locator('[data-flag="window-outside-recommended"]');
    await flag.waitFor();
    expect(await flag.getAttribute('data-standing')).toBe('open');
    await expect.poll(() => page.getByRole('button', { name: 'Submit for check' }).isDisabled()).toBe(true);
    await page.getByTestId('submit-waiting').waitFor();
    await e2e.shot(page, 'flag-answers-open');

    await flag.getByRole('button', { name: /Use the recommended window/ }).click();
    const resolved = page.locator('[data-flag="window-outside-recommended"][data-standing="resolved"]');
    await resolved.waitFor();
    expect(await resolved.textContent()).toMatch(/applied by/);
    await expect.poll(() => page.getByRole('button', { name: 'Submit for check' }).isEnabled()).toBe(true);
    await e2e.shot(page, 'flag-answers-resolved');
    await page.getByRole('button', { name: 'Submit for check' }).click();
    await page.getByText(/Submitted for check/).first().waitFor();
    expect((await analyst.get(`/api/fits/${fitId}`).expect(200)).body.status).toBe('awaiting-check');
  }, 120_000);

  it('takes a reason instead, which the Checker then reads beside the flag', async () => {
    const fitId = await wideWindowDraft();
    const page = await e2e.newPage({ width: 390, height: 844 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}/fits/${fitId}`);
    const flag = page.locator('[data-flag="window-outside-recommended"]');
    await flag.waitFor();
    const reason = 'The recommended range falls in the noisy tail here; the wider window follows the straight part of the record.';
    await flag.getByLabel(/say why/i).fill(reason);
    expect(await flag.getAttribute('data-standing')).toBe('reasoned');
    await expect.poll(() => page.getByRole('button', { name: 'Submit for check' }).isEnabled()).toBe(true);
    await e2e.shot(page, 'flag-answers-reason-390');
    await page.getByRole('button', { name: 'Submit for check' }).click();
    await page.getByText(/Submitted for check/).first().waitFor();

    const checkerPage = await e2e.newPage({ width: 1440, height: 1000 });
    await e2e.signIn(checkerPage, demoEmail('Checker'));
    await checkerPage.goto(`/sites/${e2e.ts.demoSiteId}/fits/${fitId}`);
    const seen = checkerPage.locator('[data-flag="window-outside-recommended"]');
    await seen.waitFor();
    expect(await seen.textContent()).toContain(reason);
    expect(await seen.locator('textarea').count()).toBe(0);
    await e2e.shot(checkerPage, 'flag-answers-checker');
  }, 120_000);
});
