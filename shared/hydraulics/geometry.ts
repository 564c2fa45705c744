import { EngineInputError, requirePositive } from './errors';
import { REFERENCES } from './references';

/**
 * A well as the K formulas see it, in metres. Symbols differ between sources, so fields are named
 * by meaning; the letters of domain usage are given beside each.
 */
export interface WellGeometry {
  /** rc: radius of the casing in which the water level moves. */
  casingRadiusM: number;
  /** Outer radius of the screen; Hvorslev's R unless `intake` is 'borehole'. */
  screenRadiusM: number;
  /** rw: radius of the borehole (filter pack); defaults to the screen radius. */
  boreholeRadiusM?: number;
  /** L (Hvorslev), Le (Bouwer-Rice): length of the intake. */
  screenLengthM: number;
  /**
   * Which radius is the intake's (Hvorslev's R, Bouwer-Rice's rw): the screen, or the borehole when
   * the pack is much more permeable. Left out: the screen for Hvorslev, the borehole for Bouwer-Rice.
   */
  intake?: 'screen' | 'borehole';
  /** Kh/Kv; Hvorslev's m is its square root. Default 1. */
  anisotropyRatio?: number;
  /** n: filter-pack porosity, given when the water level moves within the pack. */
  filterPackPorosity?: number;
  /** Lw (Bouwer-Rice): static water level to the bottom of the screen. */
  staticToScreenBottomM?: number;
  /** D (Bouwer-Rice): saturated thickness of the aquifer; equal to Lw for a fully penetrating well. */
  saturatedThicknessM?: number;
}

export function boreholeRadiusOf(geometry: WellGeometry): number {
  return geometry.boreholeRadiusM ?? geometry.screenRadiusM;
}

export function intakeRadiusOf(geometry: WellGeometry): number {
  return geometry.intake === 'borehole' ? boreholeRadiusOf(geometry) : geometry.screenRadiusM;
}

/** Bouwer-Rice's rw: the borehole's radius unless the intake is set to the screen. */
export function bouwerRiceRadiusOf(geometry: WellGeometry): number {
  return geometry.intake === 'screen' ? geometry.screenRadiusM : boreholeRadiusOf(geometry);
}

/** Checks what every method needs; method-specific fields are checked by the method. */
export function validateGeometry(geometry: WellGeometry): void {
  requirePositive('geometry.casingRadiusM', geometry.casingRadiusM);
  requirePositive('geometry.screenRadiusM', geometry.screenRadiusM);
  requirePositive('geometry.screenLengthM', geometry.screenLengthM);
  if (geometry.boreholeRadiusM !== undefined) {
    requirePositive('geometry.boreholeRadiusM', geometry.boreholeRadiusM);
    if (geometry.screenRadiusM > geometry.boreholeRadiusM) {
      throw new EngineInputError(
        'geometry.screenRadiusM',
        `${geometry.screenRadiusM} m is larger than the borehole radius ${geometry.boreholeRadiusM} m; the screen must fit in the borehole`,
      );
    }
  }
  if (geometry.intake !== undefined && geometry.intake !== 'screen' && geometry.intake !== 'borehole') {
    throw new EngineInputError('geometry.intake', `must be "screen" or "borehole" (got "${String(geometry.intake)}")`);
  }
  if (geometry.anisotropyRatio !== undefined) requirePositive('geometry.anisotropyRatio', geometry.anisotropyRatio);
  if (geometry.filterPackPorosity !== undefined) {
    const n = geometry.filterPackPorosity;
    if (!Number.isFinite(n) || n <= 0 || n >= 1) {
      throw new EngineInputError('geometry.filterPackPorosity', `must lie between 0 and 1, exclusive (got ${n})`);
    }
  }
  if (geometry.staticToScreenBottomM !== undefined) requirePositive('geometry.staticToScreenBottomM', geometry.staticToScreenBottomM);
  if (geometry.saturatedThicknessM !== undefined) requirePositive('geometry.saturatedThicknessM', geometry.saturatedThicknessM);
}

export interface EffectiveCasingRadius {
  radiusM: number;
  reference: string;
}

/** Casing radius when the level moves within the filter pack: √((1 − n) rc² + n rw²). */
export function effectiveCasingRadius(casingRadiusM: number, boreholeRadiusM: number, porosity: number): EffectiveCasingRadius {
  requirePositive('geometry.casingRadiusM', casingRadiusM);
  requirePositive('geometry.boreholeRadiusM', boreholeRadiusM);
  if (!Number.isFinite(porosity) || porosity <= 0 || porosity >= 1) {
    throw new EngineInputError('geometry.filterPackPorosity', `must lie between 0 and 1, exclusive (got ${porosity})`);
  }
  const radiusM = Math.sqrt((1 - porosity) * casingRadiusM * casingRadiusM + porosity * boreholeRadiusM * boreholeRadiusM);
  return { radiusM, reference: REFERENCES.effectiveCasing };
}

/** The casing radius the formulas use: nominal, or effective when a filter-pack porosity is given. */
export function casingRadiusForFlow(geometry: WellGeometry): { radiusM: number; effective: boolean } {
  if (geometry.filterPackPorosity === undefined) return { radiusM: geometry.casingRadiusM, effective: false };
  const e = effectiveCasingRadius(geometry.casingRadiusM, boreholeRadiusOf(geometry), geometry.filterPackPorosity);
  return { radiusM: e.radiusM, effective: true };
}
