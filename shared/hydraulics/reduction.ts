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

/** Code of the refusal when the record's shape does not show where the test starts. */
export const TEST_START_NOT_FOUND = 'TEST_START_NOT_FOUND';
/** Code of the refusal when no reading precedes the test start and no static level is entered. */
export const NO_PRE_TEST_READINGS = 'NO_PRE_TEST_READINGS';
/** Kfield's choice: a detected start farther than this share of the record's duration from the largest change in level is a guess. */
export const START_TOLERANCE_FRACTION = 0.05;
/** Kfield's choice: the pre-test readings scatter (about their trend) by at most this share of H0. */
const PRE_TEST_SCATTER_FRACTION = 0.05;
/** Kfield's choice: the pre-test trend moves the level by at most this share of H0 over the pre-test readings. */
const PRE_TEST_TREND_FRACTION = 0.5;
/** A pre-test trend is used (rather than the mean) when its slope exceeds this many standard errors. */
const TREND_T_STATISTIC = 4;
const MIN_TREND_READINGS = 5;
/** Readings within this many σ of the largest displacement count as the top of the step. */
const PEAK_NOISE_SIGMAS = 3;

function noPreTestReadings(): EngineInputError {
  return new EngineInputError('staticLevelM', 'No readings before the test start and no static level entered: enter the static level', {
    code: NO_PRE_TEST_READINGS,
  });
}

function tooFewPreTest(count: number): EngineInputError {
  return new EngineInputError(
    'staticLevelM',
    `only ${count} reading(s) precede the test start; enter the static level or include at least ${MIN_PRE_TEST_READINGS} pre-test readings`,
  );
}

/** Median of `values[from, to)`, from at most 20 000 of them. */
function medianOf(values: Float64Array, from: number, to: number, transform?: (i: number) => number): number {
  const available = to - from;
  if (available < 1) return NaN;
  const stride = Math.max(1, Math.ceil(available / 20000));
  const d = new Float64Array(Math.ceil(available / stride));
  let k = 0;
  for (let i = from; i < to && k < d.length; i += stride) d[k++] = transform ? transform(i) : values[i];
  const used = d.subarray(0, k).sort();
  return k % 2 === 1 ? used[(k - 1) / 2] : 0.5 * (used[k / 2 - 1] + used[k / 2]);
}

/** Robust σ of the level over [from, to) from its first differences: median |Δ| × 1.4826 / √2. */
function levelNoise(level: Float64Array, from: number, to: number): number {
  if (to - from < 2) return 0;
  return (1.4826 * medianOf(level, from + 1, to, (i) => Math.abs(level[i] - level[i - 1]))) / Math.SQRT2;
}

interface PreTestLevel {
  /** The static level (as a height) at the instant asked for. */
  height: number;
  /** Scatter of the readings about the mean or the trend used. */
  residualRms: number;
  /** How far the trend moves the level over the pre-test readings (0 when the mean is used). */
  trendChange: number;
}

/**
 * The static level at `atSeconds` from the readings [0, end): their least-squares trend when it is
 * significant (at least 5 readings, slope above 4 standard errors), so a drifting pre-test record
 * gives the level at the start; otherwise their mean.
 */
function preTestLevel(t: Float64Array, level: Float64Array, end: number, atSeconds: number): PreTestLevel {
  const origin = t[0];
  let st = 0;
  let sl = 0;
  for (let i = 0; i < end; i++) {
    st += t[i] - origin;
    sl += level[i];
  }
  const meanT = st / end;
  const meanL = sl / end;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < end; i++) {
    const dt = t[i] - origin - meanT;
    const dl = level[i] - meanL;
    sxx += dt * dt;
    sxy += dt * dl;
    syy += dl * dl;
  }
  if (end >= MIN_TREND_READINGS && sxx > 0 && sxy !== 0) {
    const slope = sxy / sxx;
    const ssRes = Math.max(0, syy - slope * sxy);
    const standardError = Math.sqrt(ssRes / (end - 2) / sxx);
    if (Math.abs(slope) > TREND_T_STATISTIC * standardError) {
      return {
        height: meanL + slope * (atSeconds - origin - meanT),
        residualRms: Math.sqrt(ssRes / end),
        trendChange: Math.abs(slope) * (t[end - 1] - t[0]),
      };
    }
  }
  return { height: meanL, residualRms: Math.sqrt(syy / end), trendChange: 0 };
}

/** Indexes of up to `count` of the largest changes between consecutive readings, at least 5 % of the duration apart. */
function largestChanges(t: Float64Array, level: Float64Array, count: number): number[] {
  const n = t.length;
  const apart = START_TOLERANCE_FRACTION * (t[n - 1] - t[0]);
  const chosen: number[] = [];
  for (let c = 0; c < count; c++) {
    let best = -1;
    let bestJump = 0;
    for (let i = 1; i < n; i++) {
      const jump = Math.abs(level[i] - level[i - 1]);
      if (jump > bestJump && chosen.every((k) => Math.abs(t[k] - t[i]) > apart)) {
        bestJump = jump;
        best = i;
      }
    }
    if (best < 0) break;
    chosen.push(best);
  }
  return chosen;
}

function startNotFound(t: Float64Array, level: Float64Array, why: string, also: number[]): EngineInputError {
  const indexes = [...new Set([...also, ...largestChanges(t, level, 3)])].sort((a, b) => a - b);
  const candidatesSeconds = indexes.map((i) => t[i]);
  const afterFirst = candidatesSeconds.map((x) => x - t[0]);
  return new EngineInputError(
    'testStartSeconds',
    `Could not find the test start — enter it (${why}; candidates at ${afterFirst.map(formatNumber).join(', ')} s after the first reading)`,
    { code: TEST_START_NOT_FOUND, details: { candidatesSeconds, candidatesAfterFirstReadingSeconds: afterFirst } },
  );
}

/**
 * The record begins already displaced and moves toward where it ends: a logger started after the
 * test start. Its first reading is the farthest from the end level, and a twentieth of the way
 * through the record the level has moved a tenth of the way back.
 */
function startsDisplaced(t: Float64Array, level: Float64Array, endLevel: number): boolean {
  const n = t.length;
  const first = level[0] - endLevel;
  let farthest = 0;
  for (let i = 0; i < n; i++) farthest = Math.max(farthest, Math.abs(level[i] - endLevel));
  if (!(Math.abs(first) > 0) || !(Math.abs(first) >= 0.9 * farthest)) return false;
  const early = firstIndexAtOrAfter(t, t[0] + START_TOLERANCE_FRACTION * (t[n - 1] - t[0]));
  const moved = Math.sign(first) * (level[0] - level[Math.min(early, n - 1)]);
  return moved > 0.1 * Math.abs(first);
}

/**
 * Test start and static level from the record's shape, when neither is entered. The step is the
 * largest change between consecutive readings, widened back over a gradual step; the readings
 * before it give the static level (their trend at the start when they drift); the start is the
 * first reading within the noise of the largest displacement after it. Refused, with the
 * candidates, when the level does not come back after the step, the readings before it are not
 * steady, or the start found is far from the step.
 */
function detectStart(t: Float64Array, level: Float64Array, step: number): { start: number; preTestEnd: number; staticHeight: number } {
  const n = t.length;
  const jump = level[step] - level[step - 1];
  if (jump === 0) {
    throw new EngineInputError('record', 'shows no displacement: every reading is the same; check the value column');
  }
  const sign = jump > 0 ? 1 : -1;
  const noise = step >= 4 ? levelNoise(level, 0, step) : levelNoise(level, step, n);
  const minStep = Math.max(4 * noise, 0.02 * Math.abs(jump));
  let p = step;
  while (p >= 2 && sign * (level[p - 1] - level[p - 2]) > minStep) p--;
  const tail = Math.max(3, Math.ceil(0.1 * (n - step)));
  const endLevel = medianOf(level, n - tail, n);
  const refuse = (why: string, also: number[]): EngineInputError =>
    startsDisplaced(t, level, endLevel) ? noPreTestReadings() : startNotFound(t, level, why, also);

  const stepSize = sign * (level[step] - level[p - 1]);
  if (!(sign * (level[step] - endLevel) > 0.1 * stepSize)) {
    throw refuse('the level does not come back after its largest change', [step]);
  }
  if (p < MIN_PRE_TEST_READINGS) {
    if (startsDisplaced(t, level, endLevel)) throw noPreTestReadings();
    throw tooFewPreTest(p);
  }
  let pre = preTestLevel(t, level, p, t[p]);
  let peak = -Infinity;
  for (let i = p; i < n; i++) peak = Math.max(peak, sign * (level[i] - pre.height));
  let start = p;
  while (start < n - 1 && sign * (level[start] - pre.height) < peak - PEAK_NOISE_SIGMAS * noise) start++;
  if (pre.trendChange > 0) pre = preTestLevel(t, level, p, t[start]);
  const displaced = sign * (level[start] - pre.height);
  if (pre.residualRms > PRE_TEST_SCATTER_FRACTION * displaced || pre.trendChange > PRE_TEST_TREND_FRACTION * displaced) {
    throw refuse(`the ${p} readings before the largest change in level are not steady`, [step, start]);
  }
  const duration = t[n - 1] - t[0];
  if (Math.abs(t[start] - t[step]) > START_TOLERANCE_FRACTION * duration) {
    throw refuse(
      `the largest displacement (${formatNumber(t[start] - t[0])} s) is more than ${START_TOLERANCE_FRACTION * 100} % of the record from the largest change in level (${formatNumber(t[step] - t[0])} s)`,
      [step, start],
    );
  }
  return { start, preTestEnd: p, staticHeight: pre.height };
}

/**
 * With an entered static level, the start is the first reading within the noise of the largest
 * displacement. The step from the static level to the first reading counts as a change in level,
 * so a logger started late starts at its first reading; a start far from the largest change is
 * refused with the candidates.
 */
function startFromEnteredStatic(t: Float64Array, level: Float64Array, step: number, staticHeight: number): number {
  const n = t.length;
  const noise = levelNoise(level, 0, n);
  let peak = 0;
  let peakIndex = 0;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(staticHeight - level[i]);
    if (a > peak) {
      peak = a;
      peakIndex = i;
    }
  }
  const side = Math.sign(staticHeight - level[peakIndex]);
  let start = 0;
  while (start < peakIndex && side * (staticHeight - level[start]) < peak - PEAK_NOISE_SIGMAS * noise) start++;
  const largest = Math.abs(level[0] - staticHeight) >= Math.abs(level[step] - level[step - 1]) ? 0 : step;
  if (Math.abs(t[start] - t[largest]) > START_TOLERANCE_FRACTION * (t[n - 1] - t[0])) {
    throw startNotFound(
      t,
      level,
      `the largest displacement (${formatNumber(t[start] - t[0])} s) is more than ${START_TOLERANCE_FRACTION * 100} % of the record from the largest change in level (${formatNumber(t[largest] - t[0])} s)`,
      [largest, start],
    );
  }
  return start;
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

  let testStartIndex: number;
  let testStartSource: ReducedRecord['testStartSource'] = 'detected';
  let preTestEnd: number;
  let staticHeight: number;
  let staticSource: ReducedRecord['staticSource'];
  if (settings.staticLevelM !== undefined) {
    requireFinite('staticLevelM', settings.staticLevelM);
    staticHeight = settings.reference === 'depth' ? -settings.staticLevelM : settings.staticLevelM;
    staticSource = 'entered';
  } else {
    staticHeight = NaN;
    staticSource = 'pre-test';
  }
  if (settings.testStartSeconds !== undefined) {
    requireFinite('testStartSeconds', settings.testStartSeconds);
    testStartIndex = firstIndexAtOrAfter(t, settings.testStartSeconds);
    if (testStartIndex >= n) {
      throw new EngineInputError('testStartSeconds', `${settings.testStartSeconds} s is after the last reading (t = ${t[n - 1]} s)`);
    }
    testStartSource = 'entered';
    preTestEnd = testStartIndex;
    if (staticSource === 'pre-test') {
      if (preTestEnd === 0) throw noPreTestReadings();
      if (preTestEnd < MIN_PRE_TEST_READINGS) throw tooFewPreTest(preTestEnd);
      staticHeight = preTestLevel(t, level, preTestEnd, settings.testStartSeconds).height;
    }
  } else if (staticSource === 'entered') {
    testStartIndex = startFromEnteredStatic(t, level, step, staticHeight);
    preTestEnd = 0;
  } else {
    const found = detectStart(t, level, step);
    testStartIndex = found.start;
    preTestEnd = found.preTestEnd;
    staticHeight = found.staticHeight;
  }

  for (let i = 0; i < n; i++) displacement[i] = staticHeight - level[i];

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
