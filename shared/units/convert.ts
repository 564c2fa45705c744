import { K_UNITS, kFromSi, kToSi, type KUnit } from './conductivity';
import { LENGTH_UNITS, lengthFromSi, lengthToSi, type LengthUnit } from './length';
import { PRESSURE_UNITS, pressureFromSi, pressureToSi, type PressureUnit } from './pressure';
import { RATE_UNITS, rateFromSi, rateToSi, type RateUnit } from './rate';
import { TIME_UNITS, timeFromSi, timeToSi, type TimeUnit } from './time';
import type { UnitOption } from './unit-option';

/** One entry point for forms that let the user pick a quantity's unit. */
export interface UnitsByQuantity {
  length: LengthUnit;
  time: TimeUnit;
  pressure: PressureUnit;
  k: KUnit;
  rate: RateUnit;
}

export type Quantity = keyof UnitsByQuantity;

export const UNIT_OPTIONS: { readonly [Q in Quantity]: readonly UnitOption<UnitsByQuantity[Q]>[] } = {
  length: LENGTH_UNITS,
  time: TIME_UNITS,
  pressure: PRESSURE_UNITS,
  k: K_UNITS,
  rate: RATE_UNITS,
};

/** The SI unit each quantity is held in. */
export const SI_UNIT: { readonly [Q in Quantity]: UnitsByQuantity[Q] } = { length: 'm', time: 's', pressure: 'Pa', k: 'm/s', rate: 'm3/s' };

/** `waterDensityKgM3` is needed only for pressures written as a water column. */
export function toSi<Q extends Quantity>(quantity: Q, value: number, unit: UnitsByQuantity[Q], waterDensityKgM3?: number): number {
  switch (quantity) {
    case 'length':
      return lengthToSi(value, unit as LengthUnit);
    case 'time':
      return timeToSi(value, unit as TimeUnit);
    case 'pressure':
      return pressureToSi(value, unit as PressureUnit, waterDensityKgM3);
    case 'k':
      return kToSi(value, unit as KUnit);
    default:
      return rateToSi(value, unit as RateUnit);
  }
}

export function fromSi<Q extends Quantity>(quantity: Q, valueSi: number, unit: UnitsByQuantity[Q], waterDensityKgM3?: number): number {
  switch (quantity) {
    case 'length':
      return lengthFromSi(valueSi, unit as LengthUnit);
    case 'time':
      return timeFromSi(valueSi, unit as TimeUnit);
    case 'pressure':
      return pressureFromSi(valueSi, unit as PressureUnit, waterDensityKgM3);
    case 'k':
      return kFromSi(valueSi, unit as KUnit);
    default:
      return rateFromSi(valueSi, unit as RateUnit);
  }
}
