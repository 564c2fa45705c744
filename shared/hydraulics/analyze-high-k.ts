import { intakeFlag } from './analyze';
import { EngineInputError } from './errors';
import { crossingSeconds } from './fitting';
import type { QcFlag } from './flags';
import { casingRadiusForFlow, type WellGeometry } from './geometry';
import { fitHighKReduced, HIGH_K_REFERENCES, MIN_HIGH_K_READINGS, modelHead, type DampingRegime, type HighKFit, type HighKVariant } from './high-k';
import { findMaterial, type MaterialId } from './materials';
import { driftFlag, h0Flag, kFlags, oscillationFlag, shapeFactorFlags } from './qc';
import type { ReducedRecord } from './reduction';

/*
 * The high-K model as a fit of a stored record (docs/methods.md section 6a): the Springer-Gelhar
 * fit of the reduced record, with the flags that still mean something for it. The straight-line
 * flags (window, concave upward, r² of the line, H0 of the line) do not apply: the model is fitted
 * to every reading from the test start. An oscillation is what the model describes, so its flag
 * stays as a note about the record.
 */

export interface HighKSettings {
  /** The shape-factor family: high-K Hvorslev or high-K Bouwer-Rice. */
  variant: HighKVariant;
  geometry: WellGeometry;
  /** L_e, m: held when fitEffectiveLength is false, the starting value otherwise; default the estimate from the well. */
  effectiveLengthM?: number;
  /** Default true. */
  fitEffectiveLength?: boolean;
  material?: MaterialId;
  /** The slug's volume, m³, when known: the measured H0 is checked against it as for a straight line. */
  slugVolumeM3?: number;
}

export interface HighKAnalysis {
  fit: HighKFit;
  flags: QcFlag[];
}

/** Engine fields of the high-K fit as the fit request names them. */
function requestField(field: string): string {
  if (field === 'effectiveLengthM' || field === 'waterColumnAboveScreenM') return 'options.highK.effectiveLengthM';
  if (field === 'times' || field === 'normalizedHead') return 'model';
  return field;
}

const OVERDAMPED_CLAUSE = / Hvorslev and Bouwer-Rice assume an overdamped response, so their K does not apply\.$/;

/** The oscillation flag as a note on a high-K fit: the model fitted is the one for such a record. */
export function oscillationNote(flag: QcFlag): QcFlag {
  return {
    ...flag,
    severity: 'info',
    message: `${flag.message.replace(OVERDAMPED_CLAUSE, '')} The high-K model fitted here describes such a response.`,
    suggestion: undefined,
  };
}

/** Fits the high-K model to a reduced record; refusals are EngineInputErrors naming the request's field. */
export function analyzeHighKReduced(reduced: ReducedRecord, settings: HighKSettings): HighKAnalysis {
  if (settings.material !== undefined && !findMaterial(settings.material)) {
    throw new EngineInputError('material', `unknown material "${settings.material}"`);
  }
  const readings = reduced.elapsedSeconds.length - reduced.testStartIndex;
  if (readings < MIN_HIGH_K_READINGS) {
    throw new EngineInputError('model', `the record has ${readings} readings from the test start; the high-K fit needs at least ${MIN_HIGH_K_READINGS}`);
  }
  let fit: HighKFit;
  try {
    fit = fitHighKReduced(reduced, {
      variant: settings.variant,
      geometry: settings.geometry,
      effectiveLengthM: settings.effectiveLengthM,
      fitEffectiveLength: settings.fitEffectiveLength ?? true,
    });
  } catch (error) {
    if (error instanceof EngineInputError && requestField(error.field) !== error.field) {
      const field = requestField(error.field);
      const problem =
        error.field === 'waterColumnAboveScreenM'
          ? 'cannot be estimated from the well (no static level to screen bottom); enter L_e'
          : error.field === 'normalizedHead'
            ? `the high-K model cannot be fitted: H/H0 ${error.problem}`
            : error.problem;
      throw new EngineInputError(field, problem, { code: error.code });
    }
    throw error;
  }
  const flags: QcFlag[] = [];
  const oscillation = oscillationFlag(reduced);
  if (oscillation) flags.push(oscillationNote(oscillation));
  const drift = driftFlag(reduced);
  if (drift) flags.push(drift);
  flags.push(...kFlags(fit.kMetersPerSecond, settings.material ? findMaterial(settings.material) : undefined));
  flags.push(...shapeFactorFlags(fit.shape));
  const intake = intakeFlag(settings.variant, settings.geometry, fit.equivalentT0Seconds, fit.kMetersPerSecond);
  if (intake) flags.push(intake);
  if (settings.slugVolumeM3 !== undefined) {
    const h0 = h0Flag(reduced, casingRadiusForFlow(settings.geometry).radiusM, settings.slugVolumeM3);
    if (h0) flags.push(h0);
  }
  return { fit, flags };
}

/** A high-K fit's own numbers, as stored and shown. */
export interface HighKSummary {
  dampingParameter: number;
  regime: DampingRegime;
  effectiveLengthM: number;
  effectiveLengthEstimateM: number | null;
  effectiveLengthFitted: boolean;
  timeScaleSeconds: number;
  dampedPeriodSeconds: number | null;
  residualRms: number;
  timeOffsetSeconds: number;
  kRelativeStandardError: number | null;
}

/**
 * A high-K fit in the shape of a straight-line result, so lists, Well K and the map read it like any
 * fit: T0 the equivalent time lag C_D·√(L_e/g), the slope −1/T0 (intercept 0), the window every
 * reading from the test start; its own numbers under `highK`. The server stores it, the workspace
 * previews it.
 */
export function highKResultFields(fit: HighKFit, reduced: ReducedRecord, slugVolumeM3: number | null) {
  const { elapsedSeconds: e, normalizedHead: h, testStartIndex: start } = reduced;
  let headMax = -Infinity;
  let headMin = Infinity;
  for (let i = start; i < h.length; i++) {
    if (h[i] > headMax) headMax = h[i];
    if (h[i] < headMin) headMin = h[i];
  }
  const casingRadiusM = fit.shape.casingRadiusM;
  const highK: HighKSummary = {
    dampingParameter: fit.dampingParameter,
    regime: fit.regime,
    effectiveLengthM: fit.effectiveLengthM,
    effectiveLengthEstimateM: fit.effectiveLengthEstimate?.effectiveLengthM ?? null,
    effectiveLengthFitted: fit.effectiveLengthFitted,
    timeScaleSeconds: fit.timeScaleSeconds,
    dampedPeriodSeconds: fit.dampedPeriodSeconds,
    residualRms: fit.residualRms,
    timeOffsetSeconds: fit.timeOffsetSeconds,
    kRelativeStandardError: fit.standardErrors?.kRelative ?? null,
  };
  return {
    slopePerSecond: -1 / fit.equivalentT0Seconds,
    intercept: 0,
    t0Seconds: fit.equivalentT0Seconds,
    rSquared: fit.rSquared,
    count: fit.count,
    window: { source: 'all-readings' as const, fromSeconds: e[start], toSeconds: e[e.length - 1], headMax, headMin, count: fit.count },
    h0M: reduced.h0M,
    effectiveH0M: reduced.h0M,
    expectedH0M: slugVolumeM3 && casingRadiusM ? slugVolumeM3 / (Math.PI * casingRadiusM ** 2) : null,
    lineCrossingSeconds: fit.equivalentT0Seconds,
    recordCrossingSeconds: crossingSeconds(reduced, Math.exp(-1)),
    kMetersPerSecond: fit.kMetersPerSecond,
    kSimplifiedMetersPerSecond: fit.shape.method === 'hvorslev' ? fit.shape.simplified.kMetersPerSecond : null,
    casingRadiusUsedM: casingRadiusM,
    casingRadiusIsEffective: fit.shape.casingRadiusIsEffective,
    lineReference: HIGH_K_REFERENCES.model,
    kReference: HIGH_K_REFERENCES[fit.variant],
    highK,
  };
}

/** The model's parameters that draw its curve (stored with every high-K fit). */
export type HighKCurveModel = Pick<HighKSummary, 'dampingParameter' | 'effectiveLengthM' | 'timeOffsetSeconds'>;

/** `count` evenly spaced points of the model's H/H0 from `fromSeconds` to `toSeconds`, inclusive (for the plot). */
export function sampleHighKCurve(model: HighKCurveModel, fromSeconds: number, toSeconds: number, count: number): { timeSeconds: number[]; normalizedHead: number[] } {
  if (!Number.isInteger(count) || count < 2) throw new EngineInputError('count', `must be a whole number of 2 or more (got ${count})`);
  const timeSeconds: number[] = [];
  const normalizedHead: number[] = [];
  for (let i = 0; i < count; i++) {
    const t = i === count - 1 ? toSeconds : fromSeconds + ((toSeconds - fromSeconds) * i) / (count - 1);
    timeSeconds.push(t);
    normalizedHead.push(modelHead(model, t));
  }
  return { timeSeconds, normalizedHead };
}

/** H/H0 of the record minus the model's, from the test start (at most `maxPoints`, evenly taken). */
export function highKResiduals(reduced: ReducedRecord, model: HighKCurveModel, maxPoints = 1500): { elapsedSeconds: number[]; residual: number[] } {
  const { elapsedSeconds: e, normalizedHead: h, testStartIndex: start } = reduced;
  const n = e.length - start;
  const stride = Math.max(1, Math.ceil(n / maxPoints));
  const out = { elapsedSeconds: [] as number[], residual: [] as number[] };
  for (let i = start; i < e.length; i += stride) {
    out.elapsedSeconds.push(e[i]);
    out.residual.push(h[i] - modelHead(model, e[i]));
  }
  return out;
}
