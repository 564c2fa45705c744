import { K_UNITS, kFromSi, type KUnit } from '@shared/units/conductivity';
import { lengthFromSi, type LengthUnit } from '@shared/units/length';
import type { DisplayUnits } from '@shared/schemas/sites';
import { superscript } from '@shared/plot/semilog';

/** `x` with `digits` significant digits: plain between 0.01 and 10 000, else "m × 10ⁿ". */
export function formatQuantity(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const abs = Math.abs(x);
  if (abs >= 0.01 && abs < 1e4) return String(Number(x.toPrecision(digits))).replace('-', '−');
  return formatScientific(x, digits);
}

/** A small percentage as a person reads it: "< 0.01 %" rather than "3.2 × 10⁻⁴ %". */
export function formatPercent(x: number): string {
  if (!Number.isFinite(x)) return '—';
  const sign = x < 0 ? '−' : '+';
  const abs = Math.abs(x);
  if (abs < 0.01) return 'less than 0.01 %';
  return `${sign}${String(Number(abs.toPrecision(2)))} %`;
}

/** Always "m × 10ⁿ", the way K in m/s is read on a log scale. */
export function formatScientific(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const [mantissa, exponent] = x.toExponential(digits - 1).split('e');
  return `${mantissa.replace('-', '−')} × 10${superscript(Number(exponent))}`;
}

export function kUnitLabel(unit: KUnit): string {
  return K_UNITS.find((u) => u.id === unit)?.label ?? unit;
}

/** K in the chosen unit, with its unit; m/s is always written in scientific form. */
export function formatK(kMetersPerSecond: number, unit: KUnit): string {
  const value = kFromSi(kMetersPerSecond, unit);
  const text = unit === 'm/s' || unit === 'cm/s' ? formatScientific(value) : formatQuantity(value);
  return `${text} ${kUnitLabel(unit)}`;
}

export function defaultKUnit(units: DisplayUnits): KUnit {
  return units === 'US' ? 'ft/d' : 'm/s';
}

/** A time in seconds, with minutes (or hours) beside it once it is long. */
export function formatDuration(seconds: number): string {
  const s = `${formatQuantity(seconds)} s`;
  if (Math.abs(seconds) >= 7200) return `${s} (${formatQuantity(seconds / 3600)} h)`;
  if (Math.abs(seconds) >= 120) return `${s} (${formatQuantity(seconds / 60)} min)`;
  return s;
}

export function formatLengthIn(valueM: number, unit: LengthUnit, digits = 3): string {
  return `${formatQuantity(lengthFromSi(valueM, unit), digits)} ${unit}`;
}

/** log10 spread of Well K as a factor: ±σ in log10 units is a factor of 10^σ either way. */
export function formatLogSpread(log10StdDev: number): string {
  return `± ${log10StdDev.toFixed(2)} log10 units (a factor of ${formatQuantity(10 ** log10StdDev, 2)})`;
}

/** The damping regime of a high-K fit in words, for the result card. */
export function describeRegime(regime: 'underdamped' | 'critically-damped' | 'overdamped'): { label: string; meaning: string } {
  switch (regime) {
    case 'underdamped':
      return { label: 'Underdamped', meaning: 'the level oscillates about static as it recovers' };
    case 'critically-damped':
      return { label: 'Critically damped', meaning: 'the level returns to static as fast as it can without crossing it' };
    default:
      return { label: 'Overdamped', meaning: 'the level returns to static without oscillating; inertia shapes the early readings' };
  }
}
