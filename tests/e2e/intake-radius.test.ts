import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, type ApiClient } from '../support/test-server';
import { startE2E, type E2E } from './driver';

let e2e: E2E;
let lead: ApiClient;
beforeAll(async () => {
  e2e = await startE2E();
  lead = await e2e.ts.as(demoEmail('Lead'));
});
afterAll(async () => e2e?.close());

const m = (value: number) => ({ value, unit: 'm' });

describe('the intake radius in the browser', () => {
  it('defaults a new well to the borehole radius with the reason in the help', async () => {
    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Lead'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}/wells/new`);
    const intake = page.getByLabel("Intake radius (Hvorslev's R, Bouwer-Rice's rw)");
    await intake.waitFor();
    expect(await intake.inputValue()).toBe('borehole');
    expect(await page.getByText('the borehole radius is common practice where the pack is more permeable than the formation', { exact: false }).isVisible()).toBe(true);
    await intake.scrollIntoViewIfNeeded();
    await e2e.shot(page, 'intake-new-well-form-1280');
  });

  it('starts the fit workspace from the well’s borehole radius and says when the fit overrides it, with the flag naming both K', async () => {
    const well = (
      await lead.post(`/api/sites/${e2e.ts.demoSiteId}/wells`, {
        name: 'IR-E2E',
        coordinates: { kind: 'epsg', epsg: 32632, x: 512150, y: 5290080 },
        groundElevation: m(100),
        measuringPointElevation: m(100.8),
        screenReference: 'depth',
        screenTop: m(3),
        screenBottom: m(6),
        casingRadius: m(0.0254),
        screenRadius: m(0.0254),
        boreholeRadius: m(0.1016),
        hydroUnit: 'Sand and gravel',
        aquiferCondition: 'unconfined',
        saturatedThickness: m(10),
        staticWaterDepth: m(2.8),
      })
    ).body;
    expect(well.intakeRadius).toBe('borehole');
    const { recordId } = await insertSyntheticRecord(e2e.ts.ds, well.id, { kMetersPerSecond: 2e-5 });

    const page = await e2e.newPage({ width: 1280, height: 900 });
    await e2e.signIn(page, demoEmail('Analyst'));
    await page.goto(`/sites/${e2e.ts.demoSiteId}/records/${recordId}/fit`);
    await page.getByTestId('k-value').waitFor();
    const select = page.getByTestId('intake-select');
    expect(await select.inputValue()).toBe('borehole');
    expect(await page.getByText('The well’s borehole radius').isVisible()).toBe(true);
    expect(await page.getByText(/Overrides the well’s/).count()).toBe(0);
    await select.scrollIntoViewIfNeeded();
    await e2e.shot(page, 'intake-workspace-well-borehole-1280');
    const kBorehole = await page.getByTestId('k-value').textContent();

    await select.selectOption('screen');
    await expect.poll(() => page.getByText('Overrides the well’s borehole radius').isVisible()).toBe(true);
    await expect.poll(() => page.getByText(/is the screen radius 0\.0254 m in a borehole of radius 0\.1016 m/).first().isVisible()).toBe(true);
    await expect.poll(() => page.getByTestId('k-value').textContent()).not.toBe(kBorehole);
    await e2e.shot(page, 'intake-workspace-override-screen-1280');
  });
});
