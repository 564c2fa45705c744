import { describe, expect, it } from 'vitest';
import { analyzeRecord } from '@shared/hydraulics/analyze';
import { crossingSeconds } from '@shared/hydraulics/fitting';
import { hvorslevK } from '@shared/hydraulics/hvorslev';
import { kFromSi } from '@shared/units/conductivity';
import { lengthFromSi, lengthSeriesToSi, lengthToSi } from '@shared/units/length';

// Slug-test worked example in a university groundwater course (Cleveland, CE 4363, 1999)
const ft = (x: number) => lengthToSi(x, 'ft');
const dtwFt = [14.87, 14.59, 14.37, 14.2, 14.11, 14.05, 14.03, 14.01, 14.0, 13.99];
const geometry = { casingRadiusM: ft(0.083), screenRadiusM: ft(0.083), screenLengthM: ft(10) };
const record = { timeSeconds: Float64Array.from(dtwFt, (_, i) => i), value: lengthSeriesToSi(dtwFt, 'ft') };
const reduction = { reference: 'depth' as const, staticLevelM: ft(13.99) };
const kFtPerS = (kMetersPerSecond: number) => lengthFromSi(kMetersPerSecond, 'ft');

describe('the CE 4363 slug-test worked example', () => {
  it('reduces the depth readings to H/H0 from 1 to 0 with the entered static level', () => {
    const { reduced } = analyzeRecord({ record, reduction, method: 'hvorslev', geometry });
    expect(reduced.testStartIndex).toBe(0);
    expect(reduced.testType).toBe('rising-head');
    expect(lengthFromSi(reduced.h0M, 'ft')).toBeCloseTo(0.88, 12);
    expect(reduced.normalizedHead[0]).toBe(1);
    expect(reduced.normalizedHead[9]).toBeCloseTo(0, 12);
  });

  it('gives K from the two-point slope between t = 0 and 4.4 s', () => {
    const k = hvorslevK(geometry, 4.4 / Math.LN10);
    // Cleveland CE 4363 (1999): K = 8.64e−4 ft/s ±0.1 % and 74.6 ft/d ±0.1 %
    expect(Math.abs(kFtPerS(k.kMetersPerSecond) / 8.64e-4 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(kFromSi(k.kMetersPerSecond, 'ft/d') / 74.6 - 1)).toBeLessThan(1e-3);
    // Cleveland CE 4363 (1999): shape factor 2πL/ln(L/R) = 13.1 ft ±0.05 ft (the simplified form)
    expect(lengthFromSi(k.simplified.shapeFactorM, 'ft')).toBeCloseTo(13.1, 1);
  });

  it('places H/H0 = 0.1 near 4.4 s on the record itself', () => {
    const { reduced } = analyzeRecord({ record, reduction, method: 'hvorslev', geometry });
    // Cleveland CE 4363 (1999) reads 4.4 s off the plot; log-linear interpolation gives 4.44 s, ±0.1 s
    expect(Math.abs((crossingSeconds(reduced, 0.1) ?? NaN) - 4.4)).toBeLessThan(0.1);
  });

  it('gives K from an anchored least-squares line over t = 0–8 s', () => {
    const { fit, k } = analyzeRecord({ record, reduction, method: 'hvorslev', geometry, line: 'anchored', window: { kind: 'time', fromSeconds: 0, toSeconds: 8 } });
    expect(fit.count).toBe(9);
    // derived from Hvorslev (1951) on the CE 4363 data: anchored fit 8.79e−4 ft/s ±0.1 %
    expect(Math.abs(kFtPerS(k.kMetersPerSecond) / 8.79e-4 - 1)).toBeLessThan(1e-3);
    expect(fit.intercept).toBe(0);
  });

  it('gives K from a free least-squares line over t = 0–8 s', () => {
    const { fit, k } = analyzeRecord({ record, reduction, method: 'hvorslev', geometry, line: 'free', window: { kind: 'time', fromSeconds: 0, toSeconds: 8 } });
    // derived from Hvorslev (1951) on the CE 4363 data: free fit 9.32e−4 ft/s ±0.1 %
    expect(Math.abs(kFtPerS(k.kMetersPerSecond) / 9.32e-4 - 1)).toBeLessThan(1e-3);
    expect(fit.intercept).not.toBe(0);
  });

  it('refuses a window reaching the static level, where ln(H/H0) is undefined', () => {
    expect(() => analyzeRecord({ record, reduction, method: 'hvorslev', geometry, window: { kind: 'time', fromSeconds: 0, toSeconds: 9 } })).toThrow(
      'fit.window: includes a reading with H/H0 ≤ 0 (t = 9 s, H/H0 = ',
    );
  });
});
