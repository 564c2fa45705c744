import { bouwerRiceK, bouwerRiceShape, type BouwerRiceResult } from './bouwer-rice';
import { EngineInputError, OscillatingResponseError, requirePositive } from './errors';
import { fitLine, type FitLine, type FitMethod, type FitWindow, type LineFit } from './fitting';
import type { QcFlag } from './flags';
import { boreholeRadiusOf, bouwerRiceRadiusOf, casingRadiusForFlow, intakeRadiusOf, validateGeometry, type WellGeometry } from './geometry';
import { hvorslevK, hvorslevShape, type HvorslevResult } from './hvorslev';
import { findMaterial, type MaterialId } from './materials';
import { concaveUpwardFlag, driftFlag, fitFlags, h0Flag, intakeScreenInFilterPackFlag, kFlags, oscillationFlag, shapeFactorFlags } from './qc';
import { reduceRecord, type RawRecord, type ReducedRecord, type ReductionSettings } from './reduction';

export type KResult = HvorslevResult | BouwerRiceResult;

export interface FitSettings {
  method: FitMethod;
  geometry: WellGeometry;
  /** Default 'anchored'. */
  line?: FitLine;
  /** Default: the method's recommended head range, or 0.05 < H/H0 ≤ 1. */
  window?: FitWindow;
  /** Fit an oscillating record anyway; the oscillation flag stays on the result. */
  allowOscillation?: boolean;
  /** Volume of the slug, m³, to compare measured and expected H0. */
  slugVolumeM3?: number;
  /** Material of the screened unit, to compare K with its range. */
  material?: MaterialId;
}

export interface AnalyzeInput extends FitSettings {
  record: RawRecord;
  reduction: ReductionSettings;
}

export interface FitResult {
  fit: LineFit;
  k: KResult;
  flags: QcFlag[];
}

export interface Analysis extends FitResult {
  reduced: ReducedRecord;
}

function validateSettings(settings: FitSettings): void {
  if (settings.method !== 'hvorslev' && settings.method !== 'bouwer-rice') {
    throw new EngineInputError('method', `must be hvorslev or bouwer-rice (got "${String(settings.method)}")`);
  }
  validateGeometry(settings.geometry);
  // Check the method's own geometry before any work on the record, so a refusal comes first.
  if (settings.method === 'hvorslev') hvorslevShape(settings.geometry);
  else bouwerRiceShape(settings.geometry);
  if (settings.slugVolumeM3 !== undefined) requirePositive('slugVolumeM3', settings.slugVolumeM3);
  if (settings.material !== undefined && !findMaterial(settings.material)) {
    throw new EngineInputError('material', `unknown material "${settings.material}"`);
  }
}

/**
 * Fit, K and flags for a record already reduced: what a preview re-runs when the window, the line
 * or the geometry changes. Throws OscillatingResponseError for an oscillating record unless
 * `allowOscillation` is set.
 */
export function analyzeReduced(reduced: ReducedRecord, settings: FitSettings): FitResult {
  validateSettings(settings);
  const flags: QcFlag[] = [];
  const oscillation = oscillationFlag(reduced);
  if (oscillation) {
    if (!settings.allowOscillation) throw new OscillatingResponseError(oscillation);
    flags.push(oscillation);
  }
  const drift = driftFlag(reduced);
  if (drift) flags.push(drift);
  const fit = fitLine(reduced, { method: settings.method, line: settings.line, window: settings.window });
  const k = settings.method === 'hvorslev' ? hvorslevK(settings.geometry, fit.t0Seconds) : bouwerRiceK(settings.geometry, fit.t0Seconds);

  const concave = concaveUpwardFlag(reduced);
  if (concave) flags.push(concave);
  flags.push(...fitFlags(fit, settings.method));
  if (settings.slugVolumeM3 !== undefined) {
    const h0 = h0Flag(reduced, casingRadiusForFlow(settings.geometry).radiusM, settings.slugVolumeM3);
    if (h0) flags.push(h0);
  }
  flags.push(...kFlags(k.kMetersPerSecond, settings.material ? findMaterial(settings.material) : undefined));
  flags.push(...shapeFactorFlags(k));
  const intake = intakeFlag(settings.method, settings.geometry, fit.t0Seconds, k.kMetersPerSecond);
  if (intake) flags.push(intake);
  return { fit, k, flags };
}

/** The screen radius taken as the intake where the borehole is wider: K with each radius. */
export function intakeFlag(method: FitMethod, geometry: WellGeometry, t0Seconds: number, kMetersPerSecond: number): QcFlag | null {
  const used = method === 'hvorslev' ? intakeRadiusOf(geometry) : bouwerRiceRadiusOf(geometry);
  const boreholeRadiusM = boreholeRadiusOf(geometry);
  if (used !== geometry.screenRadiusM || !(boreholeRadiusM > geometry.screenRadiusM)) return null;
  const withBorehole = { ...geometry, intake: 'borehole' as const };
  let kBorehole: number | null = null;
  try {
    kBorehole = (method === 'hvorslev' ? hvorslevK(withBorehole, t0Seconds) : bouwerRiceK(withBorehole, t0Seconds)).kMetersPerSecond;
  } catch (e) {
    if (!(e instanceof EngineInputError)) throw e;
  }
  return intakeScreenInFilterPackFlag({ method, screenRadiusM: geometry.screenRadiusM, boreholeRadiusM, kScreenMetersPerSecond: kMetersPerSecond, kBoreholeMetersPerSecond: kBorehole });
}

/** Raw series and settings to reduced series, fitted line, K and QC flags, in one call. */
export function analyzeRecord(input: AnalyzeInput): Analysis {
  validateSettings(input);
  const reduced = reduceRecord(input.record, input.reduction);
  return { reduced, ...analyzeReduced(reduced, input) };
}
