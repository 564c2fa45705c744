import { CUBIC_METRES_PER_US_GALLON, SECONDS_PER_DAY } from './conductivity';
import { factorOf, isUnitOf, type UnitOption } from './unit-option';

export type RateUnit = 'm3/s' | 'L/s' | 'm3/d' | 'gpm';

export const RATE_UNITS: readonly UnitOption<RateUnit>[] = [
  { id: 'm3/s', label: 'm³/s' },
  { id: 'L/s', label: 'L/s' },
  { id: 'm3/d', label: 'm³/d' },
  { id: 'gpm', label: 'US gpm' },
];

const CUBIC_METRES_PER_SECOND_PER: Readonly<Record<RateUnit, number>> = {
  'm3/s': 1,
  'L/s': 1e-3,
  'm3/d': 1 / SECONDS_PER_DAY,
  gpm: CUBIC_METRES_PER_US_GALLON / 60,
};

export const isRateUnit = (value: string): value is RateUnit => isUnitOf(RATE_UNITS, value);

export function rateToSi(value: number, unit: RateUnit): number {
  return value * factorOf(CUBIC_METRES_PER_SECOND_PER, unit, 'rateUnit');
}

export function rateFromSi(rateCubicMetresPerSecond: number, unit: RateUnit): number {
  return rateCubicMetresPerSecond / factorOf(CUBIC_METRES_PER_SECOND_PER, unit, 'rateUnit');
}
