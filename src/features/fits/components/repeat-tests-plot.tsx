import { useMemo } from 'react';
import { scaleLinear, scaleLog } from 'd3-scale';
import { headDomain, logTicks, ONE_OVER_E, recoveryEndSeconds, secondsPer, type PlotTimeUnit } from '../plot-math';
import { useElementWidth } from './use-element-width';

export interface Curve {
  id: string;
  label: string;
  colour: string;
  elapsedSeconds: readonly number[];
  normalizedHead: readonly number[];
}

/** Kfield's own series colours: distinct at a glance and legible on white. */
export const CURVE_COLOURS = ['#135c56', '#9a3412', '#1d4ed8', '#7e22ce', '#a16207', '#be123c', '#0f766e', '#4d7c0f'] as const;

const M = { left: 56, right: 12, top: 10, bottom: 40 };
const HEIGHT = 300;

/** The normalized curves of a well's records on one semi-log plot, one colour per record. */
/** `whole`: every reading; otherwise the recovery, up to where the slowest record falls to 1 % of H0. */
export function RepeatTestsPlot({ curves, timeUnit, whole = false }: { curves: readonly Curve[]; timeUnit: PlotTimeUnit; whole?: boolean }) {
  const [ref, measured] = useElementWidth<HTMLDivElement>();
  const width = Math.max(300, measured || 640);
  const plotWidth = width - M.left - M.right;
  const plotHeight = HEIGHT - M.top - M.bottom;
  const per = secondsPer(timeUnit);

  const { maxT, allHeads } = useMemo(() => {
    let max = 0;
    let recovered = 0;
    const heads: number[] = [];
    for (const c of curves) {
      for (const t of c.elapsedSeconds) if (t > max) max = t;
      recovered = Math.max(recovered, recoveryEndSeconds(c.elapsedSeconds, c.normalizedHead) ?? max);
      heads.push(...c.normalizedHead);
    }
    const end = whole || recovered === 0 ? max : Math.min(max, recovered);
    return { maxT: end > 0 ? end * 1.03 : 1, allHeads: heads };
  }, [curves, whole]);
  const [yLo, yHi] = useMemo(() => headDomain(allHeads), [allHeads]);
  const x = scaleLinear().domain([0, maxT]).range([M.left, M.left + plotWidth]);
  const y = scaleLog().domain([yLo, yHi]).range([M.top + plotHeight, M.top]);
  const ticks = logTicks(yLo, yHi);
  const unitScale = scaleLinear().domain([0, maxT / per]);
  const xTicks = unitScale.ticks(Math.max(3, Math.floor(plotWidth / 90)));
  const xFormat = unitScale.tickFormat(Math.max(3, Math.floor(plotWidth / 90)));

  const paths = curves.map((c) => {
    let d = '';
    for (let i = 0; i < c.elapsedSeconds.length; i++) {
      const h = c.normalizedHead[i];
      if (!(h >= yLo) || h > yHi || c.elapsedSeconds[i] > maxT) continue;
      d += `${d === '' ? 'M' : 'L'}${x(c.elapsedSeconds[i]).toFixed(1)},${y(h).toFixed(1)}`;
    }
    return { id: c.id, colour: c.colour, d };
  });

  return (
    <div className="space-y-2">
      <div ref={ref} className="w-full min-w-0">
        <svg width="100%" viewBox={`0 0 ${width} ${HEIGHT}`} role="img" aria-label={`Normalized curves of ${curves.length} records on a semi-log plot`} className="block h-auto w-full">
          <rect x={M.left} y={M.top} width={plotWidth} height={plotHeight} fill="white" stroke="#e2e8f0" />
          {ticks.minor.map((v) => (
            <line key={`m${v}`} x1={M.left} x2={M.left + plotWidth} y1={y(v)} y2={y(v)} stroke="#e2e8f0" strokeWidth={0.5} />
          ))}
          {ticks.decades.map((d) => (
            <g key={`d${d.value}`}>
              <line x1={M.left} x2={M.left + plotWidth} y1={y(d.value)} y2={y(d.value)} stroke="#cbd5e1" />
              <text x={M.left - 8} y={y(d.value)} dy="0.32em" textAnchor="end" fontSize={12} fill="#334155">
                {d.label}
              </text>
            </g>
          ))}
          {xTicks.map((v) => (
            <g key={`x${v}`}>
              <line x1={x(v * per)} x2={x(v * per)} y1={M.top} y2={M.top + plotHeight} stroke="#e2e8f0" />
              <text x={x(v * per)} y={M.top + plotHeight + 16} textAnchor="middle" fontSize={12} fill="#334155">
                {xFormat(v)}
              </text>
            </g>
          ))}
          <line x1={M.left} x2={M.left + plotWidth} y1={y(ONE_OVER_E)} y2={y(ONE_OVER_E)} stroke="#475569" strokeDasharray="6 4" />
          <text x={M.left + 6} y={y(ONE_OVER_E) - 5} fontSize={11} fill="#475569">
            1/e = 0.37
          </text>
          {paths.map((p) => (
            <path key={p.id} d={p.d} fill="none" stroke={p.colour} strokeWidth={1.75} strokeLinejoin="round" />
          ))}
          <text transform={`translate(14 ${M.top + plotHeight / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill="#334155">
            H/H0 (log)
          </text>
          <text x={M.left + plotWidth / 2} y={HEIGHT - 8} textAnchor="middle" fontSize={12} fill="#334155">
            Time since the test start ({timeUnit})
          </text>
        </svg>
      </div>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-700" aria-label="Records in the plot">
        {curves.map((c) => (
          <li key={c.id} className="flex items-center gap-1.5">
            <span className="inline-block h-0.5 w-5" style={{ background: c.colour }} aria-hidden="true" />
            {c.label}
          </li>
        ))}
      </ul>
    </div>
  );
}
