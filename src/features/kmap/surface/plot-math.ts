/* The observed-versus-predicted plot of the cross-validation: both axes log10 K on one scale. */

export interface PlotFrame {
  /** log10 K at the axes' ends, whole decades. */
  from: number;
  to: number;
  size: number;
  margin: number;
}

/** Whole decades that hold every observed and predicted value (at least one decade). */
export function plotFrame(values: readonly number[], size: number, margin = 36): PlotFrame {
  const finite = values.filter(Number.isFinite);
  let from = finite.length ? Math.floor(Math.min(...finite)) : -7;
  let to = finite.length ? Math.ceil(Math.max(...finite)) : -2;
  if (to <= from) to = from + 1;
  from += 0;
  to += 0;
  return { from, to, size, margin };
}

/** Room beyond the axes' far ends, for the last tick label. */
export const FAR_PAD = 16;

/** Pixel along an axis: x grows to the right, y grows upward (SVG y is flipped here). */
export function toPixelX(f: PlotFrame, log10: number): number {
  return f.margin + ((log10 - f.from) / (f.to - f.from)) * (f.size - f.margin - FAR_PAD);
}

export function toPixelY(f: PlotFrame, log10: number): number {
  return f.size - f.margin - ((log10 - f.from) / (f.to - f.from)) * (f.size - f.margin - FAR_PAD);
}

/** Label heights (SVG y, downward) pushed apart so that no two are closer than `gap`, in the order given by y. */
export function spreadLabels(ys: readonly number[], gap = 11): number[] {
  const order = ys.map((y, i) => ({ y, i })).sort((a, b) => a.y - b.y);
  const out: number[] = Array.from({ length: ys.length }, () => 0);
  let last = -Infinity;
  for (const { y, i } of order) {
    last = Math.max(y, last + gap);
    out[i] = last;
  }
  return out;
}

export function decades(f: PlotFrame): number[] {
  const out = [];
  for (let d = f.from; d <= f.to; d++) out.push(d);
  return out;
}

/** The wells the surface predicts worst (largest |error|), worst first. */
export function worstPredicted<T extends { errorLog10: number }>(wells: readonly T[], n = 3): T[] {
  return [...wells].sort((a, b) => Math.abs(b.errorLog10) - Math.abs(a.errorLog10)).slice(0, n);
}
