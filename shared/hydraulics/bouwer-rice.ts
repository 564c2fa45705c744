import { EngineInputError, requirePositive } from './errors';
import { bouwerRiceRadiusOf, casingRadiusForFlow, validateGeometry, type WellGeometry } from './geometry';
import { REFERENCES } from './references';

/**
 * Le/rw range Kfield accepts for the Van Rooy polynomials. Above about 1500 they diverge (A and C
 * turn over from x ≈ 1000–1400 and swing away beyond, derived); below 1 the screen would be shorter
 * than the borehole radius, outside the geometry the polynomials were fitted to (Kfield's limit).
 */
export const LE_OVER_RW_MIN = 1;
export const LE_OVER_RW_MAX = 1500;

/** Cap on ln((D − Lw)/rw) in the partially penetrating form (Bouwer & Rice 1976). */
export const LN_BELOW_SCREEN_CAP = 6;

export interface VanRooyCoefficients {
  a: number;
  b: number;
  c: number;
  reference: string;
}

/** A, B, C of Bouwer & Rice as polynomials in x = Le/rw (Van Rooy 1988, as given by Butler 1998). */
export function vanRooyCoefficients(leOverRw: number): VanRooyCoefficients {
  if (!Number.isFinite(leOverRw) || leOverRw < LE_OVER_RW_MIN || leOverRw > LE_OVER_RW_MAX) {
    throw new EngineInputError(
      'geometry.screenLengthM',
      `screen length over borehole radius Le/rw = ${formatRatio(leOverRw)} is outside ${LE_OVER_RW_MIN}–${LE_OVER_RW_MAX}, ` +
        'the range where the Bouwer-Rice coefficient polynomials hold; Kfield refuses rather than extrapolate',
    );
  }
  const x = leOverRw;
  const a = 1.472 + x * (3.537e-2 + x * (-8.148e-5 + x * (1.028e-7 + x * (-6.484e-11 + x * 1.573e-14))));
  const b = 0.2372 + x * (5.151e-3 + x * (-2.682e-6 + x * (-3.491e-10 + x * 4.738e-13)));
  const c = 0.792 + x * (3.993e-2 + x * (-5.743e-5 + x * (3.858e-8 + x * -9.659e-12)));
  return { a, b, c, reference: REFERENCES.vanRooy };
}

function formatRatio(x: number): string {
  return Number.isFinite(x) ? x.toPrecision(4) : String(x);
}

export interface BouwerRiceShape {
  penetration: 'partial' | 'full';
  leOverRw: number;
  lnReOverRw: number;
  /** ln((D − Lw)/rw) before the cap; null when fully penetrating. */
  lnBelowScreen: number | null;
  capApplied: boolean;
  coefficients: VanRooyCoefficients;
  boreholeRadiusM: number;
  screenLengthM: number;
  staticToScreenBottomM: number;
  saturatedThicknessM: number;
}

export function bouwerRiceShape(geometry: WellGeometry): BouwerRiceShape {
  validateGeometry(geometry);
  const rw = bouwerRiceRadiusOf(geometry);
  const le = geometry.screenLengthM;
  const lw = geometry.staticToScreenBottomM;
  const d = geometry.saturatedThicknessM;
  if (lw === undefined) {
    throw new EngineInputError('geometry.staticToScreenBottomM', 'is required for Bouwer-Rice (Lw, static water level to screen bottom)');
  }
  if (d === undefined) {
    throw new EngineInputError('geometry.saturatedThicknessM', 'is required for Bouwer-Rice (D, saturated thickness; enter Lw for a fully penetrating well)');
  }
  requirePositive('geometry.staticToScreenBottomM', lw);
  requirePositive('geometry.saturatedThicknessM', d);
  if (le > lw) {
    throw new EngineInputError(
      'geometry.screenLengthM',
      `${le} m is longer than Lw = ${lw} m (static level to screen bottom); with the static level inside the screen, enter the saturated screen length`,
    );
  }
  const fullTolerance = 1e-9 * d;
  if (lw > d + fullTolerance) {
    throw new EngineInputError('geometry.saturatedThicknessM', `${d} m is less than Lw = ${lw} m; the screen bottom cannot lie below the aquifer`);
  }
  const coefficients = vanRooyCoefficients(le / rw);
  const lnLwOverRw = Math.log(lw / rw);
  const leOverRw = le / rw;
  let bracket: number;
  let lnBelowScreen: number | null = null;
  let capApplied = false;
  const full = d - lw <= fullTolerance;
  if (full) {
    bracket = 1.1 / lnLwOverRw + coefficients.c / leOverRw;
  } else {
    lnBelowScreen = Math.log((d - lw) / rw);
    capApplied = lnBelowScreen > LN_BELOW_SCREEN_CAP;
    const capped = Math.min(lnBelowScreen, LN_BELOW_SCREEN_CAP);
    bracket = 1.1 / lnLwOverRw + (coefficients.a + coefficients.b * capped) / leOverRw;
  }
  if (!(bracket > 0) || !Number.isFinite(bracket)) {
    throw new EngineInputError(
      'geometry.saturatedThicknessM',
      `gives no positive ln(Re/rw) (D − Lw = ${(d - lw).toPrecision(3)} m, rw = ${rw} m); for an aquifer that ends at the screen bottom enter D = Lw`,
    );
  }
  return {
    penetration: full ? 'full' : 'partial',
    leOverRw,
    lnReOverRw: 1 / bracket,
    lnBelowScreen,
    capApplied,
    coefficients,
    boreholeRadiusM: rw,
    screenLengthM: le,
    staticToScreenBottomM: lw,
    saturatedThicknessM: d,
  };
}

export interface BouwerRiceResult extends BouwerRiceShape {
  method: 'bouwer-rice';
  kMetersPerSecond: number;
  reference: string;
  casingRadiusM: number;
  casingRadiusIsEffective: boolean;
}

/** Bouwer & Rice (1976): K = rc² ln(Re/rw) / (2 Le T0), T0 from the fitted line. */
export function bouwerRiceK(geometry: WellGeometry, t0Seconds: number): BouwerRiceResult {
  requirePositive('t0Seconds', t0Seconds);
  const shape = bouwerRiceShape(geometry);
  const casing = casingRadiusForFlow(geometry);
  const kMetersPerSecond = (casing.radiusM * casing.radiusM * shape.lnReOverRw) / (2 * shape.screenLengthM * t0Seconds);
  return {
    ...shape,
    method: 'bouwer-rice',
    kMetersPerSecond,
    reference: REFERENCES.bouwerRice,
    casingRadiusM: casing.radiusM,
    casingRadiusIsEffective: casing.effective,
  };
}
