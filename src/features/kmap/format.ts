import { kFromSi, type KUnit } from '@shared/units/conductivity';
import { displayLengthUnit, type LengthGroup } from '@shared/schemas/wells';
import type { DisplayUnits } from '@shared/schemas/sites';
import { lengthFromSi } from '@shared/units/length';

/** The K units the map's legend can be written in. */
export const MAP_K_UNITS: readonly { id: KUnit; label: string }[] = [
  { id: 'm/s', label: 'm/s' },
  { id: 'cm/s', label: 'cm/s' },
  { id: 'm/d', label: 'm/d' },
  { id: 'ft/d', label: 'ft/d' },
];

export const isMapKUnit = (value: string): value is KUnit => MAP_K_UNITS.some((u) => u.id === value);

/** m/s for SI sites, ft/d for US customary ones. */
export function defaultMapKUnit(units: DisplayUnits): KUnit {
  return units === 'US' ? 'ft/d' : 'm/s';
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** "10⁻⁵" for a decade tick. */
export function decadeLabel(decade: number): string {
  return `10${String(decade)
    .split('')
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join('')}`;
}

/** A decade as plain text for the exported legend and screen readers: "1e-5". */
export function decadeText(decade: number): string {
  return `1e${decade}`;
}

/** K in the chosen unit with three significant digits, "m × 10ⁿ" outside 0.01 … 10 000. */
export function formatK(kMetersPerSecond: number, unit: KUnit): string {
  const v = kFromSi(kMetersPerSecond, unit);
  const abs = Math.abs(v);
  if (abs >= 0.01 && abs < 1e4) return `${Number(v.toPrecision(3))} ${unit}`;
  const [mantissa, exponent] = v.toExponential(2).split('e');
  return `${mantissa} × ${decadeLabel(Number(exponent))} ${unit}`;
}

/** The spread of Well K as a factor: ×/÷ 10^σ of log10 K. */
export function formatSpread(log10StdDev: number): string {
  return `×/÷ ${Number((10 ** log10StdDev).toPrecision(3))}`;
}

/** A length in metres in the site's display unit, with the unit. */
export function formatLength(valueM: number, units: DisplayUnits, group: LengthGroup): string {
  const unit = displayLengthUnit(units, group);
  const decimals = unit === 'm' && group === 'radius' ? 3 : unit === 'in' ? 1 : 2;
  return `${lengthFromSi(valueM, unit).toFixed(decimals)} ${unit}`;
}
