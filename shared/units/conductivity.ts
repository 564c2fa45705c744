import { METRES_PER_FOOT } from './length';
import { factorOf, isUnitOf, type UnitOption } from './unit-option';

export type KUnit = 'm/s' | 'cm/s' | 'm/d' | 'ft/d' | 'gpd/ft2';

export const K_UNITS: readonly UnitOption<KUnit>[] = [
  { id: 'm/s', label: 'm/s' },
  { id: 'cm/s', label: 'cm/s' },
  { id: 'm/d', label: 'm/d' },
  { id: 'ft/d', label: 'ft/d' },
  { id: 'gpd/ft2', label: 'gpd/ft²' },
];

export const SECONDS_PER_DAY = 86400;
// US liquid gallon = 231 in³ exactly (NIST SP 811, B.8).
export const CUBIC_METRES_PER_US_GALLON = 3.785411784e-3;

const METRES_PER_SECOND_PER: Readonly<Record<KUnit, number>> = {
  'm/s': 1,
  'cm/s': 0.01,
  'm/d': 1 / SECONDS_PER_DAY,
  'ft/d': METRES_PER_FOOT / SECONDS_PER_DAY,
  // gallons per day through one square foot: a flux, so volume / (time · area)
  'gpd/ft2': CUBIC_METRES_PER_US_GALLON / SECONDS_PER_DAY / (METRES_PER_FOOT * METRES_PER_FOOT),
};

export const isKUnit = (value: string): value is KUnit => isUnitOf(K_UNITS, value);

export function kToSi(value: number, unit: KUnit): number {
  return value * factorOf(METRES_PER_SECOND_PER, unit, 'kUnit');
}

export function kFromSi(kMetersPerSecond: number, unit: KUnit): number {
  return kMetersPerSecond / factorOf(METRES_PER_SECOND_PER, unit, 'kUnit');
}
