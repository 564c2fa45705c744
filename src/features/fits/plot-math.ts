import type { TimeUnit } from '@shared/units/time';
import { superscript } from './format';

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

export interface TimeRange {
  fromSeconds: number;
  toSeconds: number;
}

export type DragMode = 'from' | 'to' | 'move' | 'new';

/** Which part of the window band a pointer at `x` (px) is on; edges win within `tolerancePx`. */
export function hitTestWindow(x: number, fromPx: number | null, toPx: number | null, tolerancePx = 8): DragMode {
  if (fromPx === null || toPx === null) return 'new';
  const left = Math.min(fromPx, toPx);
  const right = Math.max(fromPx, toPx);
  const dLeft = Math.abs(x - left);
  const dRight = Math.abs(x - right);
  if (dLeft <= tolerancePx || dRight <= tolerancePx) {
    const nearLeft = dLeft <= dRight;
    const leftIsFrom = fromPx <= toPx;
    return nearLeft === leftIsFrom ? 'from' : 'to';
  }
  if (x > left && x < right) return 'move';
  return 'new';
}

const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

/**
 * The window after dragging from `startSeconds` (where the pointer went down) to `pointerSeconds`.
 * Edges that cross swap roles, so the result is always ordered; everything stays inside `bounds`.
 */
export function dragRange(
  mode: DragMode,
  original: TimeRange | null,
  startSeconds: number,
  pointerSeconds: number,
  bounds: readonly [number, number],
): TimeRange {
  const [lo, hi] = bounds;
  const p = clamp(pointerSeconds, lo, hi);
  const ordered = (a: number, b: number): TimeRange => ({ fromSeconds: Math.min(a, b), toSeconds: Math.max(a, b) });
  if (mode === 'new' || !original) return ordered(clamp(startSeconds, lo, hi), p);
  if (mode === 'from') return ordered(p, original.toSeconds);
  if (mode === 'to') return ordered(original.fromSeconds, p);
  const width = original.toSeconds - original.fromSeconds;
  const from = clamp(original.fromSeconds + (pointerSeconds - startSeconds), lo, hi - width);
  return { fromSeconds: from, toSeconds: from + width };
}

/** A view of the time axis, zoomed by `factor` (< 1 zooms in) about `centerSeconds`, kept inside `full`. */
export function zoomView(
  view: readonly [number, number],
  factor: number,
  centerSeconds: number,
  full: readonly [number, number],
): [number, number] {
  const fullSpan = full[1] - full[0];
  const span = clamp((view[1] - view[0]) * factor, fullSpan / 1000, fullSpan);
  const c = clamp(centerSeconds, view[0], view[1]);
  const share = view[1] > view[0] ? (c - view[0]) / (view[1] - view[0]) : 0.5;
  let from = c - share * span;
  from = clamp(from, full[0], full[1] - span);
  return [from, from + span];
}

/** The view moved by `deltaSeconds` (positive: later), kept inside `full`. */
export function panView(view: readonly [number, number], deltaSeconds: number, full: readonly [number, number]): [number, number] {
  const span = view[1] - view[0];
  const from = clamp(view[0] + deltaSeconds, full[0], full[1] - span);
  return [from, from + span];
}
