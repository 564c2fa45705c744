import { useCallback, useEffect, useId, useMemo, useRef, useState, type KeyboardEvent, type PointerEvent as ReactPointerEvent } from 'react';
import { scaleLinear } from 'd3-scale';
import { headScale, timeScale, timeTicks } from '@shared/plot/semilog';
import { RECOMMENDED_HEAD_RANGES, type FitMethod } from '@shared/hydraulics/fitting';
import { Button } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { formatQuantity } from '../format';
import {
  ONE_OVER_E,
  PLOT_TIME_UNITS,
  dragRange,
  headDomain,
  hitTestWindow,
  logTicks,
  panView,
  recoveryEndSeconds,
  secondsPer,
  zoomView,
  type DragMode,
  type PlotTimeUnit,
  type TimeRange,
} from '../plot-math';
import type { Residuals } from '../preview';
import { useElementWidth } from './use-element-width';

/** Kfield's own plot colours (slate neutrals and the app's teal; the line in a dark rust). */
export const PLOT_COLOURS = {
  inWindow: '#135c56',
  outside: '#94a3b8',
  line: '#9a3412',
  model: '#9a3412',
  band: '#17736b',
  recommended: '#f59e0b',
  oneOverE: '#475569',
  grid: '#e2e8f0',
  axis: '#334155',
} as const;

export interface FitLineView {
  intercept: number;
  slopePerSecond: number;
  /** Where the line reaches 1/e. */
  lineCrossingSeconds: number;
  /** Where the record reaches 1/e; null when it never does. */
  recordCrossingSeconds: number | null;
  anchored: boolean;
}

interface Props {
  elapsedSeconds: readonly number[];
  normalizedHead: readonly number[];
  /**
   * Every reading from the test start, H/H0 ≤ 0 included, for the linear view (where an
   * oscillation shows as what it is). Omitted: the linear view draws the log series.
   */
  linearSeries?: { elapsedSeconds: ArrayLike<number>; normalizedHead: ArrayLike<number> };
  method: FitMethod;
  /** The fitting window on the time axis; null while none can be shown. */
  window: TimeRange | null;
  /** Omitted: the plot is read-only. */
  onWindowChange?: (range: TimeRange) => void;
  inWindow: (t: number, h: number) => boolean;
  line: FitLineView | null;
  residuals: Residuals | null;
  timeUnit: PlotTimeUnit;
  onTimeUnitChange: (unit: PlotTimeUnit) => void;
  /** Names the plot for screen readers. */
  label: string;
  /**
   * The fitted high-K model, sampled: the plot is then H/H0 on a linear axis with the record, the
   * curve and the static line; no window, recommended range or 1/e (the model uses every reading).
   */
  model?: { timeSeconds: readonly number[]; normalizedHead: readonly number[] } | null;
}

const MARGIN = { left: 60, right: 14, top: 12 };
/** A white outline behind annotation text, so it reads over the grid, the band and the points. */
const HALO = { stroke: 'white', strokeWidth: 3, paintOrder: 'stroke', strokeLinejoin: 'round' } as const;
const MAIN_HEIGHT = 330;
const X_AXIS_HEIGHT = 34;
const STRIP_HEIGHT = 84;
const STRIP_GAP = 10;
const BOTTOM = 40;
const TOTAL_HEIGHT = MARGIN.top + MAIN_HEIGHT + X_AXIS_HEIGHT + STRIP_HEIGHT + STRIP_GAP + BOTTOM;

interface Drag {
  kind: 'window' | 'pan';
  mode: DragMode;
  pointerId: number;
  startX: number;
  startSeconds: number;
  original: TimeRange | null;
  startView: [number, number];
  moved: boolean;
}

/** The semi-log plot of H/H0 against time with the fitting window, the line, 1/e and a residual strip. */
export function FitPlot({
  elapsedSeconds,
  normalizedHead,
  linearSeries,
  method,
  window,
  onWindowChange,
  inWindow,
  line,
  residuals,
  timeUnit,
  onTimeUnitChange,
  label,
  model = null,
}: Props) {
  const [containerRef, measured] = useElementWidth<HTMLDivElement>();
  const width = Math.max(300, measured || 720);
  const plotWidth = width - MARGIN.left - MARGIN.right;
  const clipId = `fit-plot-${useId().replace(/[^a-zA-Z0-9_-]/g, '')}`;
  const svgRef = useRef<SVGSVGElement | null>(null);

  const fullDomain = useMemo<[number, number]>(() => {
    let max = 0;
    for (const t of elapsedSeconds) if (t > max) max = t;
    const n = linearSeries?.elapsedSeconds.length ?? 0;
    if (n > 0 && linearSeries!.elapsedSeconds[n - 1] > max) max = linearSeries!.elapsedSeconds[n - 1];
    if (window && window.toSeconds > max) max = window.toSeconds;
    return [0, max > 0 ? max * 1.03 : 1];
  }, [elapsedSeconds, linearSeries, window]);
  // Open on the recovery itself (and past the window), not a long tail at static; chosen once.
  const [initialView] = useState<[number, number]>(() => {
    let end = recoveryEndSeconds(elapsedSeconds, normalizedHead) ?? fullDomain[1];
    if (window) end = Math.max(end, window.toSeconds * 1.15);
    return end < fullDomain[1] * 0.7 ? [0, end] : fullDomain;
  });
  const [zoom, setZoom] = useState<[number, number] | null>(null);
  // A high-K fit opens on the oscillation: until the model stays within 2 % of static.
  const modelView = useMemo<[number, number] | null>(() => {
    if (!model) return null;
    let end = 0;
    for (let i = 0; i < model.timeSeconds.length; i++) if (Math.abs(model.normalizedHead[i]) > 0.02) end = model.timeSeconds[i];
    end *= 1.1;
    return end > 0 && end < fullDomain[1] * 0.85 ? [0, end] : fullDomain;
  }, [model, fullDomain]);
  const openingView = modelView ?? initialView;
  const view: [number, number] = zoom ?? openingView;

  const [yMode, setYMode] = useState<'log' | 'linear'>('log');
  const highK = model !== null;
  const linear = highK || yMode === 'linear';
  // What the readings layer draws: the log series, or every reading (thinned to ~3000) on a linear axis.
  const drawn = useMemo(() => {
    if (!linear || !linearSeries) return { t: elapsedSeconds, h: normalizedHead };
    const n = linearSeries.elapsedSeconds.length;
    const stride = Math.max(1, Math.ceil(n / 3000));
    const t: number[] = [];
    const h: number[] = [];
    for (let i = 0; i < n; i += stride) {
      if (linearSeries.elapsedSeconds[i] < 0) continue;
      t.push(linearSeries.elapsedSeconds[i]);
      h.push(linearSeries.normalizedHead[i]);
    }
    return { t, h };
  }, [linear, linearSeries, elapsedSeconds, normalizedHead]);
  const [yLo, yHi] = useMemo<[number, number]>(() => {
    if (!linear) return headDomain(normalizedHead);
    let lo = -0.05;
    let hi = 1.05;
    for (const v of drawn.h) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    for (const v of model?.normalizedHead ?? []) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    return [lo - 0.02, hi + 0.02];
  }, [linear, normalizedHead, drawn, model]);
  const per = secondsPer(timeUnit);
  const x = useMemo(() => timeScale(view, [MARGIN.left, MARGIN.left + plotWidth]), [view, plotWidth]);
  const y = useMemo<(v: number) => number>(() => headScale(linear, [yLo, yHi], [MARGIN.top + MAIN_HEIGHT, MARGIN.top]), [linear, yLo, yHi]);
  const stripTop = MARGIN.top + MAIN_HEIGHT + X_AXIS_HEIGHT + STRIP_GAP;
  const residualMax = useMemo(() => {
    let m = 0;
    for (const r of residuals?.residual ?? []) m = Math.max(m, Math.abs(r));
    return Math.max(0.01, m * 1.15);
  }, [residuals]);
  const yr = useMemo(() => scaleLinear().domain([-residualMax, residualMax]).range([stripTop + STRIP_HEIGHT, stripTop]), [residualMax, stripTop]);

  const xTicks = useMemo(() => timeTicks(view, timeUnit, plotWidth), [view, timeUnit, plotWidth]);
  const yTicks = useMemo(() => {
    if (!linear) return logTicks(yLo, yHi);
    const ticks = scaleLinear().domain([yLo, yHi]).ticks(6);
    return { decades: ticks.map((v) => ({ value: v, label: formatQuantity(v, 2) })), minor: [] as number[] };
  }, [linear, yLo, yHi]);

  const secondsAt = useCallback(
    (clientX: number) => {
      const rect = svgRef.current?.getBoundingClientRect();
      const left = rect ? rect.left : 0;
      const scaleX = rect && rect.width > 0 ? width / rect.width : 1;
      return x.invert((clientX - left) * scaleX);
    },
    [x, width],
  );

  // Wheel zoom needs a non-passive listener to keep the page from scrolling under the plot.
  const viewRef = useRef(view);
  viewRef.current = view;
  useEffect(() => {
    const svg = svgRef.current;
    if (!svg) return;
    const onWheel = (event: WheelEvent) => {
      if (event.deltaY === 0) return;
      event.preventDefault();
      const center = secondsAt(event.clientX);
      setZoom(zoomView(viewRef.current, event.deltaY < 0 ? 0.8 : 1.25, center, fullDomain));
    };
    svg.addEventListener('wheel', onWheel, { passive: false });
    return () => svg.removeEventListener('wheel', onWheel);
  }, [secondsAt, fullDomain]);

  const drag = useRef<Drag | null>(null);
  const [cursor, setCursor] = useState<string>(onWindowChange ? 'crosshair' : 'default');
  const windowPx = window ? { from: x(window.fromSeconds), to: x(window.toSeconds) } : null;

  const onPointerDown = (event: ReactPointerEvent<SVGRectElement>) => {
    if (event.button !== 0) return;
    const seconds = secondsAt(event.clientX);
    const localX = x(seconds);
    const pan = event.shiftKey || event.altKey || event.ctrlKey || event.metaKey || !onWindowChange;
    const mode: DragMode = pan ? 'move' : hitTestWindow(localX, windowPx?.from ?? null, windowPx?.to ?? null);
    drag.current = {
      kind: pan ? 'pan' : 'window',
      mode,
      pointerId: event.pointerId,
      startX: event.clientX,
      startSeconds: seconds,
      original: window,
      startView: view,
      moved: false,
    };
    event.currentTarget.setPointerCapture?.(event.pointerId);
    event.preventDefault();
  };

  const onPointerMove = (event: ReactPointerEvent<SVGRectElement>) => {
    const d = drag.current;
    if (!d) {
      if (!onWindowChange) return;
      const m = hitTestWindow(x(secondsAt(event.clientX)), windowPx?.from ?? null, windowPx?.to ?? null);
      setCursor(event.shiftKey ? 'grab' : m === 'from' || m === 'to' ? 'ew-resize' : m === 'move' ? 'grab' : 'crosshair');
      return;
    }
    if (event.pointerId !== d.pointerId) return;
    if (Math.abs(event.clientX - d.startX) >= 3) d.moved = true;
    if (!d.moved) return;
    if (d.kind === 'pan') {
      const rect = svgRef.current?.getBoundingClientRect();
      const pxToSvg = rect && rect.width > 0 ? width / rect.width : 1;
      const secondsPerPx = (d.startView[1] - d.startView[0]) / plotWidth;
      setZoom(panView(d.startView, -(event.clientX - d.startX) * pxToSvg * secondsPerPx, fullDomain));
      return;
    }
    const pointer = secondsAt(event.clientX);
    onWindowChange?.(dragRange(d.mode, d.original, d.startSeconds, pointer, [0, fullDomain[1]]));
  };

  const endDrag = (event: ReactPointerEvent<SVGRectElement>) => {
    const d = drag.current;
    if (!d || event.pointerId !== d.pointerId) return;
    drag.current = null;
    event.currentTarget.releasePointerCapture?.(event.pointerId);
  };

  const nudge = (edge: 'from' | 'to') => (event: KeyboardEvent<SVGRectElement>) => {
    if (!window || !onWindowChange) return;
    const step = ((view[1] - view[0]) / 100) * (event.shiftKey ? 10 : 1);
    const delta = event.key === 'ArrowLeft' || event.key === 'ArrowDown' ? -step : event.key === 'ArrowRight' || event.key === 'ArrowUp' ? step : 0;
    if (delta === 0) return;
    event.preventDefault();
    const current = edge === 'from' ? window.fromSeconds : window.toSeconds;
    onWindowChange(dragRange(edge, window, current, current + delta, [0, fullDomain[1]]));
  };

  const recommended = RECOMMENDED_HEAD_RANGES[method];
  // The fitted line: straight on the log axis (two points), the curve exp(a + b t) on the linear one.
  const linePath = useMemo(() => {
    if (!line || !(line.slopePerSecond < 0)) return null;
    const h = (t: number) => Math.exp(line.intercept + line.slopePerSecond * t);
    const t0 = Math.max(0, view[0]);
    const tBottom = linear ? view[1] : (Math.log(yLo) - line.intercept) / line.slopePerSecond;
    const t1 = Math.min(view[1], tBottom);
    if (!(t1 > t0)) return null;
    const steps = linear ? 80 : 1;
    let d = '';
    for (let k = 0; k <= steps; k++) {
      const t = t0 + ((t1 - t0) * k) / steps;
      d += `${k === 0 ? 'M' : 'L'}${x(t).toFixed(1)},${y(Math.min(yHi, Math.max(yLo, h(t)))).toFixed(1)}`;
    }
    return d;
  }, [line, view, x, y, yLo, yHi, linear]);

  const points = useMemo(() => {
    const inside: string[] = [];
    const outside: string[] = [];
    for (let i = 0; i < drawn.t.length; i++) {
      const t = drawn.t[i];
      const h = drawn.h[i];
      if (t < view[0] || t > view[1] || !(h >= yLo) || h > yHi) continue;
      const d = `M${x(t).toFixed(1)},${y(h).toFixed(1)}h0`;
      (highK || (h > 0 && inWindow(t, h)) ? inside : outside).push(d);
    }
    return { inside: inside.join(''), outside: outside.join('') };
  }, [drawn, view, x, y, yLo, yHi, inWindow, highK]);

  const modelPath = useMemo(() => {
    if (!model) return null;
    let d = '';
    for (let i = 0; i < model.timeSeconds.length; i++) {
      const t = model.timeSeconds[i];
      if (t < view[0] - (view[1] - view[0]) * 0.01 || t > view[1] + (view[1] - view[0]) * 0.01) continue;
      d += `${d === '' ? 'M' : 'L'}${x(t).toFixed(1)},${y(model.normalizedHead[i]).toFixed(1)}`;
    }
    return d || null;
  }, [model, view, x, y]);

  const residualPath = useMemo(() => {
    if (!residuals) return '';
    const parts: string[] = [];
    for (let i = 0; i < residuals.elapsedSeconds.length; i++) {
      const t = residuals.elapsedSeconds[i];
      if (t < view[0] || t > view[1]) continue;
      parts.push(`M${x(t).toFixed(1)},${yr(residuals.residual[i]).toFixed(1)}h0`);
    }
    return parts.join('');
  }, [residuals, view, x, yr]);

  const zoomBy = (factor: number) => setZoom(zoomView(view, factor, (view[0] + view[1]) / 2, fullDomain));
  const panBy = (share: number) => setZoom(panView(view, (view[1] - view[0]) * share, fullDomain));
  const whole = view[0] <= fullDomain[0] && view[1] >= fullDomain[1];
  const atInitial = view[0] === openingView[0] && view[1] === openingView[1];
  const unitLabel = PLOT_TIME_UNITS.find((u) => u.id === timeUnit)?.label ?? timeUnit;
  const fmtT = (seconds: number) => `${formatQuantity(seconds / per)} ${unitLabel}`;
  const oneOverEY = y(ONE_OVER_E);

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-2">
        <span className="text-xs text-slate-500" aria-hidden="true">
          Time
        </span>
        <div role="radiogroup" aria-label="Time unit" className="inline-flex rounded-md shadow-sm ring-1 ring-slate-300 ring-inset">
          {PLOT_TIME_UNITS.map((u) => (
            <button
              key={u.id}
              type="button"
              role="radio"
              aria-checked={timeUnit === u.id}
              onClick={() => onTimeUnitChange(u.id)}
              className={cn(
                'h-8 px-3 text-sm first:rounded-l-md last:rounded-r-md',
                timeUnit === u.id ? 'bg-accent-700 font-medium text-white' : 'bg-white text-slate-700 hover:bg-slate-50',
              )}
            >
              {u.label}
            </button>
          ))}
        </div>
        <span className="ml-1 text-xs text-slate-500" aria-hidden={!highK}>
          H/H0{highK ? ' linear: the high-K model is fitted to H/H0 itself' : ''}
        </span>
        <div hidden={highK} role="radiogroup" aria-label="H/H0 axis" className="inline-flex rounded-md shadow-sm ring-1 ring-slate-300 ring-inset">
          {(['log', 'linear'] as const).map((m) => (
            <button
              key={m}
              type="button"
              role="radio"
              aria-checked={yMode === m}
              onClick={() => setYMode(m)}
              className={cn(
                'h-8 px-3 text-sm first:rounded-l-md last:rounded-r-md',
                yMode === m ? 'bg-accent-700 font-medium text-white' : 'bg-white text-slate-700 hover:bg-slate-50',
              )}
            >
              {m === 'log' ? 'Log' : 'Linear'}
            </button>
          ))}
        </div>
        <div className="flex flex-wrap items-center gap-1">
          <Button variant="secondary" size="sm" onClick={() => zoomBy(0.5)}>
            Zoom in
          </Button>
          <Button variant="secondary" size="sm" onClick={() => zoomBy(2)} disabled={whole}>
            Zoom out
          </Button>
          <Button variant="secondary" size="sm" onClick={() => panBy(-0.25)} disabled={view[0] <= fullDomain[0]} aria-label="Pan to earlier times">
            ←
          </Button>
          <Button variant="secondary" size="sm" onClick={() => panBy(0.25)} disabled={view[1] >= fullDomain[1]} aria-label="Pan to later times">
            →
          </Button>
          <Button variant="ghost" size="sm" onClick={() => setZoom(null)} disabled={atInitial}>
            Reset
          </Button>
          <Button variant="ghost" size="sm" onClick={() => setZoom(fullDomain)} disabled={whole}>
            Whole record
          </Button>
        </div>
      </div>
      <div ref={containerRef} className="w-full min-w-0">
        <svg
          ref={svgRef}
          width="100%"
          viewBox={`0 0 ${width} ${TOTAL_HEIGHT}`}
          role="img"
          aria-label={label}
          className="block h-auto w-full touch-pan-y select-none"
          data-view-from-seconds={view[0]}
          data-view-to-seconds={view[1]}
          data-plot-left={MARGIN.left}
          data-plot-width={plotWidth}
          data-svg-width={width}
        >
          <defs>
            <clipPath id={clipId}>
              <rect x={MARGIN.left} y={MARGIN.top} width={plotWidth} height={MAIN_HEIGHT} />
            </clipPath>
            <clipPath id={`${clipId}-strip`}>
              <rect x={MARGIN.left} y={stripTop} width={plotWidth} height={STRIP_HEIGHT} />
            </clipPath>
          </defs>

          {/* Grid and the H/H0 axis: on the log axis decades labelled, minor ticks 2…9. */}
          <rect x={MARGIN.left} y={MARGIN.top} width={plotWidth} height={MAIN_HEIGHT} fill="white" stroke={PLOT_COLOURS.grid} />
          {yTicks.minor.map((v) => (
            <line key={`m${v}`} x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={y(v)} y2={y(v)} stroke={PLOT_COLOURS.grid} strokeWidth={0.5} />
          ))}
          {yTicks.decades.map((d) => (
            <g key={`d${d.value}`}>
              <line x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={y(d.value)} y2={y(d.value)} stroke="#cbd5e1" />
              <text x={MARGIN.left - 8} y={y(d.value)} dy="0.32em" textAnchor="end" fontSize={12} fill={PLOT_COLOURS.axis}>
                {d.label}
              </text>
            </g>
          ))}
          {yTicks.minor.map((v) => (
            <line key={`mt${v}`} x1={MARGIN.left - 4} x2={MARGIN.left} y1={y(v)} y2={y(v)} stroke={PLOT_COLOURS.axis} strokeWidth={0.75} />
          ))}
          {xTicks.map((t) => (
            <g key={`x${t.seconds}`}>
              <line x1={x(t.seconds)} x2={x(t.seconds)} y1={MARGIN.top} y2={MARGIN.top + MAIN_HEIGHT} stroke={PLOT_COLOURS.grid} />
              <line x1={x(t.seconds)} x2={x(t.seconds)} y1={stripTop} y2={stripTop + STRIP_HEIGHT} stroke={PLOT_COLOURS.grid} />
              <text x={x(t.seconds)} y={MARGIN.top + MAIN_HEIGHT + 16} textAnchor="middle" fontSize={12} fill={PLOT_COLOURS.axis}>
                {t.label}
              </text>
            </g>
          ))}
          <text
            transform={`translate(14 ${MARGIN.top + MAIN_HEIGHT / 2}) rotate(-90)`}
            textAnchor="middle"
            fontSize={12}
            fill={PLOT_COLOURS.axis}
          >
            Normalized head H/H0 ({linear ? 'linear' : 'log'})
          </text>

          <g clipPath={`url(#${clipId})`}>
            {/* The method's recommended head range (straight-line fits only). */}
            {highK ? null : (<>
            <rect
              x={MARGIN.left}
              width={plotWidth}
              y={y(Math.min(recommended.upper, yHi))}
              height={Math.max(0, y(Math.max(recommended.lower, yLo)) - y(Math.min(recommended.upper, yHi)))}
              fill={PLOT_COLOURS.recommended}
              fillOpacity={0.14}
              data-testid="recommended-range"
            />
            <text x={MARGIN.left + 6} y={y(Math.max(recommended.lower, yLo)) + 13} fontSize={11} fill="#92400e" {...HALO}>
              recommended H/H0 {recommended.upper.toFixed(2)}–{recommended.lower.toFixed(2)}
            </text>
            </>)}

            {window ? (
              <rect
                x={Math.min(x(window.fromSeconds), x(window.toSeconds))}
                width={Math.max(1, Math.abs(x(window.toSeconds) - x(window.fromSeconds)))}
                y={MARGIN.top}
                height={MAIN_HEIGHT}
                fill={PLOT_COLOURS.band}
                fillOpacity={0.1}
                stroke={PLOT_COLOURS.band}
                strokeOpacity={0.6}
                strokeDasharray="4 3"
                data-testid="fit-window-band"
              />
            ) : null}

            {/* 1/e line. */}
            {highK ? null : (
              <>
                <line x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={oneOverEY} y2={oneOverEY} stroke={PLOT_COLOURS.oneOverE} strokeDasharray="6 4" />
                <text x={MARGIN.left + plotWidth - 6} y={oneOverEY - 5} textAnchor="end" fontSize={11} fill={PLOT_COLOURS.oneOverE} {...HALO}>
                  1/e = 0.37
                </text>
              </>
            )}

            <path d={points.outside} stroke={PLOT_COLOURS.outside} strokeWidth={4} strokeLinecap="round" data-testid="readings-outside" />
            <path d={points.inside} stroke={PLOT_COLOURS.inWindow} strokeWidth={5} strokeLinecap="round" data-testid="readings-in-window" />

            {linePath ? <path d={linePath} fill="none" stroke={PLOT_COLOURS.line} strokeWidth={2} data-testid="fitted-line" /> : null}
            {modelPath ? <path d={modelPath} fill="none" stroke={PLOT_COLOURS.model} strokeWidth={2} data-testid="fitted-model-curve" /> : null}
            {linear ? (
              <g>
                <line x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={y(0)} y2={y(0)} stroke={PLOT_COLOURS.axis} strokeWidth={1} />
                {/* With the high-K curve the legend names the line: a label here would sit on the oscillation. */}
                {highK ? null : (
                  <text x={MARGIN.left + plotWidth - 6} y={y(0) + 14} textAnchor="end" fontSize={11} fill={PLOT_COLOURS.axis} {...HALO}>
                    static level (H/H0 = 0)
                  </text>
                )}
              </g>
            ) : null}

            {line && line.lineCrossingSeconds >= view[0] && line.lineCrossingSeconds <= view[1] ? (
              <g data-testid="t0-marker">
                <line
                  x1={x(line.lineCrossingSeconds)}
                  x2={x(line.lineCrossingSeconds)}
                  y1={oneOverEY}
                  y2={MARGIN.top + MAIN_HEIGHT}
                  stroke={PLOT_COLOURS.line}
                  strokeDasharray="3 3"
                />
                <circle cx={x(line.lineCrossingSeconds)} cy={oneOverEY} r={5} fill="white" stroke={PLOT_COLOURS.line} strokeWidth={2} />
                <text
                  x={x(line.lineCrossingSeconds) + 7}
                  y={oneOverEY + 16}
                  fontSize={12}
                  fontWeight={600}
                  fill={PLOT_COLOURS.line}
                  {...HALO}
                  textAnchor={x(line.lineCrossingSeconds) > MARGIN.left + plotWidth - 150 ? 'end' : 'start'}
                  dx={x(line.lineCrossingSeconds) > MARGIN.left + plotWidth - 150 ? -14 : 0}
                >
                  {line.anchored ? 'T0' : 'line at 1/e'} = {fmtT(line.lineCrossingSeconds)}
                </text>
              </g>
            ) : null}
            {line && line.recordCrossingSeconds !== null && line.recordCrossingSeconds >= view[0] && line.recordCrossingSeconds <= view[1] ? (
              <g data-testid="record-crossing">
                <path
                  d={`M${x(line.recordCrossingSeconds)},${oneOverEY - 6}l6,6l-6,6l-6,-6z`}
                  fill="white"
                  stroke={PLOT_COLOURS.inWindow}
                  strokeWidth={1.5}
                />
                <text
                  x={x(line.recordCrossingSeconds) + 8}
                  y={oneOverEY - 8}
                  fontSize={11}
                  fill={PLOT_COLOURS.inWindow}
                  {...HALO}
                  textAnchor={x(line.recordCrossingSeconds) > MARGIN.left + plotWidth - 170 ? 'end' : 'start'}
                  dx={x(line.recordCrossingSeconds) > MARGIN.left + plotWidth - 170 ? -16 : 0}
                >
                  record at 1/e = {fmtT(line.recordCrossingSeconds)}
                </text>
              </g>
            ) : null}
          </g>

          {/* Residual strip: ln(H/H0) minus the line, for the window's readings. */}
          <rect x={MARGIN.left} y={stripTop} width={plotWidth} height={STRIP_HEIGHT} fill="white" stroke={PLOT_COLOURS.grid} />
          <line x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={yr(0)} y2={yr(0)} stroke={PLOT_COLOURS.line} strokeWidth={1} />
          {yr.ticks(2).map((v) => (
            <text key={v} x={MARGIN.left - 8} y={yr(v)} dy="0.32em" textAnchor="end" fontSize={11} fill={PLOT_COLOURS.axis}>
              {v > 0 ? '+' : v < 0 ? '−' : ''}
              {Number(Math.abs(v).toPrecision(2))}
            </text>
          ))}
          <text x={MARGIN.left + 6} y={stripTop + 13} fontSize={11} fill={PLOT_COLOURS.axis} {...HALO}>
            {highK ? 'H/H0 residual: record − model' : 'ln residual of the window’s readings'}
          </text>
          <path d={residualPath} clipPath={`url(#${clipId}-strip)`} stroke={PLOT_COLOURS.inWindow} strokeWidth={4} strokeLinecap="round" data-testid="residuals" />
          <text x={MARGIN.left + plotWidth / 2} y={TOTAL_HEIGHT - 10} textAnchor="middle" fontSize={12} fill={PLOT_COLOURS.axis}>
            Time since the test start ({unitLabel})
          </text>

          {/* Pointer surface: draw a window, drag its edges or move it; Shift + drag pans. */}
          <rect
            x={MARGIN.left}
            y={MARGIN.top}
            width={plotWidth}
            height={MAIN_HEIGHT}
            fill="transparent"
            style={{ cursor }}
            onPointerDown={onPointerDown}
            onPointerMove={onPointerMove}
            onPointerUp={endDrag}
            onPointerCancel={endDrag}
            data-testid="plot-surface"
          />
          {window && onWindowChange
            ? (['from', 'to'] as const).map((edge) => {
                const seconds = edge === 'from' ? window.fromSeconds : window.toSeconds;
                const px = x(seconds);
                if (px < MARGIN.left - 1 || px > MARGIN.left + plotWidth + 1) return null;
                return (
                  <rect
                    key={edge}
                    x={px - 5}
                    y={MARGIN.top + MAIN_HEIGHT / 2 - 16}
                    width={10}
                    height={32}
                    rx={3}
                    fill="white"
                    stroke={PLOT_COLOURS.band}
                    strokeWidth={1.5}
                    tabIndex={0}
                    role="slider"
                    aria-label={edge === 'from' ? 'Window start' : 'Window end'}
                    aria-valuemin={0}
                    aria-valuemax={Number((fullDomain[1] / per).toPrecision(6))}
                    aria-valuenow={Number((seconds / per).toPrecision(6))}
                    aria-valuetext={fmtT(seconds)}
                    aria-orientation="horizontal"
                    onKeyDown={nudge(edge)}
                    style={{ cursor: 'ew-resize', pointerEvents: 'none' }}
                    className="focus:outline-none focus-visible:stroke-[3]"
                  />
                );
              })
            : null}
        </svg>
      </div>
      {highK ? (
        <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-600" aria-label="Legend">
          <li className="flex items-center gap-1.5">
            <span className="inline-block size-2.5 rounded-full" style={{ background: PLOT_COLOURS.inWindow }} aria-hidden="true" />
            Readings from the test start (all fitted)
          </li>
          <li className="flex items-center gap-1.5">
            <span className="inline-block h-0.5 w-4" style={{ background: PLOT_COLOURS.model }} aria-hidden="true" />
            Fitted high-K model
          </li>
          <li className="flex items-center gap-1.5">
            <span className="inline-block h-px w-4" style={{ background: PLOT_COLOURS.axis }} aria-hidden="true" />
            Static level, H/H0 = 0
          </li>
        </ul>
      ) : (
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-600" aria-label="Legend">
        <li className="flex items-center gap-1.5">
          <span className="inline-block size-2.5 rounded-full" style={{ background: PLOT_COLOURS.inWindow }} aria-hidden="true" />
          Readings in the window
        </li>
        <li className="flex items-center gap-1.5">
          <span className="inline-block size-2.5 rounded-full" style={{ background: PLOT_COLOURS.outside }} aria-hidden="true" />
          Other readings
        </li>
        <li className="flex items-center gap-1.5">
          <span className="inline-block h-0.5 w-4" style={{ background: PLOT_COLOURS.line }} aria-hidden="true" />
          Fitted line
        </li>
        <li className="flex items-center gap-1.5">
          <span className="inline-block h-2.5 w-4 border border-dashed" style={{ borderColor: PLOT_COLOURS.band, background: 'rgba(23,115,107,0.1)' }} aria-hidden="true" />
          Fitting window
        </li>
        <li className="flex items-center gap-1.5">
          <span className="inline-block h-2.5 w-4" style={{ background: 'rgba(245,158,11,0.25)' }} aria-hidden="true" />
          Recommended range
        </li>
      </ul>
      )}
      {onWindowChange && !highK ? (
        <p className="text-xs text-slate-500">
          Drag across the plot to draw the fitting window; drag its edges to adjust it, or inside it to move it. Shift + drag or the mouse wheel
          pans and zooms the time axis.
        </p>
      ) : null}
    </div>
  );
}
