import { requirePositive } from './errors';
import { casingRadiusForFlow, intakeRadiusOf, validateGeometry, type WellGeometry } from './geometry';
import { REFERENCES } from './references';

export interface HvorslevResult {
  method: 'hvorslev';
  kMetersPerSecond: number;
  reference: string;
  casingRadiusM: number;
  casingRadiusIsEffective: boolean;
  intakeRadiusM: number;
  intakeLengthM: number;
  /** m = √(Kh/Kv). */
  anisotropyFactor: number;
  /** mL/D with D = 2R. */
  mLOverD: number;
  /** F in K = π rc² / (F T0). */
  shapeFactorM: number;
  simplified: {
    kMetersPerSecond: number;
    shapeFactorM: number;
    /** Hvorslev's condition mL/D > 4 (L/R > 8 when m = 1). */
    valid: boolean;
    /** (simplified − full) / full, in per cent. */
    differencePercent: number;
    reference: string;
  };
}

export interface HvorslevShape {
  intakeRadiusM: number;
  intakeLengthM: number;
  anisotropyFactor: number;
  mLOverD: number;
  /** ln(mL/D + √(1 + (mL/D)²)), the full case G term. */
  logTermFull: number;
  /** ln(mL/R) = ln(2 mL/D): the large-mL/D limit of the full term, ln(L/R) when m = 1. */
  logTermSimplified: number;
}

export function hvorslevShape(geometry: WellGeometry): HvorslevShape {
  validateGeometry(geometry);
  const intakeRadiusM = intakeRadiusOf(geometry);
  const intakeLengthM = geometry.screenLengthM;
  const anisotropyFactor = Math.sqrt(geometry.anisotropyRatio ?? 1);
  const mLOverD = (anisotropyFactor * intakeLengthM) / (2 * intakeRadiusM);
  return {
    intakeRadiusM,
    intakeLengthM,
    anisotropyFactor,
    mLOverD,
    logTermFull: Math.log(mLOverD + Math.sqrt(1 + mLOverD * mLOverD)),
    logTermSimplified: Math.log(2 * mLOverD),
  };
}

/** Hvorslev (1951) case G, well point in uniform soil: Kh from the basic time lag T0. */
export function hvorslevK(geometry: WellGeometry, t0Seconds: number): HvorslevResult {
  requirePositive('t0Seconds', t0Seconds);
  const shape = hvorslevShape(geometry);
  const casing = casingRadiusForFlow(geometry);
  const rc2 = casing.radiusM * casing.radiusM;
  const denominator = 2 * shape.intakeLengthM * t0Seconds;
  const kMetersPerSecond = (rc2 * shape.logTermFull) / denominator;
  const simplifiedK = (rc2 * shape.logTermSimplified) / denominator;
  return {
    method: 'hvorslev',
    kMetersPerSecond,
    reference: REFERENCES.hvorslevFull,
    casingRadiusM: casing.radiusM,
    casingRadiusIsEffective: casing.effective,
    intakeRadiusM: shape.intakeRadiusM,
    intakeLengthM: shape.intakeLengthM,
    anisotropyFactor: shape.anisotropyFactor,
    mLOverD: shape.mLOverD,
    shapeFactorM: (2 * Math.PI * shape.intakeLengthM) / shape.logTermFull,
    simplified: {
      kMetersPerSecond: simplifiedK,
      shapeFactorM: (2 * Math.PI * shape.intakeLengthM) / shape.logTermSimplified,
      valid: shape.mLOverD > 4,
      differencePercent: ((simplifiedK - kMetersPerSecond) / kMetersPerSecond) * 100,
      reference: REFERENCES.hvorslevSimplified,
    },
  };
}

/** The basic time lag a well of this geometry shows in soil of conductivity K (inverse of hvorslevK). */
export function hvorslevT0Seconds(geometry: WellGeometry, kMetersPerSecond: number): number {
  requirePositive('kMetersPerSecond', kMetersPerSecond);
  const shape = hvorslevShape(geometry);
  const rc = casingRadiusForFlow(geometry).radiusM;
  return (rc * rc * shape.logTermFull) / (2 * shape.intakeLengthM * kMetersPerSecond);
}
