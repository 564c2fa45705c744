import { factorOf, isUnitOf, scaleSeries, type UnitOption } from './unit-option';

export type LengthUnit = 'm' | 'cm' | 'mm' | 'ft' | 'in';

export const LENGTH_UNITS: readonly UnitOption<LengthUnit>[] = [
  { id: 'm', label: 'm' },
  { id: 'cm', label: 'cm' },
  { id: 'mm', label: 'mm' },
  { id: 'ft', label: 'ft' },
  { id: 'in', label: 'in' },
];

// The international foot and inch are exact by definition (NIST SP 811, B.8).
export const METRES_PER_FOOT = 0.3048;
export const METRES_PER_INCH = 0.0254;

const METRES_PER: Readonly<Record<LengthUnit, number>> = {
  m: 1,
  cm: 0.01,
  mm: 0.001,
  ft: METRES_PER_FOOT,
  in: METRES_PER_INCH,
};

export const isLengthUnit = (value: string): value is LengthUnit => isUnitOf(LENGTH_UNITS, value);

export function lengthToSi(value: number, unit: LengthUnit): number {
  return value * factorOf(METRES_PER, unit, 'lengthUnit');
}

export function lengthFromSi(valueM: number, unit: LengthUnit): number {
  return valueM / factorOf(METRES_PER, unit, 'lengthUnit');
}

export function lengthSeriesToSi(values: ArrayLike<number>, unit: LengthUnit, out?: Float64Array): Float64Array {
  return scaleSeries(values, factorOf(METRES_PER, unit, 'lengthUnit'), out);
}
