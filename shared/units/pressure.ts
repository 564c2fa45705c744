import { EngineInputError, requirePositive } from '../hydraulics/errors';
import { METRES_PER_FOOT, METRES_PER_INCH } from './length';
import { factorOf, isUnitOf, scaleSeries, type UnitOption } from './unit-option';

export type PressureUnit = 'Pa' | 'kPa' | 'psi' | 'mbar' | 'hPa' | 'mH2O' | 'ftH2O';

export const PRESSURE_UNITS: readonly UnitOption<PressureUnit>[] = [
  { id: 'Pa', label: 'Pa' },
  { id: 'kPa', label: 'kPa' },
  { id: 'psi', label: 'psi' },
  { id: 'mbar', label: 'mbar' },
  { id: 'hPa', label: 'hPa' },
  { id: 'mH2O', label: 'm of water' },
  { id: 'ftH2O', label: 'ft of water' },
];

/** Standard acceleration of gravity, exact by convention (NIST SP 811). */
export const STANDARD_GRAVITY = 9.80665;
export const POUND_MASS_KG = 0.45359237;
// lbf/in² from exact definitions: 6894.757293168… Pa (NIST SP 811 prints 6.894757 E+03).
export const PASCALS_PER_PSI = (POUND_MASS_KG * STANDARD_GRAVITY) / (METRES_PER_INCH * METRES_PER_INCH);

/** Density of water at 20 °C, kg/m³ (common tables); the engine always takes density as an input. */
export const WATER_DENSITY_20C = 998.2071;
export const WATER_DENSITY_NOMINAL = 1000;

const FIXED_PASCALS_PER: Readonly<Record<Exclude<PressureUnit, 'mH2O' | 'ftH2O'>, number>> = {
  Pa: 1,
  kPa: 1000,
  psi: PASCALS_PER_PSI,
  mbar: 100,
  hPa: 100,
};

export const isPressureUnit = (value: string): value is PressureUnit => isUnitOf(PRESSURE_UNITS, value);

export const isWaterColumnUnit = (unit: PressureUnit): unit is 'mH2O' | 'ftH2O' =>
  unit === 'mH2O' || unit === 'ftH2O';

/** Pascals per one `unit`; a column of water needs its density (kg/m³), so the caller must state it. */
export function pascalsPer(unit: PressureUnit, waterDensityKgM3?: number): number {
  if (isWaterColumnUnit(unit)) {
    if (waterDensityKgM3 === undefined) {
      throw new EngineInputError('waterDensityKgM3', `is required to convert ${unit} (a water column) to pascals`);
    }
    requirePositive('waterDensityKgM3', waterDensityKgM3);
    const columnM = unit === 'mH2O' ? 1 : METRES_PER_FOOT;
    return waterDensityKgM3 * STANDARD_GRAVITY * columnM;
  }
  return factorOf(FIXED_PASCALS_PER, unit, 'pressureUnit');
}

export function pressureToSi(value: number, unit: PressureUnit, waterDensityKgM3?: number): number {
  return value * pascalsPer(unit, waterDensityKgM3);
}

export function pressureFromSi(valuePa: number, unit: PressureUnit, waterDensityKgM3?: number): number {
  return valuePa / pascalsPer(unit, waterDensityKgM3);
}

export function pressureSeriesToSi(
  values: ArrayLike<number>,
  unit: PressureUnit,
  waterDensityKgM3?: number,
  out?: Float64Array,
): Float64Array {
  return scaleSeries(values, pascalsPer(unit, waterDensityKgM3), out);
}

/** Height of a water column exerting `pressurePa`: h = P / (ρ g). */
export function waterHeadM(pressurePa: number, waterDensityKgM3: number): number {
  requirePositive('waterDensityKgM3', waterDensityKgM3);
  return pressurePa / (waterDensityKgM3 * STANDARD_GRAVITY);
}

/**
 * Head of water above a sensor from a gauge (vented or barometrically compensated) pressure
 * typed in `unit`: h = P / (ρ g), with the record's water density. 1 psi at 1000 kg/m³ → 0.70307 m.
 */
export function pressureToWaterHeadM(value: number, unit: PressureUnit, waterDensityKgM3: number): number {
  return waterHeadM(value * pascalsPer(unit, waterDensityKgM3), waterDensityKgM3);
}
