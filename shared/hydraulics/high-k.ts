/**
 * High-K (oscillating or nearly oscillating) slug-test responses: the Springer & Gelhar (1991) model
 * in the form Butler (1998) and Butler, Garnett & Healey (2003) give for the "high-K Hvorslev" and
 * "high-K Bouwer-Rice" cases. From memory, not re-read; the algebra is derived here and checked in
 * tests/unit/shared/hydraulics/high-k.test.ts (RK4 reference, large-C_D limit). docs/methods.md
 * section 3b states the model and what is from memory.
 *
 *   d²w_d/dt_d² + C_D dw_d/dt_d + w_d = 0,  w_d(0) = 1,  dw_d/dt_d(0) = 0,
 *   w_d = w/w0 (the normalized head H/H0),  t_d = t·√(g/L_e),
 *   C_D = T0 · √(g/L_e),  T0 the basic time lag of the overdamped method (Hvorslev or Bouwer-Rice)
 *
 * so that for large C_D the slow root −1/C_D gives w_d → exp(−t_d/C_D) = exp(−t/T0), exactly the
 * exponential the existing engine fits (derived). K is therefore the existing method's K for the
 * equivalent time lag T0 = C_D·√(L_e/g): the shape factors are those of hvorslev.ts and bouwer-rice.ts.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { STANDARD_GRAVITY } from '../units/pressure';
import { bouwerRiceK, type BouwerRiceResult } from './bouwer-rice';
import { EngineInputError, formatNumber, requireFinite, requirePositive } from './errors';
import { validateGeometry, type WellGeometry } from './geometry';
import { hvorslevK, type HvorslevResult } from './hvorslev';
import { validateTimes, type ReducedRecord } from './reduction';

export type HighKVariant = 'hvorslev' | 'bouwer-rice';
export type DampingRegime = 'underdamped' | 'critically-damped' | 'overdamped';

export const HIGH_K_VARIANTS: readonly { id: HighKVariant; label: string }[] = [
  { id: 'hvorslev', label: 'High-K Hvorslev (Springer & Gelhar 1991; Butler 1998)' },
  { id: 'bouwer-rice', label: 'High-K Bouwer-Rice (Springer & Gelhar 1991; Butler 1998)' },
];

export const HIGH_K_REFERENCES = {
  model:
    'Springer & Gelhar (1991); Butler (1998); Butler, Garnett & Healey (2003), memory: w_d″ + C_D w_d′ + w_d = 0, t_d = t√(g/L_e)',
  hvorslev: 'Butler (1998, memory): high-K Hvorslev, C_D = √(g/L_e) · rc² ln(mL/D + √(1 + (mL/D)²)) / (2 L K)',
  'bouwer-rice': 'Butler (1998, memory): high-K Bouwer-Rice, C_D = √(g/L_e) · rc² ln(Re/rw) / (2 Le K)',
  effectiveLength:
    'Springer & Gelhar (1991), as given by Butler (1998), memory; derived from momentum along the well: L_e = L_above + (b/2)(rc/r_screen)²',
} as const;

/**
 * Half-width of the band around C_D = 2 reported as critically damped, relative (Kfield's choice):
 * within ±2 % the under- and overdamped curves differ by less than the noise of a field record.
 */
export const CRITICAL_DAMPING_BAND = 0.02;

/** Readings a fit needs at the least (three parameters at most, and some left over). */
export const MIN_HIGH_K_READINGS = 6;

/** The record must fall below this normalized head somewhere, or the fit is unconstrained (Kfield's choice). */
export const MAX_LOWEST_HEAD = 0.5;

const sinOverX = (x: number) => (x === 0 ? 1 : Math.sin(x) / x);
const sinhOverX = (x: number) => (x === 0 ? 1 : Math.sinh(x) / x);

/**
 * w_d(t_d) without checks, for the fit's inner loop. Written so that it is exact at t_d = 0,
 * continuous through C_D = 2 (sin(ωt)/ω and sinh(st)/s are evaluated as t·sinc), and neither
 * overflows nor cancels at long times or large C_D (the slow root −1/(a + s) instead of s − a).
 */
function head(cD: number, td: number): number {
  if (td <= 0) return 1;
  const a = cD / 2;
  const disc = (a - 1) * (a + 1); // a² − 1 without cancellation near a = 1
  if (disc < 0) {
    // underdamped: e^(−a t)[cos ωt + (a/ω) sin ωt], ω = √(1 − a²)
    const x = Math.sqrt(-disc) * td;
    return Math.exp(-a * td) * (Math.cos(x) + a * td * sinOverX(x));
  }
  if (disc === 0) return Math.exp(-td) * (1 + td);
  const s = Math.sqrt(disc);
  const x = s * td;
  if (x < 1) return Math.exp(-a * td) * (Math.cosh(x) + a * td * sinhOverX(x));
  // overdamped, two exponentials: (ω₊ e^(ω₋ t) − ω₋ e^(ω₊ t))/(ω₊ − ω₋), ω± = −a ± s
  const slow = -1 / (a + s);
  const fast = -(a + s);
  return 0.5 * ((1 + a / s) * Math.exp(slow * td) + (1 - a / s) * Math.exp(fast * td));
}

function requireDamping(cD: number): void {
  requirePositive('dampingParameter', cD);
}

/** The dimensionless solution w_d(t_d; C_D); 1 before the start (t_d ≤ 0). */
export function highKHead(dampingParameter: number, dimensionlessTime: number): number {
  requireDamping(dampingParameter);
  requireFinite('dimensionlessTime', dimensionlessTime);
  return head(dampingParameter, dimensionlessTime);
}

export function dampingRegime(dampingParameter: number): DampingRegime {
  requireDamping(dampingParameter);
  if (Math.abs(dampingParameter / 2 - 1) <= CRITICAL_DAMPING_BAND) return 'critically-damped';
  return dampingParameter < 2 ? 'underdamped' : 'overdamped';
}

/** √(L_e/g), s: the time unit of t_d. */
export function timeScaleSeconds(effectiveLengthM: number): number {
  requirePositive('effectiveLengthM', effectiveLengthM);
  return Math.sqrt(effectiveLengthM / STANDARD_GRAVITY);
}

export interface HighKModel {
  dampingParameter: number;
  effectiveLengthM: number;
  /** When the response starts on the record's elapsed-time axis, s; default 0. */
  timeOffsetSeconds?: number;
}

/** The normalized head H/H0 at elapsed time t (s) of a model with dimensions. */
export function modelHead(model: HighKModel, tSeconds: number): number {
  requireDamping(model.dampingParameter);
  const scale = timeScaleSeconds(model.effectiveLengthM);
  const offset = model.timeOffsetSeconds ?? 0;
  requireFinite('timeOffsetSeconds', offset);
  requireFinite('tSeconds', tSeconds);
  return head(model.dampingParameter, (tSeconds - offset) / scale);
}

export interface EffectiveLengthEstimate {
  effectiveLengthM: number;
  /** L: static water level to the top of the screen, m. */
  waterColumnAboveScreenM: number;
  waterColumnSource: 'entered' | 'geometry';
  /** (b/2)(rc/r_screen)², m. */
  screenTermM: number;
  reference: string;
}

/**
 * L_e = L + (b/2)(rc/r_screen)²: the column above the screen, plus the screen, where the flow falls
 * linearly to nothing at its bottom so that on average half of it moves, at the velocity of the
 * screen's cross-section. Springer & Gelhar (1991) as given by Butler (1998), memory; the form
 * checked by integrating the column's momentum along the well (derived). The column above the
 * screen is the entered one, else Lw − b when the well has Lw (static level to screen bottom).
 */
export function estimateEffectiveLength(geometry: WellGeometry, waterColumnAboveScreenM?: number): EffectiveLengthEstimate {
  validateGeometry(geometry);
  let column: number;
  let source: EffectiveLengthEstimate['waterColumnSource'];
  if (waterColumnAboveScreenM !== undefined) {
    requireFinite('waterColumnAboveScreenM', waterColumnAboveScreenM);
    if (waterColumnAboveScreenM < 0) {
      throw new EngineInputError('waterColumnAboveScreenM', `must be 0 or more (got ${waterColumnAboveScreenM}); with the static level inside the screen enter 0 and the saturated screen length`);
    }
    column = waterColumnAboveScreenM;
    source = 'entered';
  } else if (geometry.staticToScreenBottomM !== undefined) {
    column = geometry.staticToScreenBottomM - geometry.screenLengthM;
    if (column < 0) {
      throw new EngineInputError(
        'geometry.staticToScreenBottomM',
        `${geometry.staticToScreenBottomM} m is less than the screen length ${geometry.screenLengthM} m, so the static level is inside the screen; enter the saturated screen length`,
      );
    }
    source = 'geometry';
  } else {
    throw new EngineInputError(
      'waterColumnAboveScreenM',
      'is required to estimate L_e (the water column from the static level to the top of the screen); or enter effectiveLengthM',
    );
  }
  const ratio = geometry.casingRadiusM / geometry.screenRadiusM;
  const screenTermM = (geometry.screenLengthM / 2) * ratio * ratio;
  return { effectiveLengthM: column + screenTermM, waterColumnAboveScreenM: column, waterColumnSource: source, screenTermM, reference: HIGH_K_REFERENCES.effectiveLength };
}

function requireVariant(variant: HighKVariant): void {
  if (variant !== 'hvorslev' && variant !== 'bouwer-rice') {
    throw new EngineInputError('variant', `must be hvorslev or bouwer-rice (got "${String(variant)}")`);
  }
}

/** The existing method's K for the time lag T0 (its shape factor, its checks). */
function overdampedK(variant: HighKVariant, geometry: WellGeometry, t0Seconds: number): HvorslevResult | BouwerRiceResult {
  return variant === 'hvorslev' ? hvorslevK(geometry, t0Seconds) : bouwerRiceK(geometry, t0Seconds);
}

/** K·T0, m: the well's constant rc² ln(…)/(2L) of the variant; K = (K·T0)/T0. */
function kTimesLag(variant: HighKVariant, geometry: WellGeometry): number {
  requireVariant(variant);
  return overdampedK(variant, geometry, 1).kMetersPerSecond;
}

/** K from C_D: the variant's K for the equivalent time lag T0 = C_D·√(L_e/g). */
export function kFromDampingParameter(variant: HighKVariant, geometry: WellGeometry, dampingParameter: number, effectiveLengthM: number): number {
  requireDamping(dampingParameter);
  return kTimesLag(variant, geometry) / (dampingParameter * timeScaleSeconds(effectiveLengthM));
}

/** C_D from K: T0(K) · √(g/L_e). */
export function dampingParameterFromK(variant: HighKVariant, geometry: WellGeometry, kMetersPerSecond: number, effectiveLengthM: number): number {
  requirePositive('kMetersPerSecond', kMetersPerSecond);
  return kTimesLag(variant, geometry) / (kMetersPerSecond * timeScaleSeconds(effectiveLengthM));
}

export interface HighKFitOptions {
  variant: HighKVariant;
  geometry: WellGeometry;
  /** L_e, m: held fixed when fitEffectiveLength is false, the starting value otherwise. Default: the estimate. */
  effectiveLengthM?: number;
  /** Static level to the top of the screen, m, for the L_e estimate; default Lw − screen length when Lw is given. */
  waterColumnAboveScreenM?: number;
  /** Fit L_e with C_D (default true) or hold it at effectiveLengthM (or the estimate). */
  fitEffectiveLength?: boolean;
  /** Fit when the response starts on the time axis (default false: at t = 0). */
  fitTimeOffset?: boolean;
  /** Levenberg-Marquardt iterations, default 200. */
  maxIterations?: number;
}

export interface HighKStandardErrors {
  /** Relative standard error of C_D (from the Jacobian at the optimum, σ² = SS_res/(n − p)). */
  dampingParameterRelative: number;
  /** Relative standard error of L_e; null when L_e was held. */
  effectiveLengthRelative: number | null;
  /** Relative standard error of K (K ∝ 1/(C_D √L_e), with the covariance). */
  kRelative: number;
  timeOffsetSeconds: number | null;
}

export interface HighKCurveSample {
  timeSeconds: Float64Array;
  normalizedHead: Float64Array;
}

export interface HighKFit {
  method: 'high-k';
  variant: HighKVariant;
  reference: string;
  kMetersPerSecond: number;
  /** C_D, dimensionless. */
  dampingParameter: number;
  regime: DampingRegime;
  /** L_e as fitted, or as held. */
  effectiveLengthM: number;
  effectiveLengthFitted: boolean;
  /** What the well's geometry gives for L_e; null when it cannot be estimated (no column entered, no Lw). */
  effectiveLengthEstimate: EffectiveLengthEstimate | null;
  /** √(L_e/g), s. */
  timeScaleSeconds: number;
  /** C_D·√(L_e/g), s: the time lag an overdamped response of this K would show. */
  equivalentT0Seconds: number;
  /** Underdamped only: 2π√(L_e/g)/√(1 − C_D²/4), s; null otherwise. */
  dampedPeriodSeconds: number | null;
  timeOffsetSeconds: number;
  timeOffsetFitted: boolean;
  /** √(SS_res / n), in H/H0. */
  residualRms: number;
  /** 1 − SS_res/SS_tot, SS_tot about the mean H/H0. */
  rSquared: number;
  count: number;
  iterations: number;
  /** null when the Jacobian is singular at the optimum (a parameter the record does not determine). */
  standardErrors: HighKStandardErrors | null;
  /** The variant's overdamped result at the equivalent time lag: shape factor, radii, checks. */
  shape: HvorslevResult | BouwerRiceResult;
  /** The fitted H/H0 at elapsed time t, s. */
  curve: (tSeconds: number) => number;
  /** `count` evenly spaced points of the fitted curve from `fromSeconds` to `toSeconds`, inclusive. */
  sampleCurve: (fromSeconds: number, toSeconds: number, count: number) => HighKCurveSample;
}

interface Series {
  t: Float64Array;
  w: Float64Array;
}

function validateSeries(times: ArrayLike<number>, normalizedHead: ArrayLike<number>): Series {
  if (times.length !== normalizedHead.length) {
    throw new EngineInputError('times', `has ${times.length} readings where normalizedHead has ${normalizedHead.length}`);
  }
  if (times.length < MIN_HIGH_K_READINGS) {
    throw new EngineInputError('times', `has ${times.length} readings; the high-K fit needs at least ${MIN_HIGH_K_READINGS}`);
  }
  const t = Float64Array.from(times);
  const w = Float64Array.from(normalizedHead);
  validateTimes('times', t);
  let lowest = Infinity;
  for (let i = 0; i < w.length; i++) {
    if (!Number.isFinite(w[i])) throw new EngineInputError('normalizedHead', `reading ${i + 1} is not a finite number (${w[i]})`);
    if (w[i] < lowest) lowest = w[i];
  }
  if (!(lowest < MAX_LOWEST_HEAD)) {
    throw new EngineInputError(
      'normalizedHead',
      `never falls below ${MAX_LOWEST_HEAD} (lowest ${formatNumber(lowest)}); the record holds too little of the recovery to fit`,
    );
  }
  return { t, w };
}

function sumOfSquares(s: Series, cD: number, scale: number, offset: number): number {
  let sse = 0;
  for (let i = 0; i < s.t.length; i++) {
    const r = s.w[i] - head(cD, (s.t[i] - offset) / scale);
    sse += r * r;
  }
  return sse;
}

/** First elapsed time at which the record falls to `level`, interpolated; null if it never does. */
function firstFall(s: Series, level: number): number | null {
  for (let i = 1; i < s.t.length; i++) {
    if (s.w[i] <= level && s.w[i - 1] > level) {
      const f = (s.w[i - 1] - level) / (s.w[i - 1] - s.w[i]);
      return s.t[i - 1] + f * (s.t[i] - s.t[i - 1]);
    }
  }
  return null;
}

/** Where the model first falls to 1/e, in t_d (bisection on the monotone early part). */
function modelFallTime(cD: number): number {
  const target = Math.exp(-1);
  let hi = 1;
  while (head(cD, hi) > target) hi *= 2;
  let lo = 0;
  for (let k = 0; k < 60; k++) {
    const mid = 0.5 * (lo + hi);
    if (head(cD, mid) > target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** A clearly negative trough means an oscillation (the noise of field records is far below 0.02). */
const TROUGH_THRESHOLD = -0.02;
/** Levenberg-Marquardt iterations per round (see fitHighK). */
const LM_ROUND = 20;
const GRID = [0.05, 0.1, 0.2, 0.35, 0.5, 0.7, 1, 1.4, 1.8, 2.2, 3, 5, 8, 13, 20, 35, 60, 100, 200, 500];

interface Start {
  cD: number;
  scale: number;
}

/**
 * Starting values. Underdamped (a clear trough below zero): the first trough of w_d lies at
 * t_d = π/ω with depth −exp(−aπ/ω), a = C_D/2, ω = √(1 − a²) (derived from the solution), so the
 * trough's depth gives C_D and its time (half the damped period) the time scale. Overdamped: the
 * log-slope of the record gives T0 ≈ C_D·√(L_e/g) (the large-C_D limit). Then, as a safety net, a
 * grid of C_D across all three regimes (each with the time scale that puts its 1/e fall where the
 * record's is, when L_e is free), and the start with the smallest residual wins.
 */
function startingValues(s: Series, scaleStart: number, fitScale: boolean): Start {
  const candidates: Start[] = [];
  let trough = 0;
  let troughTime = 0;
  for (let i = 0; i < s.w.length; i++) {
    if (s.w[i] < trough) {
      trough = s.w[i];
      troughTime = s.t[i];
    }
  }
  if (trough < TROUGH_THRESHOLD && -trough < 1) {
    const q = -Math.log(-trough) / Math.PI; // a/ω
    const a = q / Math.sqrt(1 + q * q);
    const omega = Math.sqrt(1 - a * a);
    candidates.push({ cD: 2 * a, scale: fitScale && troughTime > 0 ? (troughTime * omega) / Math.PI : scaleStart });
  } else {
    const lag = logSlopeLag(s);
    if (lag !== null) candidates.push({ cD: Math.max(lag / scaleStart, 2.2), scale: scaleStart });
  }
  const recordFall = firstFall(s, Math.exp(-1));
  for (const cD of GRID) {
    const scale = fitScale && recordFall !== null ? recordFall / modelFallTime(cD) : scaleStart;
    candidates.push({ cD, scale });
  }
  let best = candidates[0];
  let bestSse = Infinity;
  for (const c of candidates) {
    const sse = sumOfSquares(s, c.cD, c.scale, 0);
    if (sse < bestSse) {
      bestSse = sse;
      best = c;
    }
  }
  return best;
}

/** T0 from the free least-squares line of ln w over 0.1 < w < 0.6; null with fewer than 3 readings there. */
function logSlopeLag(s: Series): number | null {
  let n = 0;
  let st = 0;
  let sy = 0;
  let stt = 0;
  let sty = 0;
  for (let i = 0; i < s.t.length; i++) {
    const w = s.w[i];
    if (w > 0.1 && w < 0.6) {
      const y = Math.log(w);
      n++;
      st += s.t[i];
      sy += y;
      stt += s.t[i] * s.t[i];
      sty += s.t[i] * y;
    }
  }
  if (n < 3) return null;
  const slope = (n * sty - st * sy) / (n * stt - st * st);
  return slope < 0 ? -1 / slope : null;
}

interface Layout {
  fitScale: boolean;
  fitOffset: boolean;
  scaleStart: number;
  /** Offsets are fitted in units of this, so that every parameter moves on the order of 1. */
  offsetUnit: number;
}

function unpack(p: ArrayLike<number>, layout: Layout): { cD: number; scale: number; offset: number } {
  let k = 1;
  const cD = Math.exp(p[0]);
  const scale = layout.fitScale ? Math.exp(p[k++]) : layout.scaleStart;
  const offset = layout.fitOffset ? p[k] * layout.offsetUnit : 0;
  return { cD, scale, offset };
}

/** Central-difference Jacobian of the model at p, rows = readings. */
function jacobian(s: Series, p: number[], layout: Layout): Float64Array[] {
  const h = 1e-6;
  return p.map((_, j) => {
    const up = p.slice();
    const down = p.slice();
    up[j] += h;
    down[j] -= h;
    const u = unpack(up, layout);
    const d = unpack(down, layout);
    return Float64Array.from(s.t, (t) => (head(u.cD, (t - u.offset) / u.scale) - head(d.cD, (t - d.offset) / d.scale)) / (2 * h));
  });
}

/** Inverse of a small symmetric positive-definite matrix by Gauss-Jordan; null when singular. */
function invert(m: number[][]): number[][] | null {
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(...m.map((row, i) => Math.abs(row[i])));
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    if (!(Math.abs(a[pivot][col]) > 1e-13 * scale)) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    const d = a[col][col];
    for (let j = 0; j < 2 * n; j++) a[col][j] /= d;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r][col];
      for (let j = 0; j < 2 * n; j++) a[r][j] -= f * a[col][j];
    }
  }
  return a.map((row) => row.slice(n));
}

function standardErrors(s: Series, p: number[], layout: Layout, sse: number): HighKStandardErrors | null {
  const dof = s.t.length - p.length;
  if (dof <= 0) return null;
  const j = jacobian(s, p, layout);
  const jtj = j.map((a) => j.map((b) => a.reduce((sum, x, i) => sum + x * b[i], 0)));
  const inverse = invert(jtj);
  if (!inverse) return null;
  const sigma2 = sse / dof;
  const cov = inverse.map((row) => row.map((x) => x * sigma2));
  // parameters are ln C_D, ln √(L_e/g) and offset/unit: relative errors of C_D and √L_e are their standard errors
  const varLnC = cov[0][0];
  const scaleIndex = layout.fitScale ? 1 : -1;
  const varLnScale = scaleIndex > 0 ? cov[1][1] : 0;
  const covCScale = scaleIndex > 0 ? cov[0][1] : 0;
  const offsetIndex = layout.fitOffset ? p.length - 1 : -1;
  return {
    dampingParameterRelative: Math.sqrt(varLnC),
    effectiveLengthRelative: scaleIndex > 0 ? 2 * Math.sqrt(varLnScale) : null,
    kRelative: Math.sqrt(Math.max(0, varLnC + varLnScale + 2 * covCScale)),
    timeOffsetSeconds: offsetIndex >= 0 ? Math.sqrt(cov[offsetIndex][offsetIndex]) * layout.offsetUnit : null,
  };
}

/**
 * Fits the high-K model to a normalized record (elapsed seconds from the test start, H/H0) by
 * Levenberg-Marquardt (ml-levenberg-marquardt) over ln C_D, ln √(L_e/g) (when L_e is fitted) and the
 * start offset (when asked). K follows from C_D and L_e through the variant's shape factor.
 */
export function fitHighK(times: ArrayLike<number>, normalizedHead: ArrayLike<number>, options: HighKFitOptions): HighKFit {
  requireVariant(options.variant);
  validateGeometry(options.geometry);
  kTimesLag(options.variant, options.geometry); // the variant's own geometry checks, before any work
  let estimate: EffectiveLengthEstimate | null = null;
  if (options.effectiveLengthM !== undefined) {
    requirePositive('effectiveLengthM', options.effectiveLengthM);
    try {
      estimate = estimateEffectiveLength(options.geometry, options.waterColumnAboveScreenM);
    } catch (error) {
      if (!(error instanceof EngineInputError)) throw error;
    }
  } else {
    estimate = estimateEffectiveLength(options.geometry, options.waterColumnAboveScreenM);
  }
  const leStart = options.effectiveLengthM ?? (estimate as EffectiveLengthEstimate).effectiveLengthM;
  const s = validateSeries(times, normalizedHead);

  const fitScale = options.fitEffectiveLength ?? true;
  const fitOffset = options.fitTimeOffset ?? false;
  const maxIterations = options.maxIterations ?? 200;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) {
    throw new EngineInputError('maxIterations', `must be a whole number of 1 or more (got ${maxIterations})`);
  }
  const scaleStart = timeScaleSeconds(leStart);
  const start = startingValues(s, scaleStart, fitScale);
  const span = s.t[s.t.length - 1] - s.t[0];
  const layout: Layout = { fitScale, fitOffset, scaleStart: start.scale, offsetUnit: start.scale };
  const initial = [Math.log(start.cD)];
  const lower = [Math.log(1e-3)];
  const upper = [Math.log(1e5)];
  if (fitScale) {
    initial.push(Math.log(start.scale));
    lower.push(Math.log(start.scale / 100));
    upper.push(Math.log(start.scale * 100));
  }
  if (fitOffset) {
    initial.push(0);
    lower.push((-0.1 * span) / layout.offsetUnit);
    upper.push((0.1 * span) / layout.offsetUnit);
  }
  const model = (q: number[]) => {
    const { cD, scale, offset } = unpack(q, layout);
    return (t: number) => head(cD, (t - offset) / scale);
  };
  // The package stops only at maxIterations or a residual of exactly errorTolerance, so it runs in
  // rounds, each from the last optimum, until a round improves SS_res by less than 1e−10 relative.
  let p = initial;
  let iterations = 0;
  let sse = Infinity;
  while (iterations < maxIterations) {
    const round = Math.min(LM_ROUND, maxIterations - iterations);
    const lm = levenbergMarquardt({ x: s.t, y: s.w }, model, {
      initialValues: p,
      minValues: lower,
      maxValues: upper,
      damping: 1e-2,
      gradientDifference: 1e-6,
      centralDifference: true,
      maxIterations: round,
      errorTolerance: 0,
    });
    iterations += lm.iterations;
    const improved = lm.parameterError < sse;
    const relative = (sse - lm.parameterError) / lm.parameterError;
    if (improved) {
      p = lm.parameterValues;
      sse = lm.parameterError;
    }
    if (!improved || !(relative > 1e-10) || lm.iterations < round) break;
  }
  const { cD, scale, offset } = unpack(p, layout);
  const effectiveLengthM = fitScale ? STANDARD_GRAVITY * scale * scale : leStart;
  const timeScale = fitScale ? scale : scaleStart;
  sse = sumOfSquares(s, cD, timeScale, offset);
  let mean = 0;
  for (let i = 0; i < s.w.length; i++) mean += s.w[i];
  mean /= s.w.length;
  let sst = 0;
  for (let i = 0; i < s.w.length; i++) sst += (s.w[i] - mean) ** 2;
  const equivalentT0Seconds = cD * timeScale;
  const shape = overdampedK(options.variant, options.geometry, equivalentT0Seconds);
  const regime = dampingRegime(cD);
  const curve = (tSeconds: number) => head(cD, (tSeconds - offset) / timeScale);
  return {
    method: 'high-k',
    variant: options.variant,
    reference: `${HIGH_K_REFERENCES.model}; ${HIGH_K_REFERENCES[options.variant]}`,
    kMetersPerSecond: shape.kMetersPerSecond,
    dampingParameter: cD,
    regime,
    effectiveLengthM,
    effectiveLengthFitted: fitScale,
    effectiveLengthEstimate: estimate,
    timeScaleSeconds: timeScale,
    equivalentT0Seconds,
    dampedPeriodSeconds: cD < 2 ? (2 * Math.PI * timeScale) / Math.sqrt(1 - (cD * cD) / 4) : null,
    timeOffsetSeconds: offset,
    timeOffsetFitted: fitOffset,
    residualRms: Math.sqrt(sse / s.t.length),
    rSquared: sst > 0 ? 1 - sse / sst : sse === 0 ? 1 : 0,
    count: s.t.length,
    iterations,
    standardErrors: standardErrors(s, p, layout, sse),
    shape,
    curve,
    sampleCurve: (fromSeconds, toSeconds, count) => {
      requireFinite('fromSeconds', fromSeconds);
      requireFinite('toSeconds', toSeconds);
      if (!Number.isInteger(count) || count < 2) throw new EngineInputError('count', `must be a whole number of 2 or more (got ${count})`);
      const step = (toSeconds - fromSeconds) / (count - 1);
      const timeSeconds = Float64Array.from({ length: count }, (_, i) => (i === count - 1 ? toSeconds : fromSeconds + i * step));
      return { timeSeconds, normalizedHead: Float64Array.from(timeSeconds, curve) };
    },
  };
}

/** fitHighK over a reduced record's readings from the test start on. */
export function fitHighKReduced(reduced: ReducedRecord, options: HighKFitOptions): HighKFit {
  const start = reduced.testStartIndex;
  return fitHighK(reduced.elapsedSeconds.subarray(start), reduced.normalizedHead.subarray(start), options);
}
