import { STANDARD_GRAVITY } from '../units/pressure';
import type { UnitOption } from '../units/unit-option';
import { EngineInputError, formatNumber, requireFinite, requirePositive } from './errors';

/**
 * What the record's value column measures:
 * - depth: depth to water below the measuring point, m (tape, or a logger converted to depth);
 * - vented: head of water above a vented (gauge) sensor, m;
 * - absolute: absolute pressure at a non-vented sensor, Pa, compensated with a barometric series.
 */
export type ReferenceMode = 'depth' | 'vented' | 'absolute';

export const REFERENCE_MODES: readonly UnitOption<ReferenceMode>[] = [
  { id: 'depth', label: 'Depth to water below the measuring point' },
  { id: 'vented', label: 'Head above a vented sensor' },
  { id: 'absolute', label: 'Absolute pressure with a barometric record' },
];

export interface RawRecord {
  /** Seconds on the record's clock (elapsed or epoch); must increase strictly. */
  timeSeconds: Float64Array;
  /** m for 'depth' and 'vented', Pa for 'absolute'. */
  value: Float64Array;
}

export interface BarometricSeries {
  /** Seconds on the same clock as the record, at the barometer's own sampling times. */
  timeSeconds: Float64Array;
  pressurePa: Float64Array;
}

export interface ReductionSettings {
  reference: ReferenceMode;
  /**
   * Entered static level, in the reference's own terms: depth below the measuring point for
   * 'depth', head above the sensor for 'vented' and 'absolute' (after barometric compensation).
   * Omitted: the mean of the pre-test readings.
   */
  staticLevelM?: number;
  /** Entered test start on the record's clock. Omitted: detected at the step. */
  testStartSeconds?: number;
  /** Required for 'absolute'. */
  barometric?: BarometricSeries;
  /** Density of the water column, kg/m³; required for 'absolute'. */
  waterDensityKgM3?: number;
}

export type TestType = 'rising-head' | 'falling-head';

export interface ReducedRecord {
  reference: ReferenceMode;
  /** rising-head: water below static at the start (bail-down, slug-out); falling-head: above. */
  testType: TestType;
  staticLevelM: number;
  staticSource: 'entered' | 'pre-test';
  preTestCount: number;
  testStartSeconds: number;
  testStartIndex: number;
  testStartSource: 'entered' | 'detected';
  /** Displacement at the test start, m; positive for a rising-head test. */
  h0M: number;
  /** t − test start, s, for every reading (negative before the start). */
  elapsedSeconds: Float64Array;
  /** s = static − level, m (level as a height), so a bail-down starts positive and shrinks. */
  displacementM: Float64Array;
  /** H/H0: 1 at the start, 0 at static. */
  normalizedHead: Float64Array;
}

/** Smallest |H0| treated as a displacement: a nanometre is below any sensor's resolution. */
const MIN_DISPLACEMENT_M = 1e-9;
/** Readings before the step needed to estimate the static level. */
const MIN_PRE_TEST_READINGS = 3;

function badTime(field: string, t: Float64Array, i: number): EngineInputError {
  if (!Number.isFinite(t[i])) return new EngineInputError(field, `reading ${i + 1} has no finite time (${t[i]})`);
  return new EngineInputError(
    field,
    `time must increase strictly; reading ${i + 1} (t = ${t[i]} s) does not come after reading ${i} (t = ${t[i - 1]} s)`,
  );
}

function nonFiniteValue(field: string, values: Float64Array, i: number): EngineInputError {
  return new EngineInputError(field, `reading ${i + 1} is not a finite number (${values[i]})`);
}

export function validateTimes(field: string, timeSeconds: Float64Array): void {
  let previous = -Infinity;
  for (let i = 0; i < timeSeconds.length; i++) {
    const t = timeSeconds[i];
    if (!(t > previous) || t === Infinity) throw badTime(field, timeSeconds, i);
    previous = t;
  }
}

function validateBarometric(settings: ReductionSettings, t: Float64Array): BarometricSeries {
  const baro = settings.barometric;
  if (!baro) throw new EngineInputError('barometric', 'is required for an absolute (non-vented) sensor');
  if (settings.waterDensityKgM3 === undefined) {
    throw new EngineInputError('waterDensityKgM3', 'is required to turn absolute pressure into head');
  }
  requirePositive('waterDensityKgM3', settings.waterDensityKgM3);
  const { timeSeconds: bt, pressurePa: bp } = baro;
  if (bt.length !== bp.length) throw new EngineInputError('barometric', `has ${bt.length} times but ${bp.length} pressures`);
  if (bt.length < 2) throw new EngineInputError('barometric', `has ${bt.length} reading(s); at least 2 are needed to interpolate`);
  validateTimes('barometric.timeSeconds', bt);
  for (let i = 0; i < bp.length; i++) if (!Number.isFinite(bp[i])) throw nonFiniteValue('barometric.pressurePa', bp, i);
  const n = t.length;
  const m = bt.length;
  if (bt[0] > t[0] || bt[m - 1] < t[n - 1]) {
    throw new EngineInputError(
      'barometric',
      `covers ${bt[0]}–${bt[m - 1]} s but the record runs ${t[0]}–${t[n - 1]} s; the barometric series must cover the whole record`,
    );
  }
  return baro;
}

/**
 * One pass over the record: checks times and values, writes the water level as a height (m, up
 * positive) into `out`, and returns the index of the largest jump between consecutive levels (the
 * first reading after the step). For 'absolute' the barometric series is linearly interpolated to
 * the record's times by a merge walk.
 */
function levelsOf(record: RawRecord, settings: ReductionSettings, out: Float64Array): number {
  const { timeSeconds: t, value: v } = record;
  const n = t.length;
  const mode = settings.reference === 'depth' ? 0 : settings.reference === 'vented' ? 1 : 2;
  const baro = mode === 2 ? validateBarometric(settings, t) : undefined;
  const bt = baro ? baro.timeSeconds : t;
  const bp = baro ? baro.pressurePa : v;
  const m = bt.length;
  const perPascal = mode === 2 ? 1 / ((settings.waterDensityKgM3 as number) * STANDARD_GRAVITY) : 1;
  let j = 0;
  let previousTime = -Infinity;
  let previousLevel = 0;
  let step = 1;
  let largestJump = -1;
  for (let i = 0; i < n; i++) {
    const ti = t[i];
    if (!(ti > previousTime) || ti === Infinity) throw badTime('record.timeSeconds', t, i);
    previousTime = ti;
    const vi = v[i];
    if (vi - vi !== 0) throw nonFiniteValue('record.value', v, i);
    let level: number;
    if (mode === 0) level = -vi;
    else if (mode === 1) level = vi;
    else {
      while (j < m - 2 && bt[j + 1] < ti) j++;
      const f = (ti - bt[j]) / (bt[j + 1] - bt[j]);
      level = (vi - (bp[j] + f * (bp[j + 1] - bp[j]))) * perPascal;
    }
    out[i] = level;
    if (i > 0) {
      const jump = Math.abs(level - previousLevel);
      if (jump > largestJump) {
        largestJump = jump;
        step = i;
      }
    }
    previousLevel = level;
  }
  return step;
}

function firstIndexAtOrAfter(t: Float64Array, seconds: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (t[mid] < seconds) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Reduces a raw record to displacement and normalized head in three passes. Allocates three
 * Float64Arrays of the record's length and nothing per sample.
 */
export function reduceRecord(record: RawRecord, settings: ReductionSettings): ReducedRecord {
  const { timeSeconds: t, value } = record;
  const n = t.length;
  if (value.length !== n) {
    throw new EngineInputError('record.value', `has ${value.length} readings but record.timeSeconds has ${n}`);
  }
  if (n < 3) throw new EngineInputError('record', `has ${n} reading(s); at least 3 are needed to fit a line`);
  if (settings.reference !== 'depth' && settings.reference !== 'vented' && settings.reference !== 'absolute') {
    throw new EngineInputError('reference', `must be depth, vented or absolute (got "${String(settings.reference)}")`);
  }

  // The level is written into the displacement array and turned into displacement in place.
  const displacement = new Float64Array(n);
  const step = levelsOf(record, settings, displacement);
  const level = displacement;

  let testStartIndex = -1;
  let testStartSource: ReducedRecord['testStartSource'] = 'detected';
  let preTestEnd: number;
  if (settings.testStartSeconds !== undefined) {
    requireFinite('testStartSeconds', settings.testStartSeconds);
    testStartIndex = firstIndexAtOrAfter(t, settings.testStartSeconds);
    if (testStartIndex >= n) {
      throw new EngineInputError('testStartSeconds', `${settings.testStartSeconds} s is after the last reading (t = ${t[n - 1]} s)`);
    }
    testStartSource = 'entered';
    preTestEnd = testStartIndex;
  } else {
    preTestEnd = settings.staticLevelM === undefined ? step : 0;
  }

  let staticHeight: number;
  let staticSource: ReducedRecord['staticSource'];
  if (settings.staticLevelM !== undefined) {
    requireFinite('staticLevelM', settings.staticLevelM);
    staticHeight = settings.reference === 'depth' ? -settings.staticLevelM : settings.staticLevelM;
    staticSource = 'entered';
  } else {
    if (preTestEnd < MIN_PRE_TEST_READINGS) {
      throw new EngineInputError(
        'staticLevelM',
        `only ${preTestEnd} reading(s) precede the test start; enter the static level or include at least ${MIN_PRE_TEST_READINGS} pre-test readings`,
      );
    }
    let sum = 0;
    for (let i = 0; i < preTestEnd; i++) sum += level[i];
    staticHeight = sum / preTestEnd;
    staticSource = 'pre-test';
  }

  let peak = preTestEnd;
  let peakAbs = -1;
  for (let i = 0; i < n; i++) {
    const s = staticHeight - level[i];
    displacement[i] = s;
    const a = s < 0 ? -s : s;
    if (a > peakAbs && i >= preTestEnd) {
      peakAbs = a;
      peak = i;
    }
  }
  // The peak of the step: the first reading after an instantaneous step, the top of a gradual one.
  if (testStartIndex < 0) testStartIndex = peak;

  const readingsFromStart = n - testStartIndex;
  if (readingsFromStart < 3) {
    throw new EngineInputError('record', `has ${readingsFromStart} reading(s) from the test start on; at least 3 are needed to fit a line`);
  }
  const h0M = displacement[testStartIndex];
  if (!(Math.abs(h0M) > MIN_DISPLACEMENT_M)) {
    throw new EngineInputError('record', `shows no displacement at the test start (H0 = ${formatNumber(h0M)} m); check the static level and the test start`);
  }

  const testStartSeconds = settings.testStartSeconds ?? t[testStartIndex];
  const elapsedSeconds = new Float64Array(n);
  const normalizedHead = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    elapsedSeconds[i] = t[i] - testStartSeconds;
    normalizedHead[i] = displacement[i] / h0M;
  }

  return {
    reference: settings.reference,
    testType: h0M > 0 ? 'rising-head' : 'falling-head',
    staticLevelM: settings.reference === 'depth' ? -staticHeight : staticHeight,
    staticSource,
    preTestCount: staticSource === 'pre-test' ? preTestEnd : testStartIndex,
    testStartSeconds,
    testStartIndex,
    testStartSource,
    h0M,
    elapsedSeconds,
    displacementM: displacement,
    normalizedHead,
  };
}
