import { displayLengthUnit, type LengthGroup } from '@shared/schemas/wells';
import type { DisplayUnits } from '@shared/schemas/sites';
import { lengthFromSi, type LengthUnit } from '@shared/units/length';

/** Decimals shown per unit: centimetre precision for lengths, tenth of a millimetre for radii. */
const DECIMALS: Record<LengthUnit, number> = { m: 2, cm: 1, mm: 1, ft: 2, in: 2 };

export function lengthUnitFor(units: DisplayUnits, group: LengthGroup): LengthUnit {
  return displayLengthUnit(units, group);
}

/** A length in metres as the site shows it, without the unit (table cells) or with it. */
export function formatLength(valueM: number | null, units: DisplayUnits, group: LengthGroup, withUnit = false): string {
  if (valueM === null) return '—';
  const unit = lengthUnitFor(units, group);
  const decimals = group === 'radius' && unit === 'm' ? 4 : DECIMALS[unit];
  const text = lengthFromSi(valueM, unit).toFixed(decimals);
  return withUnit ? `${text} ${unit}` : text;
}

export function formatNumber(value: number | null, decimals: number): string {
  return value === null ? '—' : value.toFixed(decimals);
}
