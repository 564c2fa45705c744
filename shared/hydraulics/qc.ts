import type { BouwerRiceResult } from './bouwer-rice';
import { EngineInputError, requirePositive } from './errors';
import { crossingSeconds, MIN_WINDOW_READINGS, RECOMMENDED_HEAD_RANGES, type FitMethod, type HeadRange, type LineFit } from './fitting';
import type { QcFlag } from './flags';
import type { HvorslevResult } from './hvorslev';
import type { Material } from './materials';
import type { ReducedRecord } from './reduction';
import { REFERENCES } from './references';

export const MIN_R_SQUARED = 0.98;
export const PLAUSIBLE_K_RANGE = { minMetersPerSecond: 1e-10, maxMetersPerSecond: 1e-2 } as const;
/** Kfield's thresholds where the sources give none. */
export const H0_RATIO_LIMITS = { low: 0.8, high: 1.25 } as const;
export const CONCAVE_SLOPE_RATIO = 1.5;
export const EARLY_SEGMENT: HeadRange = { upper: 1, lower: 0.6 };
export const LATE_SEGMENT: HeadRange = { upper: 0.4, lower: 0.1 };
export const REPEAT_LEVELS = [0.8, 0.6, 0.4, 0.2] as const;
export const REPEAT_TOLERANCE = 0.2;

const fmt = (x: number, digits = 3): string => (Number.isFinite(x) ? Number(x.toPrecision(digits)).toString() : String(x));
const fmtK = (x: number): string => x.toExponential(2);

/**
 * Noise of H/H0 from the later half of the test: the median absolute second difference, scaled
 * to a Gaussian σ (σ(d2) = √6 σ). The later half is used because there the response is nearly
 * flat, so curvature does not pass for noise. At most 20 000 differences are used.
 */
export function normalizedHeadNoise(reduced: ReducedRecord): number {
  const h = reduced.normalizedHead;
  const from = reduced.testStartIndex + Math.floor((h.length - reduced.testStartIndex) / 2);
  const available = h.length - from - 2;
  if (available < 1) return 0;
  const stride = Math.max(1, Math.ceil(available / 20000));
  const d2 = new Float64Array(Math.ceil(available / stride));
  let k = 0;
  for (let i = from + 1; i < h.length - 1 && k < d2.length; i += stride) {
    d2[k++] = Math.abs(h[i + 1] - 2 * h[i] + h[i - 1]);
  }
  const used = d2.subarray(0, k).sort();
  const median = k % 2 === 1 ? used[(k - 1) / 2] : 0.5 * (used[k / 2 - 1] + used[k / 2]);
  return (1.4826 * median) / Math.sqrt(6);
}

interface ResponseShape {
  tolerance: number;
  noise: number;
  lowest: number;
  lowestAt: number;
  /** Largest rise of H/H0 above its running minimum, and where. */
  largestRise: number;
  riseAt: number;
  /** H/H0 fell below −tolerance (crossed static). */
  crossed: boolean;
  /** After crossing, the largest rise back above the running minimum, and where. */
  turnBack: number;
  turnBackAt: number;
}

/** One pass over the response from the test start: its lowest point, its rises, whether it crosses static and turns back. */
function responseShape(reduced: ReducedRecord): ResponseShape {
  const { normalizedHead: h, elapsedSeconds: e, testStartIndex: start } = reduced;
  const noise = normalizedHeadNoise(reduced);
  const tolerance = Math.min(0.2, Math.max(0.03, 10 * noise));
  let runningMin = Infinity;
  let lowestIndex = start;
  let largestRise = 0;
  let riseIndex = start;
  let crossed = false;
  let turnBack = 0;
  let turnBackIndex = start;
  for (let i = start; i < h.length; i++) {
    const v = h[i];
    if (v < runningMin) {
      runningMin = v;
      lowestIndex = i;
    } else if (v - runningMin > largestRise) {
      largestRise = v - runningMin;
      riseIndex = i;
    }
    if (v < -tolerance) crossed = true;
    else if (crossed && v - runningMin > turnBack) {
      turnBack = v - runningMin;
      turnBackIndex = i;
    }
  }
  return {
    tolerance,
    noise,
    lowest: runningMin,
    lowestAt: e[lowestIndex],
    largestRise,
    riseAt: e[riseIndex],
    crossed,
    turnBack,
    turnBackAt: e[turnBackIndex],
  };
}

/**
 * Oscillation: H/H0 crosses static (falls below −tolerance) and turns back toward it by more than
 * the noise could explain (10 σ, at least 0.03 and at most 0.2 of H0). A level that keeps moving
 * without turning back is a drift (`driftFlag`), not an oscillation.
 */
export function oscillationFlag(reduced: ReducedRecord): QcFlag | null {
  const shape = responseShape(reduced);
  if (!shape.crossed || !(shape.turnBack > shape.tolerance)) return null;
  return {
    code: 'oscillation',
    severity: 'error',
    message:
      `The response oscillates: it falls to H/H0 = ${fmt(shape.lowest)} at t = ${fmt(shape.lowestAt)} s (changes sign) ` +
      `and turns back by ${fmt(shape.turnBack)} of H0 by t = ${fmt(shape.turnBackAt)} s. Hvorslev and Bouwer-Rice assume an overdamped response, so their K does not apply.`,
    values: {
      lowestNormalizedHead: shape.lowest,
      lowestAtSeconds: shape.lowestAt,
      turnBack: shape.turnBack,
      turnBackAtSeconds: shape.turnBackAt,
      toleranceNormalizedHead: shape.tolerance,
      noiseNormalizedHead: shape.noise,
    },
    suggestion: 'Analyse the record with a method for underdamped responses; fit it here only if the rise is known to be an artefact.',
    reference: REFERENCES.oscillation,
  };
}

/** Least-squares slope of H/H0 against time over the later half of the test (1/s). */
function lateTrendPerSecond(reduced: ReducedRecord): number {
  const { normalizedHead: h, elapsedSeconds: e, testStartIndex: start } = reduced;
  const half = e[h.length - 1] / 2;
  let n = 0;
  let st = 0;
  let sy = 0;
  for (let i = start; i < h.length; i++) {
    if (e[i] < half) continue;
    n++;
    st += e[i];
    sy += h[i];
  }
  if (n < 2) return 0;
  const mt = st / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = start; i < h.length; i++) {
    if (e[i] < half) continue;
    sxx += (e[i] - mt) * (e[i] - mt);
    sxy += (e[i] - mt) * (h[i] - my);
  }
  return sxx > 0 ? sxy / sxx : 0;
}

/**
 * Drift after recovery: the level keeps moving once the response has recovered — it rises again
 * away from static without crossing it, or crosses static and goes on without turning back — by
 * more than the noise could explain (the oscillation tolerance). An uncompensated absolute
 * (non-vented) sensor or a barometric trend does this; it is not an oscillation.
 */
export function driftFlag(reduced: ReducedRecord): QcFlag | null {
  const shape = responseShape(reduced);
  if (shape.crossed && shape.turnBack > shape.tolerance) return null; // an oscillation
  const crossedOn = shape.crossed;
  const risesAgain = !shape.crossed && shape.largestRise > shape.tolerance;
  if (!crossedOn && !risesAgain) return null;
  const trend = lateTrendPerSecond(reduced);
  const what = crossedOn
    ? `it passes static and goes on to H/H0 = ${fmt(shape.lowest)} by t = ${fmt(shape.lowestAt)} s without turning back`
    : `it rises again by ${fmt(shape.largestRise)} of H0 by t = ${fmt(shape.riseAt)} s without crossing static`;
  return {
    code: 'drift-after-recovery',
    severity: 'warning',
    message: `The level keeps moving after recovery: compensate with a barometric record or fit the early part (${what}; H/H0 changes by ${fmt(trend * 3600)} per hour over the later half).`,
    values: {
      lowestNormalizedHead: shape.lowest,
      lowestAtSeconds: shape.lowestAt,
      largestRise: shape.largestRise,
      riseAtSeconds: shape.riseAt,
      crossesStatic: crossedOn,
      lateTrendPerSecond: trend,
      toleranceNormalizedHead: shape.tolerance,
    },
    suggestion:
      'Compensate the record with a barometric record (absolute sensor) or correct the trend, or fit a window in the early part of the recovery, before the drift shows.',
    reference: REFERENCES.drift,
  };
}

interface SegmentSums {
  n: number;
  t0: number;
  st: number;
  sy: number;
  stt: number;
  sty: number;
}

const emptySums = (): SegmentSums => ({ n: 0, t0: 0, st: 0, sy: 0, stt: 0, sty: 0 });

function addTo(sums: SegmentSums, t: number, y: number): void {
  // Times are shifted to the segment's first reading, which keeps the one-pass sums well conditioned.
  if (sums.n === 0) sums.t0 = t;
  const dt = t - sums.t0;
  sums.n++;
  sums.st += dt;
  sums.sy += y;
  sums.stt += dt * dt;
  sums.sty += dt * y;
}

function slopeOf(sums: SegmentSums): { slopePerSecond: number; count: number } | null {
  if (sums.n < MIN_WINDOW_READINGS) return null;
  const sxx = sums.stt - (sums.st * sums.st) / sums.n;
  if (!(sxx > 0)) return null;
  return { slopePerSecond: (sums.sty - (sums.st * sums.sy) / sums.n) / sxx, count: sums.n };
}

/** Free-line slopes of ln(H/H0) over two head ranges in one pass; null for a range with fewer than 3 readings. */
export function segmentSlopes(
  reduced: ReducedRecord,
  first: HeadRange,
  second: HeadRange,
): [{ slopePerSecond: number; count: number } | null, { slopePerSecond: number; count: number } | null] {
  const { normalizedHead: h, elapsedSeconds: e, testStartIndex: start } = reduced;
  const a = emptySums();
  const b = emptySums();
  for (let i = start; i < h.length; i++) {
    const v = h[i];
    const inA = v > first.lower && v <= first.upper;
    const inB = v > second.lower && v <= second.upper;
    if (!inA && !inB) continue;
    const y = Math.log(v);
    if (inA) addTo(a, e[i], y);
    if (inB) addTo(b, e[i], y);
  }
  return [slopeOf(a), slopeOf(b)];
}

/** Concave-upward early data: the early segment falls much faster than the later one. */
export function concaveUpwardFlag(reduced: ReducedRecord): QcFlag | null {
  const [early, late] = segmentSlopes(reduced, EARLY_SEGMENT, LATE_SEGMENT);
  if (!early || !late || !(late.slopePerSecond < 0) || !(early.slopePerSecond < 0)) return null;
  const ratio = early.slopePerSecond / late.slopePerSecond;
  if (!(ratio > CONCAVE_SLOPE_RATIO)) return null;
  return {
    code: 'concave-upward',
    severity: 'warning',
    message:
      `Early data are concave upward: ln(H/H0) falls ${fmt(ratio, 2)}× faster for H/H0 ${EARLY_SEGMENT.upper}–${EARLY_SEGMENT.lower} ` +
      `than for ${LATE_SEGMENT.upper}–${LATE_SEGMENT.lower} (a double straight line, often filter-pack drainage).`,
    values: {
      earlySlopePerSecond: early.slopePerSecond,
      lateSlopePerSecond: late.slopePerSecond,
      slopeRatio: ratio,
      earlyCount: early.count,
      lateCount: late.count,
    },
    suggestion: `Fit a free line over the later segment, e.g. the window H/H0 ${LATE_SEGMENT.upper}–${LATE_SEGMENT.lower}.`,
    reference: REFERENCES.doubleStraightLine,
  };
}

export function fitFlags(fit: LineFit, method: FitMethod): QcFlag[] {
  const flags: QcFlag[] = [];
  if (fit.count < MIN_WINDOW_READINGS) {
    flags.push({
      code: 'too-few-readings',
      severity: 'error',
      message: `The window holds ${fit.count} reading(s); a line needs at least ${MIN_WINDOW_READINGS} to be checked.`,
      values: { count: fit.count, minimum: MIN_WINDOW_READINGS },
      suggestion: 'Widen the window.',
    });
  }
  // Read about the mean of ln(H/H0) for either line: r² about the origin would flatter an anchored line.
  if (fit.rSquaredAboutMean < MIN_R_SQUARED) {
    const aboutMean = Math.max(0, fit.rSquaredAboutMean);
    flags.push({
      code: 'low-r-squared',
      severity: 'warning',
      message:
        fit.line === 'anchored'
          ? `About the mean of ln(H/H0) the anchored line explains ${aboutMean.toFixed(4)} of its spread, below ${MIN_R_SQUARED} (r² about the origin ${fit.rSquared.toFixed(4)}): the readings in the window are not on a straight line through H/H0 = 1 at the start.`
          : `r² = ${fit.rSquared.toFixed(4)} is below ${MIN_R_SQUARED}: the readings in the window are not on a straight line.`,
      values: { rSquared: fit.rSquared, rSquaredAboutMean: aboutMean, minimum: MIN_R_SQUARED },
      suggestion: 'Check the static level and the window; a curved record may need a free line over a later segment.',
      reference: REFERENCES.rSquared,
    });
  }
  const recommended = RECOMMENDED_HEAD_RANGES[method];
  if (fit.window.headMax > recommended.upper || fit.window.headMin <= recommended.lower) {
    flags.push({
      code: 'window-outside-recommended',
      severity: 'warning',
      message:
        `The window spans H/H0 ${fmt(fit.window.headMax)}–${fmt(fit.window.headMin)}, outside ${recommended.upper}–${recommended.lower} ` +
        `recommended for ${method === 'hvorslev' ? 'Hvorslev' : 'Bouwer-Rice'}` +
        (fit.window.source === 'fallback' ? ' (the recommended range holds fewer than 3 readings, so all readings 0.05 < H/H0 ≤ 1 were used).' : '.'),
      values: {
        headMax: fit.window.headMax,
        headMin: fit.window.headMin,
        recommendedUpper: recommended.upper,
        recommendedLower: recommended.lower,
        windowSource: fit.window.source,
      },
      reference: REFERENCES.recommendedRanges,
    });
  }
  return flags;
}

/** Measured H0 against the H0 a slug of known volume should give in this casing. */
export function h0Flag(reduced: ReducedRecord, casingRadiusM: number, slugVolumeM3: number): QcFlag | null {
  requirePositive('slugVolumeM3', slugVolumeM3);
  requirePositive('geometry.casingRadiusM', casingRadiusM);
  const expected = slugVolumeM3 / (Math.PI * casingRadiusM * casingRadiusM);
  const measured = Math.abs(reduced.h0M);
  const ratio = measured / expected;
  if (ratio >= H0_RATIO_LIMITS.low && ratio <= H0_RATIO_LIMITS.high) return null;
  return {
    code: 'h0-mismatch',
    severity: 'warning',
    message: `Measured H0 ${fmt(measured)} m is ${fmt(ratio, 2)}× the ${fmt(expected)} m expected from the slug volume: the start may have been missed, or the well or transducer misbehaved.`,
    values: { measuredH0M: measured, expectedH0M: expected, ratio, slugVolumeM3, casingRadiusM },
    suggestion: 'Check the test start, the slug volume and the casing radius.',
    reference: REFERENCES.expectedH0,
  };
}

export function kFlags(kMetersPerSecond: number, material?: Material): QcFlag[] {
  const flags: QcFlag[] = [];
  const { minMetersPerSecond: lo, maxMetersPerSecond: hi } = PLAUSIBLE_K_RANGE;
  if (kMetersPerSecond < lo || kMetersPerSecond > hi) {
    flags.push({
      code: 'k-implausible',
      severity: 'warning',
      message: `K = ${fmtK(kMetersPerSecond)} m/s is outside ${fmtK(lo)} … ${fmtK(hi)} m/s, the plausible range for a slug test.`,
      values: { kMetersPerSecond, minMetersPerSecond: lo, maxMetersPerSecond: hi },
      suggestion: 'Check the geometry (radii and lengths in the right units) and the time unit.',
      reference: REFERENCES.plausibleK,
    });
  }
  if (material && (kMetersPerSecond < material.kMinMetersPerSecond || kMetersPerSecond > material.kMaxMetersPerSecond)) {
    const factor = kMetersPerSecond < material.kMinMetersPerSecond ? material.kMinMetersPerSecond / kMetersPerSecond : kMetersPerSecond / material.kMaxMetersPerSecond;
    flags.push({
      code: 'k-outside-material',
      severity: 'warning',
      message: `K = ${fmtK(kMetersPerSecond)} m/s is ${fmt(factor, 2)}× outside the range for ${material.label.toLowerCase()} (${fmtK(material.kMinMetersPerSecond)} … ${fmtK(material.kMaxMetersPerSecond)} m/s).`,
      values: {
        kMetersPerSecond,
        material: material.id,
        minMetersPerSecond: material.kMinMetersPerSecond,
        maxMetersPerSecond: material.kMaxMetersPerSecond,
        factorOutside: factor,
      },
      suggestion: 'Check the unit stated for the screen interval, or the geometry.',
      reference: material.reference,
    });
  }
  return flags;
}

export function shapeFactorFlags(k: HvorslevResult | BouwerRiceResult): QcFlag[] {
  if (k.method !== 'hvorslev' || k.simplified.valid) return [];
  return [
    {
      code: 'shape-factor-validity',
      severity: 'info',
      message:
        `mL/D = ${fmt(k.mLOverD)} is not above 4 (L/R ≤ 8 when m = 1), so the simplified form ln(L/R) is outside its validity; ` +
        `it differs from the full form by ${fmt(k.simplified.differencePercent, 2)} %. Kfield reports K from the full form.`,
      values: { mLOverD: k.mLOverD, simplifiedDifferencePercent: k.simplified.differencePercent },
      reference: k.simplified.reference,
    },
  ];
}

export interface RepeatTest {
  label: string;
  reduced: ReducedRecord;
}

/**
 * Repeat tests of one well should give one normalized curve. Compares the times at which each
 * test reaches H/H0 = 0.8, 0.6, 0.4, 0.2; a spread above `tolerance` (relative) is flagged.
 */
export function repeatTestFlags(tests: readonly RepeatTest[], tolerance = REPEAT_TOLERANCE): QcFlag[] {
  if (!(tolerance > 0)) throw new EngineInputError('tolerance', `must be greater than 0 (got ${tolerance})`);
  if (tests.length < 2) return [];
  let worst: { level: number; spread: number; fastest: RepeatTest; slowest: RepeatTest; tFast: number; tSlow: number } | null = null;
  for (const level of REPEAT_LEVELS) {
    let fastest: RepeatTest | null = null;
    let slowest: RepeatTest | null = null;
    let tFast = Infinity;
    let tSlow = -Infinity;
    let reached = 0;
    for (const test of tests) {
      const t = crossingSeconds(test.reduced, level);
      if (t === null || !(t > 0)) continue;
      reached++;
      if (t < tFast) {
        tFast = t;
        fastest = test;
      }
      if (t > tSlow) {
        tSlow = t;
        slowest = test;
      }
    }
    if (reached < 2 || !fastest || !slowest) continue;
    const spread = tSlow / tFast - 1;
    if (!worst || spread > worst.spread) worst = { level, spread, fastest, slowest, tFast, tSlow };
  }
  if (!worst || !(worst.spread > tolerance)) return [];
  const h0Fast = Math.abs(worst.fastest.reduced.h0M);
  const h0Slow = Math.abs(worst.slowest.reduced.h0M);
  return [
    {
      code: 'repeat-tests-disagree',
      severity: 'warning',
      message:
        `Normalized curves of ${tests.length} repeat tests disagree: H/H0 = ${worst.level} is reached after ${fmt(worst.tFast)} s ` +
        `(${worst.fastest.label}, H0 ${fmt(h0Fast)} m) to ${fmt(worst.tSlow)} s (${worst.slowest.label}, H0 ${fmt(h0Slow)} m), ` +
        `${fmt(worst.spread * 100, 2)} % apart. The response depends on H0 or the tests were not repeatable.`,
      values: {
        level: worst.level,
        spread: worst.spread,
        tolerance,
        fastestLabel: worst.fastest.label,
        fastestSeconds: worst.tFast,
        fastestH0M: h0Fast,
        slowestLabel: worst.slowest.label,
        slowestSeconds: worst.tSlow,
        slowestH0M: h0Slow,
      },
      suggestion: 'Compare H0 with the response: a dependence on H0 points to non-linear flow or a well problem; report the tests separately.',
      reference: REFERENCES.repeatTests,
    },
  ];
}

/**
 * A fit that takes the screen radius as the intake in a well whose borehole (filter pack) is
 * wider: names both radii and the K each gives, so the analyst answers which one the pack calls for.
 */
export function intakeScreenInFilterPackFlag(c: {
  method: FitMethod;
  screenRadiusM: number;
  boreholeRadiusM: number;
  kScreenMetersPerSecond: number;
  /** Null when the method refuses the borehole radius (e.g. Le/rw out of range). */
  kBoreholeMetersPerSecond: number | null;
}): QcFlag | null {
  if (!(c.boreholeRadiusM > c.screenRadiusM)) return null;
  const name = c.method === 'hvorslev' ? 'Hvorslev’s intake radius R' : 'Bouwer-Rice’s rw';
  const kb = c.kBoreholeMetersPerSecond;
  return {
    code: 'intake-screen-in-filter-pack',
    severity: 'warning',
    message:
      `${name} is the screen radius ${fmt(c.screenRadiusM, 4)} m in a borehole of radius ${fmt(c.boreholeRadiusM, 4)} m (filter pack): ` +
      `K = ${fmtK(c.kScreenMetersPerSecond)} m/s with the screen radius, ` +
      (kb === null ? 'and the method does not accept the borehole radius.' : `${fmtK(kb)} m/s with the borehole radius.`),
    values: {
      method: c.method,
      screenRadiusM: c.screenRadiusM,
      boreholeRadiusM: c.boreholeRadiusM,
      kScreenMetersPerSecond: c.kScreenMetersPerSecond,
      kBoreholeMetersPerSecond: kb,
    },
    suggestion: 'Use the borehole radius where the filter pack is more permeable than the formation; keep the screen radius only for a pack no more permeable than it.',
    reference: REFERENCES.intakeRadius,
  };
}
