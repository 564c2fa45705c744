// @vitest-environment happy-dom
import { act } from 'react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { hvorslevT0Seconds } from '@shared/hydraulics/hvorslev';
import { CAUTIONS } from '@shared/cautions';
import { setCsrfToken } from '@/lib/api-client';
import type { ReducedDto } from '@/features/fits/api';
import { FitWorkspace } from '@/features/fits/components/fit-workspace';
import { fit, FIT_ID } from './fit-fixtures';
import { cleanup, click, getButton, getByLabel, jsonResponse, render, stubApi, type, waitFor } from './helpers';

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await cleanup();
  vi.unstubAllGlobals();
  window.sessionStorage.clear();
});

const site = { id: 's1', displayUnits: 'SI' as const };
const geometry = { casingRadiusM: 0.0254, screenRadiusM: 0.0508, boreholeRadiusM: 0.1016, screenLengthM: 3.048, intake: 'screen' as const, anisotropyRatio: 1 };
const K = 1e-5;

/** A record from the Hvorslev model H/H0 = exp(−t/T0) for a known K (or an oscillating one). */
function reducedFor(o: { oscillate?: boolean } = {}): ReducedDto {
  const t0 = hvorslevT0Seconds(geometry, K);
  const n = 240;
  const dt = t0 / 40;
  const t = Array.from({ length: n }, (_, i) => i * dt);
  const h = t.map((s) => (o.oscillate ? Math.exp(-s / (3 * t0)) * Math.cos((2 * Math.PI * s) / t0) : Math.exp(-s / t0)));
  return {
    recordId: 'r1',
    wellId: 'w1',
    siteId: 's1',
    reference: 'depth',
    testType: 'rising-head',
    staticLevelM: 4.2,
    staticSource: 'entered',
    preTestCount: 0,
    testStartSeconds: 0,
    testStartIndex: 0,
    testStartSource: 'entered',
    h0M: 0.8,
    readings: n,
    decimated: false,
    elapsedSeconds: t,
    displacementM: h.map((v) => v * 0.8),
    normalizedHead: h,
    slugVolumeM3: null,
    defaultGeometry: geometry,
    hydroUnit: null,
  };
}

function seriesOf(r: ReducedDto) {
  const keep = r.normalizedHead.map((v, i) => [r.elapsedSeconds[i], v] as const).filter(([, v]) => v > 0);
  return { recordId: r.recordId, readings: r.readings, plottable: keep.length, omitted: r.readings - keep.length, elapsedSeconds: keep.map(([t]) => t), normalizedHead: keep.map(([, v]) => v) };
}

/** The K shown in m/s, read back from the "m × 10ⁿ" text. */
function shownK(container: HTMLElement): number {
  const el = container.querySelector('[data-testid="k-value"]');
  if (!el) throw new Error('no K shown');
  const m = /([\d.]+) × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)/.exec(el.textContent ?? '');
  if (!m) throw new Error(`K not readable: ${el.textContent}`);
  const sup = '⁰¹²³⁴⁵⁶⁷⁸⁹';
  const exp = Number(m[2].replace('⁻', '-').replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => String(sup.indexOf(c))));
  return Number(m[1]) * 10 ** exp;
}

describe('fit workspace', () => {
  it('previews K of a synthetic record within 1 % of the K it was made from, with the cautions under the result', async () => {
    const reduced = reducedFor();
    const { container } = await render(<FitWorkspace site={site} reduced={reduced} series={seriesOf(reduced)} fit={null} />);
    const k = await waitFor(() => shownK(container));
    expect(Math.abs(k / K - 1)).toBeLessThan(0.01);
    expect(container.textContent).toContain(CAUTIONS[0]);
    expect(container.textContent).toContain('the recommended range');
    expect(container.querySelector('[data-testid="fitted-line"]')).not.toBeNull();
  });

  it('recomputes at once when the window is typed, and saves the window and the geometry in SI', async () => {
    const reduced = reducedFor();
    const server = stubApi({ 'POST /api/records/r1/fits': () => jsonResponse({ error: { code: 'VALIDATION', message: 'stop here' } }, 400) });
    const { container } = await render(<FitWorkspace site={site} reduced={reduced} series={seriesOf(reduced)} fit={null} />);
    await waitFor(() => shownK(container));
    await click(container.querySelector<HTMLInputElement>('input[name="window-kind"]')!);
    const t0 = hvorslevT0Seconds(geometry, K);
    await type(getByLabel(container, 'To (s)'), String(Number((2 * t0).toFixed(1))));
    await waitFor(() => expect(container.textContent).toContain('entered'));
    await type(getByLabel(container, 'Screen length (m)'), '1.524');
    // Halving L in the Hvorslev formula changes K by ln(mL/D + …)/L: K rises by more than 1.5×.
    await waitFor(() => expect(shownK(container) / K).toBeGreaterThan(1.5));
    await click(getButton(container, 'Save fit'));
    await waitFor(() => expect(server.calls.some((c) => c.method === 'POST')).toBe(true));
    const body = JSON.parse(String(server.calls.find((c) => c.method === 'POST')!.init!.body));
    expect(body.method).toBe('hvorslev');
    expect(body.window.kind).toBe('time');
    expect(body.window.toSeconds).toBeCloseTo(2 * t0, 0);
    expect(body.geometry.screenLengthM).toBeCloseTo(1.524, 12);
    expect(body.geometry.casingRadiusM).toBeCloseTo(0.0254, 12);
    await waitFor(() => expect(container.textContent).toContain('stop here'));
  });

  it('refuses to fit an oscillating record until the override is ticked, and then keeps the flag', async () => {
    const reduced = reducedFor({ oscillate: true });
    const { container } = await render(<FitWorkspace site={site} reduced={reduced} series={seriesOf(reduced)} fit={null} />);
    await waitFor(() => expect(container.textContent).toContain('The record oscillates'));
    expect(container.querySelector('[data-testid="k-value"]')).toBeNull();
    const box = getByLabel(container, 'Fit the straight line anyway (overdamped methods do not apply)') as HTMLInputElement;
    await act(async () => box.click());
    await waitFor(() => shownK(container));
    expect(container.querySelector('[data-flag="oscillation"]')).not.toBeNull();
  });

  it('offers the high-K model in one click on an oscillating record: K, the regime in words and the fitted curve', async () => {
    const reduced = reducedFor({ oscillate: true });
    const { container } = await render(<FitWorkspace site={site} reduced={reduced} series={seriesOf(reduced)} fit={null} />);
    await waitFor(() => expect(container.textContent).toContain('The record oscillates'));
    await click(getButton(container, 'Use the high-K model'));
    // This well has no static level to screen bottom, so L_e cannot be estimated: the field asks for it.
    const le = getByLabel(container, 'Effective length L_e (m)');
    await waitFor(() => expect(le.getAttribute('aria-invalid')).toBe('true'));
    expect(container.textContent).toContain('cannot be estimated from the well');
    await type(le, '3');
    await waitFor(() => shownK(container));
    expect(container.querySelector('[data-testid="damping-regime"]')?.getAttribute('data-regime')).toBe('underdamped');
    expect(container.textContent).toContain('the level oscillates about static as it recovers');
    expect(container.querySelector('[data-testid="fitted-model-curve"]')).not.toBeNull();
    expect(container.querySelector('[data-testid="fitting-window-band"]')).toBeNull();
    expect(container.querySelector('[data-testid="recommended-range"]')).toBeNull();
    expect(getByLabel(container, 'Fit L_e to the record')).toBeTruthy();
    expect(container.querySelector('[data-flag="oscillation"]')).not.toBeNull();
  });

  it('shows a geometry refusal from the server beside its field', async () => {
    const reduced = reducedFor();
    stubApi({
      'POST /api/records/r1/fits': () =>
        jsonResponse({ error: { code: 'VALIDATION', message: 'Bad geometry', fields: { 'geometry.screenRadiusM': 'Screen radius is too large for this well' } } }, 400),
    });
    const { container } = await render(<FitWorkspace site={site} reduced={reduced} series={seriesOf(reduced)} fit={null} />);
    await waitFor(() => shownK(container));
    await click(getButton(container, 'Save fit'));
    const field = getByLabel(container, 'Screen radius (cm)');
    await waitFor(() => expect(field.getAttribute('aria-invalid')).toBe('true'));
    expect(container.textContent).toContain('Screen radius is too large for this well');
  });

  it('starts a revision of a Checked fit and opens the new revision the server answers with', async () => {
    const reduced = reducedFor();
    const NEW_ID = '22222222-2222-4222-8222-222222222222';
    const checked = fit({ status: 'checked', geometry, can: { edit: false, revise: true, submit: false, check: false } });
    const server = stubApi({
      [`PATCH /api/fits/${FIT_ID}`]: () => jsonResponse(fit({ id: NEW_ID, revision: 2, status: 'draft', can: { edit: true, revise: false, submit: true, check: false } }), 201),
      [`GET /api/fits/${NEW_ID}`]: () => jsonResponse(fit({ id: NEW_ID, revision: 2, status: 'draft' })),
    });
    const { container, router } = await render(<FitWorkspace site={site} reduced={reduced} series={seriesOf(reduced)} fit={checked} />);
    expect(getByLabel(container, 'Screen length (m)').hasAttribute('readonly')).toBe(true);
    await click(getButton(container, 'Start a revision'));
    await type(getByLabel(container, 'Screen length (m)'), '2.5');
    await click(getButton(container, 'Save as revision 2'));
    await waitFor(() => expect(router.state.location.pathname).toBe(`/sites/s1/fits/${NEW_ID}`));
    const body = JSON.parse(String(server.calls.find((c) => c.method === 'PATCH')!.init!.body));
    expect(body.geometry.screenLengthM).toBe(2.5);
    expect(body.window).toBeNull();
  });
});
