import { describe, expect, it } from 'vitest';
import { analyzeRecord, type AnalyzeInput } from '@shared/hydraulics/analyze';
import { EngineInputError } from '@shared/hydraulics/errors';

const time = Float64Array.from({ length: 50 }, (_, i) => i);
const good: AnalyzeInput = {
  record: { timeSeconds: time, value: Float64Array.from(time, (t) => 2 + 0.5 * Math.exp(-t / 10)) },
  reduction: { reference: 'depth', staticLevelM: 2 },
  method: 'hvorslev',
  geometry: { casingRadiusM: 0.0254, screenRadiusM: 0.0254, screenLengthM: 3 },
};

function errorOf(run: () => unknown): EngineInputError {
  try {
    run();
  } catch (e) {
    if (e instanceof EngineInputError) return e;
    throw e;
  }
  throw new Error('no error thrown');
}

describe('invalid engine inputs', () => {
  it('refuses a zero casing radius, naming the field', () => {
    const e = errorOf(() => analyzeRecord({ ...good, geometry: { ...good.geometry, casingRadiusM: 0 } }));
    expect(e.field).toBe('geometry.casingRadiusM');
    expect(e.message).toBe('geometry.casingRadiusM: must be greater than 0 (got 0)');
  });

  it('refuses a negative screen radius', () => {
    expect(() => analyzeRecord({ ...good, geometry: { ...good.geometry, screenRadiusM: -0.02 } })).toThrow(
      'geometry.screenRadiusM: must be greater than 0 (got -0.02)',
    );
  });

  it('refuses a zero or negative screen length', () => {
    expect(() => analyzeRecord({ ...good, geometry: { ...good.geometry, screenLengthM: 0 } })).toThrow('geometry.screenLengthM: must be greater than 0 (got 0)');
    expect(() =>
      analyzeRecord({ ...good, method: 'bouwer-rice', geometry: { ...good.geometry, staticToScreenBottomM: -1, saturatedThicknessM: 10 } }),
    ).toThrow('geometry.staticToScreenBottomM: must be greater than 0 (got -1)');
  });

  it('refuses a screen radius larger than the borehole radius', () => {
    expect(() => analyzeRecord({ ...good, geometry: { ...good.geometry, screenRadiusM: 0.06, boreholeRadiusM: 0.05 } })).toThrow(
      'geometry.screenRadiusM: 0.06 m is larger than the borehole radius 0.05 m; the screen must fit in the borehole',
    );
  });

  it('refuses time that does not increase', () => {
    const t = Float64Array.from(time);
    t[7] = t[6];
    expect(() => analyzeRecord({ ...good, record: { ...good.record, timeSeconds: t } })).toThrow(
      'record.timeSeconds: time must increase strictly; reading 8 (t = 6 s) does not come after reading 7 (t = 6 s)',
    );
  });

  it('refuses a record of fewer than 3 readings', () => {
    expect(() => analyzeRecord({ ...good, record: { timeSeconds: time.subarray(0, 2), value: good.record.value.subarray(0, 2) } })).toThrow(
      'record: has 2 reading(s); at least 3 are needed to fit a line',
    );
  });

  it('refuses a record with fewer than 3 readings from the test start on', () => {
    expect(() => analyzeRecord({ ...good, reduction: { ...good.reduction, testStartSeconds: 48 } })).toThrow(
      'record: has 2 reading(s) from the test start on; at least 3 are needed to fit a line',
    );
  });

  it('refuses a record without displacement', () => {
    expect(() => analyzeRecord({ ...good, record: { timeSeconds: time, value: new Float64Array(50).fill(2) } })).toThrow(
      'record: shows no displacement at the test start (H0 = 0 m); check the static level and the test start',
    );
  });

  it('refuses a head window reaching H/H0 ≤ 0', () => {
    expect(() => analyzeRecord({ ...good, window: { kind: 'head', upper: 0.5, lower: 0 } })).toThrow(
      'fit.window.lower: must be above 0 (got 0): ln(H/H0) is undefined at H/H0 ≤ 0',
    );
  });

  it('refuses a time window that includes readings with H/H0 ≤ 0', () => {
    const v = Float64Array.from(good.record.value);
    v[30] = 1.999;
    expect(() => analyzeRecord({ ...good, record: { ...good.record, value: v }, window: { kind: 'time', fromSeconds: 0, toSeconds: 40 }, allowOscillation: true })).toThrow(
      'fit.window: includes a reading with H/H0 ≤ 0 (t = 30 s, H/H0 = -0.002); ln(H/H0) is undefined there, so end the window before the record reaches static',
    );
  });

  it('refuses a barometric series that does not cover the record', () => {
    const baroTime = Float64Array.from({ length: 10 }, (_, i) => 5 + i * 5);
    expect(() =>
      analyzeRecord({
        ...good,
        record: { timeSeconds: time, value: Float64Array.from(good.record.value, (d) => 101_325 + 9806.65 * (5 - d)) },
        reduction: { reference: 'absolute', staticLevelM: 3, waterDensityKgM3: 1000, barometric: { timeSeconds: baroTime, pressurePa: new Float64Array(10).fill(101_325) } },
      }),
    ).toThrow('barometric: covers 5–50 s but the record runs 0–49 s; the barometric series must cover the whole record');
  });

  it('asks for the static level when no readings precede the test start', () => {
    // the record starts displaced (a logger started late): there is no pre-test reading to take the static level from
    expect(() => analyzeRecord({ ...good, reduction: { reference: 'depth' } })).toThrow(
      'staticLevelM: No readings before the test start and no static level entered: enter the static level',
    );
  });

  it('asks for the static level when too few readings precede the step', () => {
    const t = Float64Array.from({ length: 52 }, (_, i) => i);
    const value = Float64Array.from(t, (x) => (x < 2 ? 2 : 2 + 0.5 * Math.exp(-(x - 2) / 10)));
    expect(() => analyzeRecord({ ...good, record: { timeSeconds: t, value }, reduction: { reference: 'depth' } })).toThrow(
      'staticLevelM: only 2 reading(s) precede the test start; enter the static level or include at least 3 pre-test readings',
    );
  });

  it('asks for the barometric series and the water density for an absolute sensor', () => {
    expect(() => analyzeRecord({ ...good, reduction: { reference: 'absolute', staticLevelM: 3 } })).toThrow(
      'barometric: is required for an absolute (non-vented) sensor',
    );
  });
});
