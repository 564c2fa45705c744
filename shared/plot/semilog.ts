import { scaleLinear, scaleLog, type ScaleContinuousNumeric } from 'd3-scale';
import type { TimeUnit } from '../units/time';

/*
 * The semi-log plot of H/H0 against time: its domains, scales and ticks. One module for the fit
 * workspace (SVG in the browser) and the fit report (vectors in the PDF), so both draw the same.
 */

/** Time units offered on the plot's axis. */
export type PlotTimeUnit = Extract<TimeUnit, 's' | 'min' | 'h'>;
export const PLOT_TIME_UNITS: readonly { id: PlotTimeUnit; label: string; seconds: number }[] = [
  { id: 's', label: 's', seconds: 1 },
  { id: 'min', label: 'min', seconds: 60 },
  { id: 'h', label: 'h', seconds: 3600 },
];

export function secondsPer(unit: PlotTimeUnit): number {
  return PLOT_TIME_UNITS.find((u) => u.id === unit)?.seconds ?? 1;
}

/** The unit that keeps the axis numbers readable: seconds up to 10 min, minutes up to 5 h. */
export function defaultTimeUnit(maxSeconds: number): PlotTimeUnit {
  if (maxSeconds <= 600) return 's';
  if (maxSeconds <= 5 * 3600) return 'min';
  return 'h';
}

/**
 * Where a plot of the recovery should end: a little after the record first falls to 1 % of H0, or
 * null when it never does. A long tail of readings at static says nothing the line needs.
 */
export function recoveryEndSeconds(elapsedSeconds: ArrayLike<number>, normalizedHead: ArrayLike<number>): number | null {
  for (let i = 0; i < elapsedSeconds.length; i++) {
    if (normalizedHead[i] <= 0.01 && elapsedSeconds[i] > 0) return elapsedSeconds[i] * 1.4;
  }
  return null;
}

/** 1/e, the normalized head that defines the basic time lag T0. */
export const ONE_OVER_E = Math.exp(-1);

/** Lowest decade drawn, so that a record close to static does not squash the plot. */
const LOWEST_DECADE = 1e-4;

/**
 * Log-axis domain for H/H0: from the decade below the smallest positive head (at most down to
 * 1e−4) to a little above 1 (or above the largest head when early readings overshoot).
 */
export function headDomain(heads: ArrayLike<number>): [number, number] {
  let min = Infinity;
  let max = 0;
  for (let i = 0; i < heads.length; i++) {
    const h = heads[i];
    if (!(h > 0)) continue;
    if (h < min) min = h;
    if (h > max) max = h;
  }
  if (!Number.isFinite(min)) return [0.01, 1.2];
  const lo = Math.max(LOWEST_DECADE, 10 ** Math.floor(Math.log10(min) + 1e-9));
  const hi = Math.min(10, Math.max(1.2, max * 1.1));
  return [Math.min(lo, 0.1), hi];
}

const SUPERSCRIPT: Record<string, string> = {
  '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹',
};

/** An integer in superscript digits (10⁻⁴). */
export function superscript(n: number): string {
  return String(n)
    .split('')
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join('');
}

export interface LogTick {
  value: number;
  label: string;
}

/** Decade labels as a geologist writes them: 1, 0.1, 0.01, 0.001, then 10⁻⁴. */
export function decadeLabel(value: number): string {
  const exponent = Math.round(Math.log10(value));
  if (exponent >= 0) return String(10 ** exponent);
  if (exponent >= -3) return `0.${'0'.repeat(-exponent - 1)}1`;
  return `10${superscript(exponent)}`;
}

/** Labelled ticks at every decade in the domain, unlabelled minor ticks at 2…9 × each decade. */
export function logTicks(lo: number, hi: number): { decades: LogTick[]; minor: number[] } {
  const decades: LogTick[] = [];
  const minor: number[] = [];
  const first = Math.floor(Math.log10(lo) + 1e-9);
  const last = Math.ceil(Math.log10(hi) - 1e-9);
  for (let e = first; e <= last; e++) {
    const decade = 10 ** e;
    if (decade >= lo * (1 - 1e-9) && decade <= hi * (1 + 1e-9)) decades.push({ value: decade, label: decadeLabel(decade) });
    for (let m = 2; m <= 9; m++) {
      const v = m * decade;
      if (v > lo && v < hi) minor.push(Number(v.toPrecision(12)));
    }
  }
  return { decades, minor };
}

/** The time axis: seconds in `view` to pixels (or points) in `range`. */
export function timeScale(view: readonly [number, number], range: readonly [number, number]): ScaleContinuousNumeric<number, number> {
  return scaleLinear().domain(view).range(range);
}

/** The head axis: H/H0 on a log scale (or linear, for an oscillating record), `range` from bottom to top. */
export function headScale(linear: boolean, domain: readonly [number, number], range: readonly [number, number]): ScaleContinuousNumeric<number, number> {
  return (linear ? scaleLinear() : scaleLog()).domain(domain).range(range);
}

/** Round ticks of the time axis in `unit`, about one per 90 px of `plotWidth`. */
export function timeTicks(view: readonly [number, number], unit: PlotTimeUnit, plotWidth: number): { seconds: number; label: string }[] {
  const per = secondsPer(unit);
  const unitScale = scaleLinear().domain([view[0] / per, view[1] / per]);
  const count = Math.max(3, Math.floor(plotWidth / 90));
  const format = unitScale.tickFormat(count);
  return unitScale.ticks(count).map((v) => ({ seconds: v * per, label: format(v) }));
}
