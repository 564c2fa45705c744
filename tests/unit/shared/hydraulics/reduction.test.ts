import { describe, expect, it } from 'vitest';
import { REFERENCE_MODES, reduceRecord } from '@shared/hydraulics/reduction';

/** A bail-down read as depth below the measuring point: static 2.0 m, 10 pre-test readings, H0 0.5 m. */
function bailDown(t0Seconds = 30) {
  const n = 200;
  const time = Float64Array.from({ length: n }, (_, i) => i);
  const depth = Float64Array.from(time, (t) => (t < 10 ? 2 : 2 + 0.5 * Math.exp(-(t - 10) / t0Seconds)));
  return { timeSeconds: time, value: depth };
}

describe('reducing a record', () => {
  it('takes the static level from the pre-test readings and the start at the step', () => {
    const r = reduceRecord(bailDown(), { reference: 'depth' });
    expect(r.staticSource).toBe('pre-test');
    expect(r.preTestCount).toBe(10);
    expect(r.staticLevelM).toBe(2);
    expect(r.testStartSource).toBe('detected');
    expect(r.testStartIndex).toBe(10);
    expect(r.testStartSeconds).toBe(10);
    expect(r.h0M).toBeCloseTo(0.5, 15);
    expect(r.normalizedHead[10]).toBe(1);
    expect(r.elapsedSeconds[0]).toBe(-10);
    expect(r.normalizedHead[40]).toBeCloseTo(Math.exp(-1), 12);
  });

  it('keeps the sign of the displacement: a bail-down read as depth is a rising-head test', () => {
    const r = reduceRecord(bailDown(), { reference: 'depth' });
    expect(r.testType).toBe('rising-head');
    expect(r.displacementM[10]).toBeGreaterThan(0);
  });

  it('treats a slug-in above a vented sensor as a falling-head test with the same H/H0', () => {
    const d = bailDown();
    const headAboveSensor = Float64Array.from(d.value, (depth) => 10 - (4 - depth)); // level rises by the same amount the bail lowered it
    const slugIn = reduceRecord({ timeSeconds: d.timeSeconds, value: headAboveSensor }, { reference: 'vented' });
    const bail = reduceRecord(d, { reference: 'depth' });
    expect(slugIn.testType).toBe('falling-head');
    expect(slugIn.h0M).toBeCloseTo(-0.5, 12);
    for (let i = 10; i < 200; i += 17) expect(slugIn.normalizedHead[i]).toBeCloseTo(bail.normalizedHead[i], 12);
  });

  it('starts a gradual step at its peak', () => {
    const d = bailDown();
    d.value[10] = 2.2;
    d.value[11] = 2.45;
    d.value[12] = 2.5;
    for (let i = 13; i < 200; i++) d.value[i] = 2 + 0.5 * Math.exp(-(i - 12) / 30);
    const r = reduceRecord(d, { reference: 'depth' });
    expect(r.testStartIndex).toBe(12);
    expect(r.normalizedHead[12]).toBe(1);
  });

  it('measures time from an entered test start and takes the static level before it', () => {
    const r = reduceRecord(bailDown(), { reference: 'depth', testStartSeconds: 9.5 });
    expect(r.testStartSource).toBe('entered');
    expect(r.testStartIndex).toBe(10);
    expect(r.elapsedSeconds[10]).toBe(0.5);
    expect(r.preTestCount).toBe(10);
  });

  it('uses an entered static level and finds the start at the largest displacement', () => {
    const d = bailDown();
    const r = reduceRecord({ timeSeconds: d.timeSeconds.subarray(10), value: d.value.subarray(10) }, { reference: 'depth', staticLevelM: 2 });
    expect(r.staticSource).toBe('entered');
    expect(r.testStartIndex).toBe(0);
    expect(r.h0M).toBeCloseTo(0.5, 15);
  });

  it('turns absolute pressure into head with a barometric record on its own clock', () => {
    const d = bailDown();
    const rho = 998.2;
    const g = 9.80665;
    // barometer every 7 s from −3 s, drifting linearly, so linear interpolation is exact
    const baroTime = Float64Array.from({ length: 31 }, (_, i) => -3 + 7 * i);
    const baroAt = (t: number) => 101_000 + 2.5 * t;
    const baroPa = Float64Array.from(baroTime, baroAt);
    const absolutePa = Float64Array.from(d.timeSeconds, (t, i) => rho * g * (5 - d.value[i]) + baroAt(t));
    const absolute = reduceRecord(
      { timeSeconds: d.timeSeconds, value: absolutePa },
      { reference: 'absolute', barometric: { timeSeconds: baroTime, pressurePa: baroPa }, waterDensityKgM3: rho },
    );
    const depth = reduceRecord(d, { reference: 'depth' });
    expect(absolute.staticLevelM).toBeCloseTo(3, 9);
    expect(absolute.testType).toBe('rising-head');
    for (let i = 10; i < 200; i += 13) expect(absolute.normalizedHead[i]).toBeCloseTo(depth.normalizedHead[i], 9);
  });

  it('returns typed arrays of the record’s length', () => {
    const r = reduceRecord(bailDown(), { reference: 'depth' });
    expect(r.normalizedHead).toBeInstanceOf(Float64Array);
    expect(r.displacementM).toBeInstanceOf(Float64Array);
    expect(r.elapsedSeconds.length).toBe(200);
  });

  it('offers the three reference modes to a select box', () => {
    expect(REFERENCE_MODES.map((m) => m.id)).toEqual(['depth', 'vented', 'absolute']);
  });
});
