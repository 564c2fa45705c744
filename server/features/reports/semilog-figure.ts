import { RECOMMENDED_HEAD_RANGES, type FitMethod } from '@shared/hydraulics/fitting';
import { ONE_OVER_E, PLOT_TIME_UNITS, defaultTimeUnit, headDomain, headScale, logTicks, timeScale, timeTicks } from '@shared/plot/semilog';
import { COLOURS, drawRich, richNumber, type Doc } from './pdf';

/** The workspace's plot colours (src/features/fits/components/fit-plot.tsx), so the page reads like the screen. */
const PLOT = { inWindow: '#135c56', outside: '#94a3b8', line: '#9a3412', band: '#17736b', recommended: '#f59e0b', oneOverE: '#475569', grid: '#e2e8f0', axis: '#334155' };

export interface SemilogInput {
  elapsedSeconds: ArrayLike<number>;
  normalizedHead: ArrayLike<number>;
  method: FitMethod;
  highK: boolean;
  window: { fromSeconds: number; toSeconds: number; headMax: number; headMin: number } | null;
  line: { intercept: number; slopePerSecond: number; lineCrossingSeconds: number; t0Seconds: number } | null;
}

/**
 * The semi-log plot of H/H0 against time, drawn as vectors with the workspace's scales and ticks
 * (shared/plot/semilog.ts): every reading (readings that fall on the same 0.1 pt are drawn once),
 * the fitting window shaded, the recommended head range, the fitted line, 1/e and T0.
 */
export function drawSemilog(doc: Doc, input: SemilogInput, box: { x: number; y: number; width: number; height: number }): void {
  const margin = { left: 40, right: 8, top: 6, bottom: 28 };
  const left = box.x + margin.left;
  const right = box.x + box.width - margin.right;
  const top = box.y + margin.top;
  const bottom = box.y + box.height - margin.bottom;
  const { elapsedSeconds: ts, normalizedHead: hs } = input;
  const linear = input.highK;

  let maxT = 0;
  for (let i = 0; i < ts.length; i++) if (ts[i] > maxT) maxT = ts[i];
  if (input.window && input.window.toSeconds > maxT) maxT = input.window.toSeconds;
  // The whole record from the test start: a report shows every reading.
  const view: [number, number] = [0, maxT > 0 ? maxT * 1.03 : 1];
  let domain: [number, number];
  if (linear) {
    let lo = -0.05;
    let hi = 1.05;
    for (let i = 0; i < hs.length; i++) {
      if (hs[i] < lo) lo = hs[i];
      if (hs[i] > hi) hi = hs[i];
    }
    domain = [lo - 0.02, hi + 0.02];
  } else domain = headDomain(hs);
  const x = timeScale(view, [left, right]);
  const y = headScale(linear, domain, [bottom, top]);
  const unit = defaultTimeUnit(view[1]);
  const unitLabel = PLOT_TIME_UNITS.find((u) => u.id === unit)!.label;

  doc.save();
  // grid and axes
  const yt = linear ? { decades: y.ticks(6).map((v) => ({ value: v, label: String(Number(v.toPrecision(2))) })), minor: [] as number[] } : logTicks(domain[0], domain[1]);
  doc.lineWidth(0.4).strokeColor(PLOT.grid);
  for (const m of yt.minor) doc.moveTo(left, y(m)).lineTo(right, y(m));
  doc.stroke();
  doc.lineWidth(0.6).strokeColor('#cbd5e1');
  for (const d of yt.decades) doc.moveTo(left, y(d.value)).lineTo(right, y(d.value));
  const xt = timeTicks(view, unit, right - left);
  for (const t of xt) doc.moveTo(x(t.seconds), top).lineTo(x(t.seconds), bottom);
  doc.stroke();

  doc.rect(left, top, right - left, bottom - top).clip();
  // recommended head range (straight-line fits)
  if (!linear) {
    const r = RECOMMENDED_HEAD_RANGES[input.method];
    const y0 = y(Math.min(r.upper, domain[1]));
    const y1 = y(Math.max(r.lower, domain[0]));
    doc.rect(left, y0, right - left, y1 - y0).fillOpacity(0.12).fill(PLOT.recommended).fillOpacity(1);
  }
  // the window
  if (input.window && !linear) {
    const a = x(input.window.fromSeconds);
    const b = x(input.window.toSeconds);
    doc.rect(a, top, b - a, bottom - top).fillOpacity(0.14).fill(PLOT.band).fillOpacity(1);
    doc.lineWidth(0.8).strokeColor(PLOT.band).moveTo(a, top).lineTo(a, bottom).moveTo(b, top).lineTo(b, bottom).stroke();
  }
  // the fitted line ln(H/H0) = a + b t, and 1/e with T0
  if (input.line && !linear) {
    const { intercept, slopePerSecond } = input.line;
    const hAt = (t: number) => Math.exp(intercept + slopePerSecond * t);
    let tEnd = view[1];
    if (slopePerSecond < 0) tEnd = Math.min(tEnd, (Math.log(domain[0]) - intercept) / slopePerSecond);
    doc.lineWidth(1.1).strokeColor(PLOT.line).moveTo(x(0), y(Math.min(hAt(0), domain[1]))).lineTo(x(tEnd), y(hAt(tEnd))).stroke();
    const ey = y(ONE_OVER_E);
    const cx = x(input.line.lineCrossingSeconds);
    doc.lineWidth(0.7).strokeColor(PLOT.oneOverE).dash(3, { space: 2 }).moveTo(left, ey).lineTo(right, ey).stroke();
    doc.moveTo(cx, ey).lineTo(cx, bottom).stroke().undash();
    doc.circle(cx, ey, 2.2).fill(PLOT.line);
  }
  // readings: two paths (in the window, outside), one tiny square per distinct 0.1 pt position
  const inside = (t: number, h: number) => input.window !== null && t >= input.window.fromSeconds && t <= input.window.toSeconds && h <= input.window.headMax * (1 + 1e-9) && h >= input.window.headMin * (1 - 1e-9);
  for (const wanted of [false, true]) {
    const seen = new Set<number>();
    let any = false;
    for (let i = 0; i < ts.length; i++) {
      const t = ts[i];
      const h = hs[i];
      if (t < 0 || (!linear && !(h > 0))) continue;
      if (inside(t, h) !== wanted) continue;
      const px = x(t);
      const py = y(h);
      const key = Math.round(px * 10) * 100000 + Math.round(py * 10);
      if (seen.has(key)) continue;
      seen.add(key);
      doc.rect(px - 1.3, py - 1.3, 2.6, 2.6);
      any = true;
    }
    if (any) doc.fill(wanted ? PLOT.inWindow : PLOT.outside);
  }
  doc.restore();

  // frame, tick labels, annotations
  doc.lineWidth(0.7).strokeColor(PLOT.axis).rect(left, top, right - left, bottom - top).stroke();
  doc.fillColor(PLOT.axis).fontSize(6.5);
  for (const d of yt.decades) {
    const v = d.value;
    const label = !linear && v < 1e-3 ? richNumber(v, 1) : [{ text: d.label }];
    const w = label.reduce((a, r) => a + doc.fontSize(r.sup ? 6.5 * 0.68 : 6.5).widthOfString(r.text), 0);
    drawRich(doc, label, left - 4 - w, y(v) - 3, 6.5);
  }
  for (const t of xt) doc.fontSize(6.5).text(t.label, x(t.seconds) - 15, bottom + 3, { width: 30, align: 'center', lineBreak: false });
  doc.fontSize(7).text(`Time since the test start (${unitLabel})`, left, bottom + 13, { width: right - left, align: 'center', lineBreak: false });
  doc.save().rotate(-90, { origin: [box.x + 8, (top + bottom) / 2] });
  doc.text(linear ? 'H/H0 (linear)' : 'H/H0 (log)', box.x + 8 - 40, (top + bottom) / 2 - 4, { width: 80, align: 'center', lineBreak: false });
  doc.restore();
  if (input.line && !linear) {
    const ey = y(ONE_OVER_E);
    const cx = x(input.line.lineCrossingSeconds);
    doc.fillColor(PLOT.oneOverE).fontSize(6.5).text('1/e', right - 16, ey - 8, { lineBreak: false });
    doc.fillColor(PLOT.line).text(`T0 = ${Number(input.line.t0Seconds.toPrecision(3))} s`, Math.min(cx + 3, right - 60), ey + 3, { lineBreak: false });
  }
  doc.fillColor(COLOURS.text);
}
