import { EngineInputError, formatNumber, requireFinite } from './errors';
import { REFERENCES } from './references';
import type { ReducedRecord } from './reduction';

export type FitMethod = 'hvorslev' | 'bouwer-rice';
export type FitLine = 'anchored' | 'free';

export const FIT_METHODS: readonly { id: FitMethod; label: string }[] = [
  { id: 'hvorslev', label: 'Hvorslev (1951)' },
  { id: 'bouwer-rice', label: 'Bouwer & Rice (1976)' },
];

export const FIT_LINES: readonly { id: FitLine; label: string }[] = [
  { id: 'anchored', label: 'Anchored through H/H0 = 1 at t = 0' },
  { id: 'free', label: 'Free line (intercept fitted)' },
];

/** A range of normalized head; a reading belongs to it when lower < H/H0 ≤ upper. */
export interface HeadRange {
  upper: number;
  lower: number;
}

/** Butler (1998, memory). */
export const RECOMMENDED_HEAD_RANGES: Readonly<Record<FitMethod, HeadRange>> = {
  hvorslev: { upper: 0.25, lower: 0.15 },
  'bouwer-rice': { upper: 0.3, lower: 0.2 },
};

/** Used when the recommended range holds fewer than 3 readings. */
export const FALLBACK_HEAD_RANGE: HeadRange = { upper: 1, lower: 0.05 };

export const MIN_WINDOW_READINGS = 3;

/** Times are elapsed seconds since the test start. */
export type FitWindow =
  | { kind: 'time'; fromSeconds: number; toSeconds: number }
  | ({ kind: 'head' } & HeadRange);

export interface ResolvedWindow {
  source: 'recommended' | 'fallback' | 'entered';
  window: FitWindow;
  count: number;
  /** Elapsed time of the first and last reading in the window. */
  fromSeconds: number;
  toSeconds: number;
  /** Largest and smallest H/H0 among the readings in the window. */
  headMax: number;
  headMin: number;
}

export interface LineFit {
  line: FitLine;
  reference: string;
  /** Of ln(H/H0) against elapsed time, 1/s. */
  slopePerSecond: number;
  /** ln(H/H0) at t = 0: 0 for the anchored line. */
  intercept: number;
  t0Seconds: number;
  /**
   * The share of ln(H/H0) the line explains, 0–1, as is usual for each line: about the origin for
   * the anchored line (1 − SS_res/Σy²), about the mean for the free line. What is shown.
   */
  rSquared: number;
  /**
   * 1 − SS_res/SS_tot about the mean of ln(H/H0), for the QC (the same as rSquared for the free
   * line). For a line forced through the origin it can be negative: never shown as it is.
   */
  rSquaredAboutMean: number;
  count: number;
  window: ResolvedWindow;
  /** e^intercept × H0: the line's H0, the effective H0 of a free fit. */
  effectiveH0M: number;
  /** Where the fitted line crosses H/H0 = 1/e (the graphical reading of T0 on the line). */
  lineCrossingSeconds: number;
  /** Where the record itself first crosses 1/e, interpolated; null if it never does. */
  recordCrossingSeconds: number | null;
}

export interface FitOptions {
  method: FitMethod;
  line?: FitLine;
  window?: FitWindow;
}

/** Readings from `from` on in each of two ranges, counted in one pass. */
function countInRanges(head: Float64Array, from: number, first: HeadRange, second: HeadRange): [number, number] {
  let a = 0;
  let b = 0;
  for (let i = from; i < head.length; i++) {
    const h = head[i];
    if (h > first.lower && h <= first.upper) a++;
    if (h > second.lower && h <= second.upper) b++;
  }
  return [a, b];
}

function validateWindow(window: FitWindow): void {
  if (window.kind === 'time') {
    requireFinite('fit.window.fromSeconds', window.fromSeconds);
    requireFinite('fit.window.toSeconds', window.toSeconds);
    if (!(window.toSeconds > window.fromSeconds)) {
      throw new EngineInputError('fit.window', `ends (${window.toSeconds} s) before it starts (${window.fromSeconds} s)`);
    }
  } else if (window.kind === 'head') {
    requireFinite('fit.window.upper', window.upper);
    requireFinite('fit.window.lower', window.lower);
    if (!(window.lower > 0)) {
      throw new EngineInputError('fit.window.lower', `must be above 0 (got ${window.lower}): ln(H/H0) is undefined at H/H0 ≤ 0`);
    }
    if (!(window.upper > window.lower)) {
      throw new EngineInputError('fit.window', `upper H/H0 ${window.upper} must be above lower H/H0 ${window.lower}`);
    }
  } else {
    throw new EngineInputError('fit.window.kind', `must be "time" or "head" (got "${String((window as { kind: unknown }).kind)}")`);
  }
}

interface ChosenWindow {
  window: FitWindow;
  source: ResolvedWindow['source'];
  /** Readings in the window, when choosing it already counted them. */
  count?: number;
}

/** The window the fit will use: the entered one, else the method's recommended range, else the fallback. */
export function chooseWindow(reduced: ReducedRecord, method: FitMethod, window?: FitWindow): ChosenWindow {
  if (window) {
    validateWindow(window);
    return { window, source: 'entered' };
  }
  const recommended = RECOMMENDED_HEAD_RANGES[method];
  if (!recommended) throw new EngineInputError('method', `must be hvorslev or bouwer-rice (got "${String(method)}")`);
  const [inRecommended, inFallback] = countInRanges(reduced.normalizedHead, reduced.testStartIndex, recommended, FALLBACK_HEAD_RANGE);
  if (inRecommended >= MIN_WINDOW_READINGS) {
    return { window: { kind: 'head', ...recommended }, source: 'recommended', count: inRecommended };
  }
  return { window: { kind: 'head', ...FALLBACK_HEAD_RANGE }, source: 'fallback', count: inFallback };
}

function firstIndexAtOrAfter(values: Float64Array, from: number, target: number): number {
  let lo = from;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid] < target) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

interface Collected {
  t: Float64Array;
  y: Float64Array;
  headMax: number;
  headMin: number;
}

/** Readings of the window as compact (t, ln H/H0) arrays. */
function collect(reduced: ReducedRecord, chosen: ChosenWindow): Collected {
  const { elapsedSeconds: e, normalizedHead: h, testStartIndex: start } = reduced;
  const n = e.length;
  const window = chosen.window;
  let headMax = -Infinity;
  let headMin = Infinity;
  if (window.kind === 'time') {
    const first = firstIndexAtOrAfter(e, start, window.fromSeconds);
    let end = firstIndexAtOrAfter(e, first, window.toSeconds);
    if (end < n && e[end] === window.toSeconds) end++;
    const count = end - first;
    const t = new Float64Array(count);
    const y = new Float64Array(count);
    for (let i = first, k = 0; i < end; i++, k++) {
      const hi = h[i];
      if (!(hi > 0)) {
        throw new EngineInputError(
          'fit.window',
          `includes a reading with H/H0 ≤ 0 (t = ${formatNumber(e[i])} s, H/H0 = ${formatNumber(hi)}); ln(H/H0) is undefined there, so end the window before the record reaches static`,
        );
      }
      t[k] = e[i];
      y[k] = Math.log(hi);
      if (hi > headMax) headMax = hi;
      if (hi < headMin) headMin = hi;
    }
    return { t, y, headMax, headMin };
  }
  const { lower, upper } = window;
  const count = chosen.count ?? countInRanges(h, start, window, window)[0];
  const t = new Float64Array(count);
  const y = new Float64Array(count);
  for (let i = start, k = 0; k < count; i++) {
    const hi = h[i];
    if (hi > lower && hi <= upper) {
      t[k] = e[i];
      y[k] = Math.log(hi);
      if (hi > headMax) headMax = hi;
      if (hi < headMin) headMin = hi;
      k++;
    }
  }
  return { t, y, headMax, headMin };
}

/** Elapsed time at which the record first falls to `level` (log-linear between readings). */
export function crossingSeconds(reduced: ReducedRecord, level: number): number | null {
  const { elapsedSeconds: e, normalizedHead: h, testStartIndex: start } = reduced;
  if (h[start] <= level) return e[start];
  for (let i = start + 1; i < h.length; i++) {
    if (h[i] <= level) {
      const h0 = h[i - 1];
      const h1 = h[i];
      const f = h1 > 0 ? (Math.log(h0) - Math.log(level)) / (Math.log(h0) - Math.log(h1)) : (h0 - level) / (h0 - h1);
      return e[i - 1] + f * (e[i] - e[i - 1]);
    }
  }
  return null;
}

interface LineSums {
  slope: number;
  intercept: number;
  rSquared: number;
  rSquaredAboutMean: number;
}

function anchoredLine(t: Float64Array, y: Float64Array): LineSums {
  let stt = 0;
  let sty = 0;
  let sy = 0;
  const n = t.length;
  for (let i = 0; i < n; i++) {
    stt += t[i] * t[i];
    sty += t[i] * y[i];
    sy += y[i];
  }
  if (!(stt > 0)) throw new EngineInputError('fit.window', 'holds readings only at t = 0; the anchored line needs at least one reading after the start');
  const slope = sty / stt;
  const meanY = sy / n;
  let ssRes = 0;
  let ssTot = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i] - slope * t[i];
    ssRes += r * r;
    const d = y[i] - meanY;
    ssTot += d * d;
    syy += y[i] * y[i];
  }
  // Regression through the origin: r² about the origin, 1 − SS_res/Σy², in [0, 1] (Eisenhauer 2003, memory).
  // The centred figure is kept for the QC; for a line forced through the origin it can fall below 0.
  return {
    slope,
    intercept: 0,
    rSquared: syy > 0 ? Math.min(1, Math.max(0, 1 - ssRes / syy)) : 1,
    rSquaredAboutMean: ssTot > 0 ? 1 - ssRes / ssTot : ssRes === 0 ? 1 : 0,
  };
}

function freeLine(t: Float64Array, y: Float64Array): LineSums {
  const n = t.length;
  let st = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    st += t[i];
    sy += y[i];
  }
  const meanT = st / n;
  const meanY = sy / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dt = t[i] - meanT;
    const dy = y[i] - meanY;
    sxx += dt * dt;
    sxy += dt * dy;
    syy += dy * dy;
  }
  if (!(sxx > 0)) throw new EngineInputError('fit.window', `holds ${n} reading(s) at one time; the free line needs at least 2 distinct times`);
  const slope = sxy / sxx;
  const rSquared = syy > 0 ? (sxy * sxy) / (sxx * syy) : 1;
  return { slope, intercept: meanY - slope * meanT, rSquared, rSquaredAboutMean: rSquared };
}

/** Fits the straight line ln(H/H0) = a − t/T0 over the window. */
export function fitLine(reduced: ReducedRecord, options: FitOptions): LineFit {
  const line = options.line ?? 'anchored';
  if (line !== 'anchored' && line !== 'free') throw new EngineInputError('fit.line', `must be anchored or free (got "${String(line)}")`);
  const chosen = chooseWindow(reduced, options.method, options.window);
  const { t, y, headMax, headMin } = collect(reduced, chosen);
  const count = t.length;
  if (count === 0) {
    throw new EngineInputError('fit.window', 'holds no readings; widen it or check the test start and static level');
  }
  const sums = line === 'anchored' ? anchoredLine(t, y) : freeLine(t, y);
  if (!(sums.slope < 0)) {
    throw new EngineInputError('fit.window', `gives a line that does not fall (slope ${formatNumber(sums.slope)} per s): there is no recovery to fit in it`);
  }
  const t0Seconds = -1 / sums.slope;
  return {
    line,
    reference: line === 'anchored' ? REFERENCES.anchoredFit : REFERENCES.freeFit,
    slopePerSecond: sums.slope,
    intercept: sums.intercept,
    t0Seconds,
    rSquared: sums.rSquared,
    rSquaredAboutMean: sums.rSquaredAboutMean,
    count,
    window: {
      source: chosen.source,
      window: chosen.window,
      count,
      fromSeconds: t[0],
      toSeconds: t[count - 1],
      headMax,
      headMin,
    },
    effectiveH0M: reduced.h0M * Math.exp(sums.intercept),
    lineCrossingSeconds: t0Seconds * (1 + sums.intercept),
    recordCrossingSeconds: crossingSeconds(reduced, Math.exp(-1)),
  };
}
