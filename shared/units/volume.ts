import { factorOf, isUnitOf, type UnitOption } from './unit-option';

export type VolumeUnit = 'L' | 'm3' | 'USgal' | 'ft3';

export const VOLUME_UNITS: readonly UnitOption<VolumeUnit>[] = [
  { id: 'L', label: 'L' },
  { id: 'm3', label: 'm³' },
  { id: 'USgal', label: 'US gal' },
  { id: 'ft3', label: 'ft³' },
];

// US liquid gallon = 231 in³ = 3.785411784 L and 1 ft³ = 0.028316846592 m³, both exact (NIST SP 811, B.8).
const CUBIC_METRES_PER: Readonly<Record<VolumeUnit, number>> = {
  L: 0.001,
  m3: 1,
  USgal: 0.003785411784,
  ft3: 0.028316846592,
};

export const isVolumeUnit = (value: string): value is VolumeUnit => isUnitOf(VOLUME_UNITS, value);

export function volumeToSi(value: number, unit: VolumeUnit): number {
  return value * factorOf(CUBIC_METRES_PER, unit, 'volumeUnit');
}

export function volumeFromSi(valueM3: number, unit: VolumeUnit): number {
  return valueM3 / factorOf(CUBIC_METRES_PER, unit, 'volumeUnit');
}
