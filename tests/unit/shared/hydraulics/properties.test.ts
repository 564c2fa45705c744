import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeRecord, type AnalyzeInput } from '@shared/hydraulics/analyze';
import { bouwerRiceK } from '@shared/hydraulics/bouwer-rice';
import type { FitLine, FitMethod } from '@shared/hydraulics/fitting';
import type { WellGeometry } from '@shared/hydraulics/geometry';
import { hvorslevK } from '@shared/hydraulics/hvorslev';
import { LENGTH_UNITS, lengthFromSi, lengthSeriesToSi, lengthToSi, type LengthUnit } from '@shared/units/length';
import { PRESSURE_UNITS, STANDARD_GRAVITY, pressureFromSi, pressureSeriesToSi, type PressureUnit } from '@shared/units/pressure';
import { TIME_UNITS, timeFromSi, timeSeriesToSi, type TimeUnit } from '@shared/units/time';
import { gaussian } from '../../../support/gaussian';

// Common practice (domain.md §7, item 15): a synthetic H0·exp(−t/T0) returns T0 and K within the
// noise bound, and the reference mode and the input units do not change H/H0 or K.

const SEED = 20240501;
const rel = (actual: number, expected: number) => Math.abs(actual / expected - 1);

interface Case {
  t0Seconds: number;
  samplesPerT0: number;
  jitter: number;
  h0M: number;
  staticDepthM: number;
  preTest: number;
  seed: number;
  method: FitMethod;
  line: FitLine;
  lengthUnit: LengthUnit;
  timeUnit: TimeUnit;
}

const caseArb: fc.Arbitrary<Case> = fc.record({
  t0Seconds: fc.double({ min: 0.5, max: 5e4, noNaN: true }),
  samplesPerT0: fc.integer({ min: 12, max: 120 }),
  jitter: fc.double({ min: 0, max: 0.4, noNaN: true }),
  h0M: fc.double({ min: 0.05, max: 5, noNaN: true }).chain((h) => fc.constantFrom(h, -h)),
  staticDepthM: fc.double({ min: 0.5, max: 40, noNaN: true }),
  preTest: fc.constantFrom(0, 5, 20),
  seed: fc.integer(),
  method: fc.constantFrom<FitMethod>('hvorslev', 'bouwer-rice'),
  line: fc.constantFrom<FitLine>('anchored', 'free'),
  lengthUnit: fc.constantFrom(...LENGTH_UNITS.map((u) => u.id)),
  timeUnit: fc.constantFrom(...TIME_UNITS.map((u) => u.id)),
});

const geometrySi: WellGeometry = {
  casingRadiusM: 0.0254,
  screenRadiusM: 0.0508,
  boreholeRadiusM: 0.1016,
  screenLengthM: 3.048,
  staticToScreenBottomM: 6,
  saturatedThicknessM: 20,
};

/** Times (s, with the test start at 0) and displacement s(t) = H0 exp(−t/T0) (+ noise), pre-test readings at s = 0. */
function synthetic(c: Case, noiseFraction = 0) {
  const dt = c.t0Seconds / c.samplesPerT0;
  const n = c.preTest + Math.ceil(4.6 * c.samplesPerT0);
  const jitter = gaussian(c.seed ^ 0x5bd1e995);
  const noise = gaussian(c.seed);
  const timeSeconds = new Float64Array(n);
  const displacementM = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const k = i - c.preTest;
    const wobble = k <= 0 ? 0 : Math.max(-0.45, Math.min(0.45, c.jitter * jitter()));
    const t = (k + wobble) * dt;
    timeSeconds[i] = t;
    const ideal = k < 0 ? 0 : c.h0M * Math.exp(-t / c.t0Seconds);
    displacementM[i] = ideal + noiseFraction * Math.abs(c.h0M) * noise();
  }
  return { timeSeconds, displacementM };
}

/** The synthetic record as depth below the measuring point, in the case's units, converted at the edge. */
function depthInput(c: Case, noiseFraction = 0): AnalyzeInput {
  const { timeSeconds, displacementM } = synthetic(c, noiseFraction);
  const timeUser = Float64Array.from(timeSeconds, (t) => timeFromSi(t, c.timeUnit));
  const depthUser = Float64Array.from(displacementM, (s) => lengthFromSi(c.staticDepthM + s, c.lengthUnit));
  const g = (m: number) => lengthToSi(lengthFromSi(m, c.lengthUnit), c.lengthUnit);
  return {
    record: { timeSeconds: timeSeriesToSi(timeUser, c.timeUnit), value: lengthSeriesToSi(depthUser, c.lengthUnit) },
    reduction: c.preTest >= 3 ? { reference: 'depth' } : { reference: 'depth', staticLevelM: lengthToSi(lengthFromSi(c.staticDepthM, c.lengthUnit), c.lengthUnit) },
    method: c.method,
    line: c.line,
    geometry: {
      casingRadiusM: g(geometrySi.casingRadiusM),
      screenRadiusM: g(geometrySi.screenRadiusM),
      boreholeRadiusM: g(geometrySi.boreholeRadiusM as number),
      screenLengthM: g(geometrySi.screenLengthM),
      staticToScreenBottomM: g(geometrySi.staticToScreenBottomM as number),
      saturatedThicknessM: g(geometrySi.saturatedThicknessM as number),
    },
  };
}

const expectedK = (method: FitMethod, t0Seconds: number) =>
  method === 'hvorslev' ? hvorslevK(geometrySi, t0Seconds).kMetersPerSecond : bouwerRiceK(geometrySi, t0Seconds).kMetersPerSecond;

describe('engine properties', () => {
  it('returns T0 and K of a noiseless exponential to 1e−9 in any units and sampling', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const a = analyzeRecord(depthInput(c));
        expect(rel(a.fit.t0Seconds, c.t0Seconds)).toBeLessThan(1e-9);
        expect(rel(a.k.kMetersPerSecond, expectedK(c.method, c.t0Seconds))).toBeLessThan(1e-9);
        expect(a.reduced.testType).toBe(c.h0M > 0 ? 'rising-head' : 'falling-head');
      }),
      { seed: SEED, numRuns: 150 },
    );
  });

  it('returns T0 and K within 1 % (anchored) or 5 % (free) under Gaussian noise of 0.2 % of H0', () => {
    // Bound (derived): with 100–200 readings per T0, the 0.15–0.25 window holds ≥ 50 readings with
    // σ(ln H/H0) ≈ 0.002/0.2 = 0.01 each. The anchored slope's standard error is then ≈ 0.01/(√50 × 1.6)
    // ≈ 0.1 %, plus ≤ 0.3 % of bias from the noisy H0 and pre-test static level: 1 % is > 5 σ. The free
    // slope rests on the window's width alone (0.51 T0): ≈ 0.01/(√50 × 0.51/√12) ≈ 1 %, so 5 % is 5 σ.
    fc.assert(
      fc.property(caseArb, fc.integer({ min: 100, max: 200 }), (c, samplesPerT0) => {
        const noisy = { ...c, preTest: 20, samplesPerT0 };
        const bound = c.line === 'anchored' ? 0.01 : 0.05;
        const a = analyzeRecord(depthInput(noisy, 0.002));
        expect(rel(a.fit.t0Seconds, c.t0Seconds)).toBeLessThan(bound);
        expect(rel(a.k.kMetersPerSecond, expectedK(c.method, c.t0Seconds))).toBeLessThan(bound);
        expect(a.flags.map((f) => f.code)).not.toContain('oscillation');
      }),
      { seed: SEED, numRuns: 150 },
    );
  });

  it('gives the same H/H0 and K for depth below the measuring point, head above a vented sensor and absolute pressure', () => {
    const baroArb = fc.record({
      knots: fc.integer({ min: 2, max: 40 }),
      startBefore: fc.double({ min: 0, max: 100, noNaN: true }),
      seed: fc.integer(),
      sensorHeadM: fc.double({ min: 1, max: 30, noNaN: true }),
      density: fc.double({ min: 990, max: 1030, noNaN: true }),
    });
    fc.assert(
      fc.property(caseArb, baroArb, (c0, b) => {
        const c = { ...c0, preTest: 20 };
        const { timeSeconds: t, displacementM: s } = synthetic(c, 0.001);
        const n = t.length;
        const depth = Float64Array.from(s, (x) => c.staticDepthM + x);
        const head = Float64Array.from(s, (x) => b.sensorHeadM - x);
        // barometer on its own clock: `knots` readings spanning the record, with arbitrary pressures
        const rand = gaussian(b.seed);
        const span = t[n - 1] - t[0] + b.startBefore;
        const bt = Float64Array.from({ length: b.knots }, (_, j) => t[0] - b.startBefore + (span * j) / (b.knots - 1) + (j === b.knots - 1 ? 1 : 0));
        const bp = Float64Array.from(bt, () => 101_325 + 800 * rand());
        const baroAt = (x: number) => {
          let j = 0;
          while (j < b.knots - 2 && bt[j + 1] < x) j++;
          return bp[j] + ((x - bt[j]) / (bt[j + 1] - bt[j])) * (bp[j + 1] - bp[j]);
        };
        const absolute = Float64Array.from(head, (h, i) => b.density * STANDARD_GRAVITY * h + baroAt(t[i]));
        const common = { method: c.method, line: c.line, geometry: geometrySi };
        const viaDepth = analyzeRecord({ ...common, record: { timeSeconds: t, value: depth }, reduction: { reference: 'depth' } });
        const viaVented = analyzeRecord({ ...common, record: { timeSeconds: t, value: head }, reduction: { reference: 'vented' } });
        const viaAbsolute = analyzeRecord({
          ...common,
          record: { timeSeconds: t, value: absolute },
          reduction: { reference: 'absolute', barometric: { timeSeconds: bt, pressurePa: bp }, waterDensityKgM3: b.density },
        });
        for (let i = 0; i < n; i += Math.max(1, Math.floor(n / 50))) {
          expect(Math.abs(viaVented.reduced.normalizedHead[i] - viaDepth.reduced.normalizedHead[i])).toBeLessThan(1e-9);
          expect(Math.abs(viaAbsolute.reduced.normalizedHead[i] - viaDepth.reduced.normalizedHead[i])).toBeLessThan(1e-9);
        }
        expect(rel(viaVented.k.kMetersPerSecond, viaDepth.k.kMetersPerSecond)).toBeLessThan(1e-9);
        expect(rel(viaAbsolute.k.kMetersPerSecond, viaDepth.k.kMetersPerSecond)).toBeLessThan(1e-9);
      }),
      { seed: SEED, numRuns: 100 },
    );
  });

  it('never changes K when the input units change', () => {
    const unitsArb = fc.record({
      lengthUnit: fc.constantFrom(...LENGTH_UNITS.map((u) => u.id)),
      timeUnit: fc.constantFrom(...TIME_UNITS.map((u) => u.id)),
      pressureA: fc.constantFrom(...PRESSURE_UNITS.map((u) => u.id)),
      pressureB: fc.constantFrom(...PRESSURE_UNITS.map((u) => u.id)),
    });
    fc.assert(
      fc.property(caseArb, unitsArb, (c, u) => {
        const inOwnUnits = analyzeRecord(depthInput(c, 0.001));
        const inOtherUnits = analyzeRecord(depthInput({ ...c, lengthUnit: u.lengthUnit, timeUnit: u.timeUnit }, 0.001));
        expect(rel(inOtherUnits.k.kMetersPerSecond, inOwnUnits.k.kMetersPerSecond)).toBeLessThan(1e-9);

        // the same absolute-pressure record written in two pressure units
        const { timeSeconds: t, displacementM: s } = synthetic({ ...c, preTest: 20 }, 0.001);
        const pa = Float64Array.from(s, (x) => 1000 * STANDARD_GRAVITY * (10 - x) + 101_325);
        const baro = { timeSeconds: Float64Array.of(t[0] - 1, t[t.length - 1] + 1), pressurePa: Float64Array.of(101_325, 101_325) };
        const inUnit = (unit: PressureUnit) => {
          const written = Float64Array.from(pa, (p) => pressureFromSi(p, unit, 1000));
          return analyzeRecord({
            method: c.method,
            geometry: geometrySi,
            record: { timeSeconds: t, value: pressureSeriesToSi(written, unit, 1000) },
            reduction: { reference: 'absolute', barometric: baro, waterDensityKgM3: 1000 },
          }).k.kMetersPerSecond;
        };
        expect(rel(inUnit(u.pressureA), inUnit(u.pressureB))).toBeLessThan(1e-9);
      }),
      { seed: SEED, numRuns: 100 },
    );
  });
});
