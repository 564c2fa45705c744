import { describe, expect, it } from 'vitest';
import { analyzeHighKReduced, highKResiduals } from '@shared/hydraulics/analyze-high-k';
import { flagAction } from '@shared/hydraulics/flag-answers';
import { dampingParameterFromK, modelHead, timeScaleSeconds } from '@shared/hydraulics/high-k';
import type { ReducedRecord } from '@shared/hydraulics/reduction';
import { describeRegime } from '@/features/fits/format';
import { effectiveLengthFromDraft } from '@/features/fits/geometry-form';
import { highKCurveForPlot, viewFromHighK, viewFromStored } from '@/features/fits/preview';
import { fit } from './fit-fixtures';

// Records made from the high-K model itself (modelHead): C_D from K = 5e-3 m/s and L_e = 3 m
// through the Hvorslev shape factor of this geometry.
const geometry = { casingRadiusM: 0.0254, screenRadiusM: 0.0508, boreholeRadiusM: 0.1016, screenLengthM: 3.048, intake: 'screen' as const, anisotropyRatio: 1 };
const K = 5e-3;
const LE = 3;
const cD = dampingParameterFromK('hvorslev', geometry, K, LE);
const scale = timeScaleSeconds(LE);

function record(): ReducedRecord {
  const n = 600;
  const dt = scale / 25;
  const e = Float64Array.from({ length: n }, (_, i) => i * dt);
  const h = Float64Array.from(e, (t) => modelHead({ dampingParameter: cD, effectiveLengthM: LE }, t));
  return {
    reference: 'depth', testType: 'rising-head', staticLevelM: 4, staticSource: 'entered', preTestCount: 0,
    testStartSeconds: 0, testStartIndex: 0, testStartSource: 'entered', h0M: 0.5,
    elapsedSeconds: e, displacementM: Float64Array.from(h, (x) => 0.5 * x), normalizedHead: h,
  };
}

describe('the high-K model in the workspace', () => {
  it('names the damping regime in words', () => {
    expect(describeRegime('underdamped')).toEqual({ label: 'Underdamped', meaning: 'the level oscillates about static as it recovers' });
    expect(describeRegime('overdamped').label).toBe('Overdamped');
    expect(describeRegime('critically-damped').meaning).toMatch(/without crossing/);
  });

  it('reads L_e as typed in the site unit: empty is the estimate, bad text a message', () => {
    expect(effectiveLengthFromDraft('', 'm')).toEqual({});
    expect(effectiveLengthFromDraft('2,5', 'm')).toEqual({ valueM: 2.5 });
    expect(effectiveLengthFromDraft('10', 'ft').valueM).toBeCloseTo(3.048, 12); // 1 ft = 0.3048 m exactly
    expect(effectiveLengthFromDraft('abc', 'm').error).toBe('Effective length L_e must be a number');
    expect(effectiveLengthFromDraft('0', 'm').error).toBe('Effective length L_e must be greater than 0');
  });

  it('previews K and C_D of a model record, with T0 = C_D √(L_e/g) in the straight-line fields', () => {
    const view = viewFromHighK(analyzeHighKReduced(record(), { variant: 'hvorslev', geometry, effectiveLengthM: LE }), record(), null);
    expect(Math.abs(view.kMetersPerSecond / K - 1)).toBeLessThan(0.01);
    expect(view.model).toBe('high-k');
    expect(view.highK!.regime).toBe('underdamped');
    expect(view.t0Seconds).toBeCloseTo(view.highK!.dampingParameter * view.highK!.timeScaleSeconds, 12);
    expect(view.slopePerSecond).toBeCloseTo(-1 / view.t0Seconds, 12);
    expect(view.window.source).toBe('all-readings');
  });

  it('samples the stored curve over the moving part of the record and ends at the record end', () => {
    const model = { dampingParameter: cD, effectiveLengthM: LE, timeOffsetSeconds: 0, timeScaleSeconds: scale };
    const curve = highKCurveForPlot(model, 1e4);
    expect(curve.timeSeconds).toHaveLength(401);
    expect(curve.timeSeconds[0]).toBe(0);
    expect(curve.normalizedHead[0]).toBe(1);
    expect(curve.timeSeconds[400]).toBe(1e4);
    // The 400 points span the recovery (envelope to 1e-3: 7 √(L_e/g) · 2/C_D), not the long tail.
    expect(curve.timeSeconds[399]).toBeCloseTo(7 * scale * (2 / cD), 9);
    expect(Math.min(...curve.normalizedHead)).toBeLessThan(-0.05);
    const short = highKCurveForPlot(model, 2);
    expect(short.timeSeconds).toHaveLength(400);
    expect(short.timeSeconds[399]).toBe(2);
    expect(highKResiduals(record(), model).residual.every((r) => Math.abs(r) < 1e-12)).toBe(true);
  });

  it('shows a stored high-K fit from its stored numbers, and a straight-line fit without them', () => {
    const highK = { dampingParameter: 0.5, regime: 'underdamped' as const, effectiveLengthM: 2, effectiveLengthEstimateM: 3, effectiveLengthFitted: true, timeScaleSeconds: 0.45, dampedPeriodSeconds: 2.9, residualRms: 0.01, timeOffsetSeconds: 0, kRelativeStandardError: 0.01 };
    const stored = fit({ model: 'high-k', result: { ...fit().result, highK } });
    expect(viewFromStored(stored).highK).toEqual(highK);
    expect(viewFromStored(stored).model).toBe('high-k');
    expect(viewFromStored(fit()).highK).toBeNull();
  });

  it('offers no window or line action on a high-K fit', () => {
    expect(flagAction({ code: 'window-outside-recommended' }, 'hvorslev', 'high-k')).toBeNull();
    expect(flagAction({ code: 'concave-upward' }, 'hvorslev', 'high-k')).toBeNull();
    expect(flagAction({ code: 'window-outside-recommended' }, 'hvorslev')?.patch.window).toEqual({ kind: 'head', upper: 0.25, lower: 0.15 });
    expect(flagAction({ code: 'intake-screen-in-filter-pack' }, 'hvorslev', 'high-k')?.patch).toEqual({ geometry: { intake: 'borehole' } });
  });
});
