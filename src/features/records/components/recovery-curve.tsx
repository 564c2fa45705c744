import { useCallback, useId, useMemo, useState } from 'react';
import { scaleLinear, scaleLog } from 'd3-scale';

/** Kfield's plot colours: slate neutrals and the app's teal. */
const COLOURS = { curve: '#135c56', point: '#135c56', grid: '#e2e8f0', minor: '#f1f5f9', axis: '#334155', reference: '#64748b' } as const;

type TimeUnit = { id: 's' | 'min' | 'h'; seconds: number; label: string };
const TIME_UNITS: TimeUnit[] = [
  { id: 's', seconds: 1, label: 's' },
  { id: 'min', seconds: 60, label: 'min' },
  { id: 'h', seconds: 3600, label: 'h' },
];

/** The unit that keeps the time axis's numbers short: seconds up to 10 min, minutes up to 5 h. */
export function timeUnitFor(maxSeconds: number): TimeUnit {
  if (maxSeconds <= 600) return TIME_UNITS[0];
  if (maxSeconds <= 5 * 3600) return TIME_UNITS[1];
  return TIME_UNITS[2];
}

/** Decades of the log axis that hold the curve: from 1 (or above) down to the lowest reading, at most 10⁻⁴. */
export function headDecades(normalizedHead: readonly number[]): [number, number] {
  let min = 1;
  let max = 1;
  for (const h of normalizedHead) {
    if (h > 0 && h < min) min = h;
    if (h > max) max = h;
  }
  const low = Math.max(-4, Math.floor(Math.log10(min)));
  const high = Math.max(0, Math.ceil(Math.log10(max)));
  return [10 ** (low === high ? low - 1 : low), 10 ** high];
}

function decadeLabel(v: number): string {
  const e = Math.round(Math.log10(v));
  return e >= 0 ? String(10 ** e) : `0.${'0'.repeat(-e - 1)}1`;
}

/** The content width of an element, followed as it resizes. */
function useWidth(): [(el: HTMLDivElement | null) => void, number] {
  const [width, setWidth] = useState(0);
  const ref = useCallback((el: HTMLDivElement | null) => {
    if (!el) return;
    setWidth(el.getBoundingClientRect().width);
    if (typeof ResizeObserver === 'undefined') return;
    const observer = new ResizeObserver((entries) => {
      for (const entry of entries) setWidth(entry.contentRect.width);
    });
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  return [ref, width];
}

/**
 * The normalized-head curve of a record on a semi-log plot: H/H0 on a log axis (decades
 * labelled), time since the test start on a linear axis with its unit. Readings at or below
 * static cannot be drawn on a log axis; the caption says how many were left out.
 */
export function RecoveryCurve({
  elapsedSeconds,
  normalizedHead,
  label,
  omitted = 0,
  scale = 'log',
  segmentStarts = [],
}: {
  elapsedSeconds: readonly number[];
  normalizedHead: readonly number[];
  label: string;
  omitted?: number;
  /** log: the semi-log plot of slug-test analysis; linear: H/H0 itself, where an oscillation shows whole. */
  scale?: 'log' | 'linear';
  /** Indexes where the line starts again after readings left out. */
  segmentStarts?: readonly number[];
}) {
  const [ref, measured] = useWidth();
  const titleId = useId();
  const width = Math.max(280, Math.round(measured || 640));
  const narrow = width < 480;
  const height = narrow ? 260 : 340;
  const margin = { top: 14, right: narrow ? 12 : 20, bottom: 46, left: narrow ? 52 : 62 };
  const innerW = width - margin.left - margin.right;
  const innerH = height - margin.top - margin.bottom;

  const view = useMemo(() => {
    const maxT = elapsedSeconds.length ? elapsedSeconds[elapsedSeconds.length - 1] : 1;
    const unit = timeUnitFor(maxT);
    const x = scaleLinear()
      .domain([0, Math.max(maxT, 1e-9) / unit.seconds])
      .nice(narrow ? 4 : 8)
      .range([0, innerW]);
    const breaks = new Set(segmentStarts);
    let y: (v: number) => number;
    let decades: number[] = [];
    const minor: number[] = [];
    let linearTicks: number[] = [];
    if (scale === 'log') {
      const [low, high] = headDecades(normalizedHead);
      const logY = scaleLog().domain([low, high]).range([innerH, 0]).clamp(true);
      y = logY;
      for (let e = Math.round(Math.log10(high)); e >= Math.round(Math.log10(low)); e--) decades.push(10 ** e);
      for (const d of decades.slice(1)) for (let k = 2; k <= 9; k++) if (d * k < high) minor.push(d * k);
    } else {
      let lo = 0;
      let hi = 1;
      for (const h of normalizedHead) {
        if (h < lo) lo = h;
        if (h > hi) hi = h;
      }
      const linY = scaleLinear().domain([lo, hi]).nice(6).range([innerH, 0]);
      y = linY;
      linearTicks = linY.ticks(6);
      decades = [];
    }
    let path = '';
    for (let i = 0; i < elapsedSeconds.length; i++) {
      const h = normalizedHead[i];
      if (scale === 'log' && !(h > 0)) continue;
      path += `${path === '' || breaks.has(i) ? 'M' : 'L'}${x(elapsedSeconds[i] / unit.seconds).toFixed(1)},${y(h).toFixed(1)}`;
    }
    return { unit, x, y, decades, minor, linearTicks, path, xTicks: x.ticks(narrow ? 4 : 8) };
  }, [elapsedSeconds, normalizedHead, innerW, innerH, narrow, scale, segmentStarts]);

  const showPoints = elapsedSeconds.length <= 80;
  const oneOverE = Math.exp(-1);
  return (
    <figure className="space-y-2">
      <div ref={ref} className="w-full">
        <svg width={width} height={height} role="img" aria-labelledby={titleId} className="block max-w-full">
          <title id={titleId}>{label}</title>
          <g transform={`translate(${margin.left},${margin.top})`}>
            {view.minor.map((v) => (
              <line key={`m${v}`} x1={0} x2={innerW} y1={view.y(v)} y2={view.y(v)} stroke={COLOURS.minor} />
            ))}
            {[...view.decades, ...view.linearTicks].map((v) => (
              <line key={`d${v}`} x1={0} x2={innerW} y1={view.y(v)} y2={view.y(v)} stroke={v === 0 ? COLOURS.axis : COLOURS.grid} strokeOpacity={v === 0 ? 0.5 : 1} />
            ))}
            {view.xTicks.map((t) => (
              <line key={`x${t}`} x1={view.x(t)} x2={view.x(t)} y1={0} y2={innerH} stroke={COLOURS.grid} />
            ))}
            <line x1={0} x2={innerW} y1={view.y(oneOverE)} y2={view.y(oneOverE)} stroke={COLOURS.reference} strokeDasharray="5 4" />
            <text x={innerW - 4} y={view.y(oneOverE) - 5} textAnchor="end" fontSize={11} fill={COLOURS.reference}>
              1/e ≈ 0.37
            </text>
            <path d={view.path} fill="none" stroke={COLOURS.curve} strokeWidth={1.75} strokeLinejoin="round" data-testid="recovery-curve" />
            {showPoints
              ? elapsedSeconds.map((t, i) =>
                  normalizedHead[i] > 0 || scale === 'linear' ? <circle key={i} cx={view.x(t / view.unit.seconds)} cy={view.y(normalizedHead[i])} r={3} fill={COLOURS.point} /> : null,
                )
              : null}
            <line x1={0} x2={0} y1={0} y2={innerH} stroke={COLOURS.axis} />
            <line x1={0} x2={innerW} y1={innerH} y2={innerH} stroke={COLOURS.axis} />
            {view.decades.map((v) => (
              <text key={`dl${v}`} x={-8} y={view.y(v)} dy="0.32em" textAnchor="end" fontSize={12} fill={COLOURS.axis}>
                {decadeLabel(v)}
              </text>
            ))}
            {view.linearTicks.map((v) => (
              <text key={`ll${v}`} x={-8} y={view.y(v)} dy="0.32em" textAnchor="end" fontSize={12} fill={COLOURS.axis}>
                {Number(v.toFixed(2))}
              </text>
            ))}
            {view.xTicks.map((t) => (
              <text key={`xl${t}`} x={view.x(t)} y={innerH + 18} textAnchor="middle" fontSize={12} fill={COLOURS.axis}>
                {Number(t.toPrecision(6))}
              </text>
            ))}
            <text x={innerW / 2} y={innerH + 38} textAnchor="middle" fontSize={12} fill={COLOURS.axis}>
              Time since the test start ({view.unit.label})
            </text>
            <text transform={`translate(${-margin.left + 14},${innerH / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill={COLOURS.axis}>
              {scale === 'log' ? 'Normalized head H/H0 (log)' : 'Normalized head H/H0'}
            </text>
          </g>
        </svg>
      </div>
      <figcaption className="text-xs text-slate-600">
        {label}.{' '}
        {omitted > 0
          ? scale === 'log'
            ? `${omitted.toLocaleString('en-US')} readings before the test start or at or below static are not drawn on the log axis.`
            : `${omitted.toLocaleString('en-US')} readings before the test start are not drawn.`
          : null}
      </figcaption>
    </figure>
  );
}
