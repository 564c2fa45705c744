import { describe, expect, it } from 'vitest';
import { analyzeRecord } from '@shared/hydraulics/analyze';
import { crossingSeconds } from '@shared/hydraulics/fitting';

const T0 = 40;
const n = 400;
const time = Float64Array.from({ length: n }, (_, i) => i);
const head = Float64Array.from(time, (t) => 0.5 * Math.exp(-t / T0));
const geometry = { casingRadiusM: 0.0254, screenRadiusM: 0.0254, screenLengthM: 3 };
const analyse = (line: 'anchored' | 'free') =>
  analyzeRecord({ record: { timeSeconds: time, value: head }, reduction: { reference: 'vented', staticLevelM: 0 }, method: 'hvorslev', geometry, line });

describe('the Hvorslev model curve', () => {
  it('falls to one tenth of H0 at 2.3026 T0', () => {
    const { fit } = analyse('anchored');
    const lineAt = (t: number) => Math.exp(fit.intercept + fit.slopePerSecond * t);
    // Hvorslev 1951, p. 12: H(2.3026 T0)/H0 = 0.1 ±1e−4
    expect(Math.abs(lineAt(2.3026 * fit.t0Seconds) - 0.1)).toBeLessThan(1e-4);
  });

  it('takes 2.3 T0 to recover 90 % on the record', () => {
    const { reduced, fit } = analyse('anchored');
    // Hvorslev 1951, pp. 12–13: 90 % recovery takes 2.3 T0, ±0.01 T0
    expect(Math.abs((crossingSeconds(reduced, 0.1) ?? NaN) / fit.t0Seconds - 2.3)).toBeLessThan(0.01);
  });

  it('defines T0 as the time at which H/H0 is 1/e (printed 0.37)', () => {
    const { fit } = analyse('anchored');
    // Hvorslev 1951, p. 12 (common practice): 1/e ≈ 0.368, printed 0.37, ±0.005
    expect(Math.exp(-1)).toBeCloseTo(0.37, 2);
    expect(fit.lineCrossingSeconds).toBeCloseTo(fit.t0Seconds, 12);
    expect(fit.t0Seconds).toBeCloseTo(T0, 9);
    // the record's own 1/e crossing, interpolated between whole seconds, ±0.01 s
    expect(Math.abs((fit.recordCrossingSeconds ?? NaN) - T0)).toBeLessThan(0.01);
  });

  it('reads the free line’s 1/e crossing from its intercept', () => {
    const { fit } = analyse('free');
    expect(Math.abs(fit.intercept)).toBeLessThan(1e-9);
    expect(fit.lineCrossingSeconds).toBeCloseTo(fit.t0Seconds * (1 + fit.intercept), 12);
  });
});
