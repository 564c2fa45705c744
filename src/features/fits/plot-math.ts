// The semi-log plot's domains, scales and ticks are shared with the fit report (shared/plot/semilog.ts).
export {
  ONE_OVER_E,
  PLOT_TIME_UNITS,
  decadeLabel,
  defaultTimeUnit,
  headDomain,
  logTicks,
  recoveryEndSeconds,
  secondsPer,
  type LogTick,
  type PlotTimeUnit,
} from '@shared/plot/semilog';

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
