import { describe, expect, it } from 'vitest';
import { fitLine, RECOMMENDED_HEAD_RANGES } from '@shared/hydraulics/fitting';
import { reduceRecord } from '@shared/hydraulics/reduction';

function decay(t0Seconds: number, n: number, dtSeconds: number, h0 = 1) {
  const time = Float64Array.from({ length: n }, (_, i) => i * dtSeconds);
  return reduceRecord({ timeSeconds: time, value: Float64Array.from(time, (t) => h0 * Math.exp(-t / t0Seconds)) }, { reference: 'vented', staticLevelM: 0 });
}

describe('fitting the straight line', () => {
  it('uses the method’s recommended head range by default when it holds at least 3 readings', () => {
    const reduced = decay(20, 200, 1);
    const hv = fitLine(reduced, { method: 'hvorslev' });
    expect(hv.window.source).toBe('recommended');
    expect(hv.window.window).toEqual({ kind: 'head', ...RECOMMENDED_HEAD_RANGES.hvorslev });
    expect(hv.window.headMax).toBeLessThanOrEqual(0.25);
    expect(hv.window.headMin).toBeGreaterThan(0.15);
    const br = fitLine(reduced, { method: 'bouwer-rice' });
    expect(br.window.window).toEqual({ kind: 'head', upper: 0.3, lower: 0.2 });
    expect(br.t0Seconds).toBeCloseTo(20, 10);
  });

  it('falls back to 0.05 < H/H0 ≤ 1 when the recommended range holds fewer than 3 readings', () => {
    const reduced = decay(2, 10, 1);
    const fit = fitLine(reduced, { method: 'hvorslev' });
    expect(fit.window.source).toBe('fallback');
    expect(fit.window.window).toEqual({ kind: 'head', upper: 1, lower: 0.05 });
    expect(fit.count).toBe(6); // exp(−t/2) > 0.05 for t = 0…5
  });

  it('fits an entered head window or time window', () => {
    const reduced = decay(20, 200, 1);
    const head = fitLine(reduced, { method: 'hvorslev', window: { kind: 'head', upper: 0.6, lower: 0.3 } });
    expect(head.window.source).toBe('entered');
    expect(head.window.headMax).toBeLessThanOrEqual(0.6);
    const time = fitLine(reduced, { method: 'hvorslev', window: { kind: 'time', fromSeconds: 5, toSeconds: 15 } });
    expect(time.count).toBe(11);
    expect(time.window.fromSeconds).toBe(5);
    expect(time.window.toSeconds).toBe(15);
    expect(time.t0Seconds).toBeCloseTo(20, 10);
  });

  it('reports slope, intercept, T0, r² and count of a perfect exponential', () => {
    const fit = fitLine(decay(25, 300, 0.5), { method: 'hvorslev', line: 'free' });
    expect(fit.slopePerSecond).toBeCloseTo(-1 / 25, 12);
    expect(fit.intercept).toBeCloseTo(0, 10);
    expect(fit.t0Seconds).toBeCloseTo(25, 9);
    expect(fit.rSquared).toBeCloseTo(1, 12);
    expect(fit.count).toBe(fit.window.count);
    expect(fit.reference).toContain('Bouwer (1989, memory)');
  });

  it('takes the free line’s intercept as the effective H0', () => {
    // a record whose later segment extrapolates to 0.8 H0 at t = 0
    const time = Float64Array.from({ length: 200 }, (_, i) => i);
    const head = Float64Array.from(time, (t) => (t === 0 ? 1 : 0.8 * Math.exp(-t / 30)));
    const reduced = reduceRecord({ timeSeconds: time, value: head }, { reference: 'vented', staticLevelM: 0 });
    const fit = fitLine(reduced, { method: 'bouwer-rice', line: 'free', window: { kind: 'head', upper: 0.5, lower: 0.1 } });
    // head above static is a falling-head test: H0 and the effective H0 carry its negative sign
    expect(fit.effectiveH0M).toBeCloseTo(-0.8, 10);
    expect(fit.t0Seconds).toBeCloseTo(30, 9);
    expect(fit.lineCrossingSeconds).toBeCloseTo(30 * (1 + Math.log(0.8)), 9);
  });

  it('fits the anchored line through H/H0 = 1 at t = 0', () => {
    const fit = fitLine(decay(25, 300, 0.5), { method: 'hvorslev', line: 'anchored' });
    expect(fit.intercept).toBe(0);
    expect(fit.effectiveH0M).toBe(-1);
    expect(fit.reference).toContain('through the origin');
  });

  it('reports the anchored line’s r² about the origin (1 − SS_res/Σy²), never a negative figure', () => {
    // a record whose later segment extrapolates to 0.3 H0: over the narrow window 0.25–0.15 the line forced through (0, 1) misses it
    // (regression through the origin: Eisenhauer 2003, memory)
    const time = Float64Array.from({ length: 400 }, (_, i) => i);
    const head = Float64Array.from(time, (t) => (t === 0 ? 1 : 0.3 * Math.exp(-t / 300)));
    const reduced = reduceRecord({ timeSeconds: time, value: head }, { reference: 'vented', staticLevelM: 0 });
    const fit = fitLine(reduced, { method: 'hvorslev', window: { kind: 'head', upper: 0.25, lower: 0.15 } });
    let stt = 0;
    let sty = 0;
    let syy = 0;
    const points: [number, number][] = [];
    for (let i = 0; i < 400; i++) {
      const h = reduced.normalizedHead[i];
      if (!(h > 0.15 && h <= 0.25)) continue;
      const t = reduced.elapsedSeconds[i];
      const y = Math.log(h);
      points.push([t, y]);
      stt += t * t;
      sty += t * y;
      syy += y * y;
    }
    const slope = sty / stt;
    const ssRes = points.reduce((sum, [t, y]) => sum + (y - slope * t) ** 2, 0);
    expect(fit.rSquared).toBeCloseTo(1 - ssRes / syy, 12);
    expect(fit.rSquared).toBeGreaterThanOrEqual(0);
    expect(fit.rSquared).toBeLessThanOrEqual(1);
    // about the mean the same line explains less than nothing: kept for the QC only, never shown
    expect(fit.rSquaredAboutMean).toBeLessThan(0);
  });
});
