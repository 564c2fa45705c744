import type { Fit, FitGeometry } from '@shared/schemas/fits';
import { analyzeReduced, type FitResult, type FitSettings } from '@shared/hydraulics/analyze';
import {
  analyzeHighKReduced,
  highKResultFields,
  sampleHighKCurve,
  type HighKAnalysis,
  type HighKCurveModel,
  type HighKSettings,
  type HighKSummary,
} from '@shared/hydraulics/analyze-high-k';
import { modelHead } from '@shared/hydraulics/high-k';
import { bouwerRiceShape } from '@shared/hydraulics/bouwer-rice';
import { EngineInputError, OscillatingResponseError } from '@shared/hydraulics/errors';
import { FALLBACK_HEAD_RANGE, RECOMMENDED_HEAD_RANGES, type FitMethod, type FitWindow } from '@shared/hydraulics/fitting';
import type { QcFlag } from '@shared/hydraulics/flags';
import { hvorslevShape } from '@shared/hydraulics/hvorslev';
import type { ReducedRecord } from '@shared/hydraulics/reduction';
import type { ReducedDto } from './api';

/** The DTO's arrays as the engine's typed arrays. */
export function toReducedRecord(dto: ReducedDto): ReducedRecord {
  return {
    reference: dto.reference,
    testType: dto.testType,
    staticLevelM: dto.staticLevelM,
    staticSource: dto.staticSource,
    preTestCount: dto.preTestCount,
    testStartSeconds: dto.testStartSeconds,
    testStartIndex: dto.testStartIndex,
    testStartSource: dto.testStartSource,
    h0M: dto.h0M,
    elapsedSeconds: Float64Array.from(dto.elapsedSeconds),
    displacementM: Float64Array.from(dto.displacementM),
    normalizedHead: Float64Array.from(dto.normalizedHead),
  };
}

export type Preview =
  | { kind: 'ok'; result: FitResult }
  | { kind: 'high-k'; result: HighKAnalysis; milliseconds: number }
  | { kind: 'oscillating'; flag: QcFlag }
  | { kind: 'input-error'; field: string; message: string };

/** The engine on the client: every input change re-runs it, no network. */
export function runPreview(reduced: ReducedRecord, settings: FitSettings): Preview {
  try {
    return { kind: 'ok', result: analyzeReduced(reduced, settings) };
  } catch (error) {
    if (error instanceof OscillatingResponseError) return { kind: 'oscillating', flag: error.flag };
    if (error instanceof EngineInputError) return { kind: 'input-error', field: error.field, message: error.message };
    throw error;
  }
}

/** The high-K model on the client: the Levenberg-Marquardt fit runs in the browser like the line. */
export function runHighKPreview(reduced: ReducedRecord, settings: HighKSettings): Preview {
  try {
    const started = performance.now();
    const result = analyzeHighKReduced(reduced, settings);
    return { kind: 'high-k', result, milliseconds: performance.now() - started };
  } catch (error) {
    if (error instanceof EngineInputError) return { kind: 'input-error', field: error.field, message: error.message };
    throw error;
  }
}

/** One shape for a preview and a stored result, so the plot and the panel draw either. */
export interface ResultView {
  model: 'line' | 'high-k';
  /** A high-K fit's own numbers; null for a straight line. */
  highK: HighKSummary | null;
  slopePerSecond: number;
  intercept: number;
  t0Seconds: number;
  rSquared: number;
  count: number;
  window: { source: 'recommended' | 'fallback' | 'entered' | 'all-readings'; fromSeconds: number; toSeconds: number; headMax: number; headMin: number };
  h0M: number;
  effectiveH0M: number;
  expectedH0M: number | null;
  lineCrossingSeconds: number;
  recordCrossingSeconds: number | null;
  kMetersPerSecond: number;
  /** Hvorslev only. */
  simplified: { kMetersPerSecond: number; valid: boolean; mLOverD: number; differencePercent: number } | null;
  /** Bouwer-Rice only. */
  bouwerRice: { lnReOverRw: number; penetration: 'partial' | 'full'; leOverRw: number; capApplied: boolean } | null;
  casingRadiusUsedM: number;
  casingRadiusIsEffective: boolean;
  lineReference: string;
  kReference: string;
  flags: QcFlag[];
}

/** The method's shape details as the panel shows them. */
function shapeView(k: FitResult['k']): Pick<ResultView, 'simplified' | 'bouwerRice'> {
  return {
    simplified:
      k.method === 'hvorslev'
        ? { kMetersPerSecond: k.simplified.kMetersPerSecond, valid: k.simplified.valid, mLOverD: k.mLOverD, differencePercent: k.simplified.differencePercent }
        : null,
    bouwerRice:
      k.method === 'bouwer-rice' ? { lnReOverRw: k.lnReOverRw, penetration: k.penetration, leOverRw: k.leOverRw, capApplied: k.capApplied } : null,
  };
}

export function viewFromPreview(result: FitResult, reduced: ReducedRecord, slugVolumeM3: number | null): ResultView {
  const { fit, k, flags } = result;
  return {
    model: 'line',
    highK: null,
    slopePerSecond: fit.slopePerSecond,
    intercept: fit.intercept,
    t0Seconds: fit.t0Seconds,
    rSquared: fit.rSquared,
    count: fit.count,
    window: {
      source: fit.window.source,
      fromSeconds: fit.window.fromSeconds,
      toSeconds: fit.window.toSeconds,
      headMax: fit.window.headMax,
      headMin: fit.window.headMin,
    },
    h0M: reduced.h0M,
    effectiveH0M: fit.effectiveH0M,
    expectedH0M: slugVolumeM3 === null ? null : slugVolumeM3 / (Math.PI * k.casingRadiusM * k.casingRadiusM),
    lineCrossingSeconds: fit.lineCrossingSeconds,
    recordCrossingSeconds: fit.recordCrossingSeconds,
    kMetersPerSecond: k.kMetersPerSecond,
    ...shapeView(k),
    casingRadiusUsedM: k.casingRadiusM,
    casingRadiusIsEffective: k.casingRadiusIsEffective,
    lineReference: fit.reference,
    kReference: k.reference,
    flags,
  };
}

/** A high-K preview in the same shape: the fields the server stores (highKResultFields), and its shape details. */
export function viewFromHighK(result: HighKAnalysis, reduced: ReducedRecord, slugVolumeM3: number | null): ResultView {
  const r = highKResultFields(result.fit, reduced, slugVolumeM3);
  const k = result.fit.shape;
  return {
    ...r,
    model: 'high-k',
    ...shapeView(k),
    flags: result.flags,
  };
}

function shapeDetails(method: FitMethod, geometry: FitGeometry) {
  try {
    if (method === 'hvorslev') {
      const s = hvorslevShape(geometry);
      return { hvorslev: s, bouwerRice: null };
    }
    return { hvorslev: null, bouwerRice: bouwerRiceShape(geometry) };
  } catch {
    return { hvorslev: null, bouwerRice: null };
  }
}

/** The server's stored numbers, in the same shape as a preview. */
export function viewFromStored(fit: Fit): ResultView {
  const r = fit.result;
  const shape = shapeDetails(fit.method, fit.geometry);
  const simplified =
    fit.method === 'hvorslev' && r.kSimplifiedMetersPerSecond !== null
      ? {
          kMetersPerSecond: r.kSimplifiedMetersPerSecond,
          valid: shape.hvorslev ? shape.hvorslev.mLOverD > 4 : false,
          mLOverD: shape.hvorslev?.mLOverD ?? Number.NaN,
          differencePercent: ((r.kSimplifiedMetersPerSecond - r.kMetersPerSecond) / r.kMetersPerSecond) * 100,
        }
      : null;
  return {
    model: fit.model,
    highK: fit.model === 'high-k' ? (r.highK ?? null) : null,
    slopePerSecond: r.slopePerSecond,
    intercept: r.intercept,
    t0Seconds: r.t0Seconds,
    rSquared: r.rSquared,
    count: r.count,
    window: r.window,
    h0M: r.h0M,
    effectiveH0M: r.effectiveH0M,
    expectedH0M: r.expectedH0M,
    lineCrossingSeconds: r.lineCrossingSeconds,
    recordCrossingSeconds: r.recordCrossingSeconds,
    kMetersPerSecond: r.kMetersPerSecond,
    simplified,
    bouwerRice: shape.bouwerRice
      ? { lnReOverRw: shape.bouwerRice.lnReOverRw, penetration: shape.bouwerRice.penetration, leOverRw: shape.bouwerRice.leOverRw, capApplied: shape.bouwerRice.capApplied }
      : null,
    casingRadiusUsedM: r.casingRadiusUsedM,
    casingRadiusIsEffective: r.casingRadiusIsEffective,
    lineReference: r.lineReference,
    kReference: r.kReference,
    flags: fit.flags as QcFlag[],
  };
}

/**
 * Which readings the window holds, for the residual strip: the entered window, or the head range
 * the engine fell back on when none was entered.
 */
export function windowFilter(window: FitWindow | null, view: ResultView, method: FitMethod): (t: number, h: number) => boolean {
  if (window?.kind === 'time') return (t) => t >= window.fromSeconds && t <= window.toSeconds;
  const range =
    window?.kind === 'head' ? window : view.window.source === 'fallback' ? FALLBACK_HEAD_RANGE : RECOMMENDED_HEAD_RANGES[method];
  return (_t, h) => h > range.lower && h <= range.upper;
}

export interface Residuals {
  elapsedSeconds: number[];
  residual: number[];
}

/** ln(H/H0) minus the line, for the window's readings (at most `maxPoints`, evenly taken). */
export function residuals(reduced: ReducedRecord, view: ResultView, inWindow: (t: number, h: number) => boolean, maxPoints = 1500): Residuals {
  const idx: number[] = [];
  const { elapsedSeconds: e, normalizedHead: h, testStartIndex: start } = reduced;
  for (let i = start; i < e.length; i++) if (h[i] > 0 && inWindow(e[i], h[i])) idx.push(i);
  const stride = Math.max(1, Math.ceil(idx.length / maxPoints));
  const out: Residuals = { elapsedSeconds: [], residual: [] };
  for (let k = 0; k < idx.length; k += stride) {
    const i = idx[k];
    out.elapsedSeconds.push(e[i]);
    out.residual.push(Math.log(h[i]) - (view.intercept + view.slopePerSecond * e[i]));
  }
  return out;
}

/**
 * The fitted high-K curve for the plot: `count` points over the part of the record where the model
 * still moves (until its envelope, or its slow exponential, is below 10⁻³ of H0), then one point at
 * the record's end, so a long tail at static does not thin the oscillation out.
 */
export function highKCurveForPlot(model: HighKCurveModel & { timeScaleSeconds: number }, endSeconds: number, count = 400): { timeSeconds: number[]; normalizedHead: number[] } {
  const c = model.dampingParameter;
  const moving = model.timeOffsetSeconds + 7 * model.timeScaleSeconds * Math.max(2 / c, c);
  const to = Math.max(model.timeOffsetSeconds + model.timeScaleSeconds, Math.min(endSeconds, moving));
  const curve = sampleHighKCurve(model, 0, to, count);
  if (endSeconds > to) {
    curve.timeSeconds.push(endSeconds);
    curve.normalizedHead.push(modelHead(model, endSeconds));
  }
  return curve;
}
