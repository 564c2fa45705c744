import { useId, useMemo } from 'react';
import { scaleLinear } from 'd3-scale';
import type { Preview } from '@shared/schemas/records';
import { timeUnitFor } from './recovery-curve';

const COLOURS = { curve: '#135c56', grid: '#e2e8f0', axis: '#334155', start: '#b45309', candidate: '#7c3aed', entered: '#0f172a' } as const;
const WIDTH = 640;
const HEIGHT = 220;
const M = { top: 14, right: 14, bottom: 34, left: 58 };

export interface CurveMarker {
  seconds: number;
  label: string;
  kind: 'detected' | 'candidate' | 'entered';
}

/** How the value reads on the axis: depth grows downward, a head or a pressure upward. */
export function curveAxis(reference: 'depth' | 'vented' | 'absolute', unit: 'm' | 'Pa'): { label: string; downward: boolean; scale: number } {
  if (unit === 'Pa') return { label: 'Absolute pressure (kPa)', downward: false, scale: 1e-3 };
  return reference === 'depth' ? { label: 'Depth below measuring point (m)', downward: true, scale: 1 } : { label: 'Head above the sensor (m)', downward: false, scale: 1 };
}

/**
 * The logger record as read, before any reduction, with the detected test start or the candidate
 * starts marked on it: where the start could not be found, the user sees where it might be.
 */
export function PreviewCurve({
  curve,
  reference,
  markers,
  typedStart = null,
}: {
  curve: NonNullable<Preview['curve']>;
  reference: 'depth' | 'vented' | 'absolute';
  markers: readonly CurveMarker[];
  /** A start typed as text (a time of day, 1:30): placed on the record's clock when it is read, not drawn here. */
  typedStart?: string | null;
}) {
  const titleId = useId();
  const axis = curveAxis(reference, curve.unit);
  const last = curve.secondsAfterFirst[curve.secondsAfterFirst.length - 1] ?? 1;
  const unit = timeUnitFor(last);
  const { x, y, path } = useMemo(() => {
    const values = curve.value.map((v) => v * axis.scale);
    let lo = Math.min(...values);
    let hi = Math.max(...values);
    if (!(hi > lo)) {
      lo -= 0.5;
      hi += 0.5;
    }
    const pad = (hi - lo) * 0.06;
    const xs = scaleLinear().domain([0, Math.max(last, 1e-9) / unit.seconds]).range([M.left, WIDTH - M.right]).nice();
    const ys = scaleLinear()
      .domain(axis.downward ? [hi + pad, lo - pad] : [lo - pad, hi + pad])
      .range([HEIGHT - M.bottom, M.top])
      .nice();
    const d = curve.secondsAfterFirst.map((t, i) => `${i === 0 ? 'M' : 'L'}${xs(t / unit.seconds).toFixed(1)},${ys(values[i]).toFixed(1)}`).join('');
    return { x: xs, y: ys, path: d };
  }, [curve, axis.downward, axis.scale, last, unit.seconds]);

  return (
    <figure aria-labelledby={titleId} className="space-y-1" data-testid="preview-curve">
      <figcaption id={titleId} className="text-xs text-slate-600">
        The record as read ({curve.readings.toLocaleString('en')} readings{curve.readings > curve.value.length ? `, ${curve.value.length} drawn` : ''}),
        {markers.length ? ' with the test start marked' : typedStart ? ` — the start you entered (${typedStart}) is placed on the record’s clock when it is read` : ' before the test start is set'}.
      </figcaption>
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} className="h-auto w-full max-w-2xl" role="img" aria-label={`${axis.label} against time`}>
        {y.ticks(5).map((v) => (
          <g key={`y${v}`}>
            <line x1={M.left} x2={WIDTH - M.right} y1={y(v)} y2={y(v)} stroke={COLOURS.grid} />
            <text x={M.left - 6} y={y(v)} textAnchor="end" dominantBaseline="middle" fontSize="11" fill={COLOURS.axis}>
              {Number(v.toPrecision(4))}
            </text>
          </g>
        ))}
        {x.ticks(6).map((v) => (
          <text key={`x${v}`} x={x(v)} y={HEIGHT - M.bottom + 14} textAnchor="middle" fontSize="11" fill={COLOURS.axis}>
            {v}
          </text>
        ))}
        <text x={(M.left + WIDTH - M.right) / 2} y={HEIGHT - 4} textAnchor="middle" fontSize="11" fill={COLOURS.axis}>
          Time after the first reading ({unit.label})
        </text>
        <text transform={`translate(12 ${(M.top + HEIGHT - M.bottom) / 2}) rotate(-90)`} textAnchor="middle" fontSize="11" fill={COLOURS.axis}>
          {axis.label}
        </text>
        <path d={path} fill="none" stroke={COLOURS.curve} strokeWidth="1.5" />
        {markers.map((m, i) => {
          const px = x(m.seconds / unit.seconds);
          const colour = m.kind === 'candidate' ? COLOURS.candidate : m.kind === 'entered' ? COLOURS.entered : COLOURS.start;
          return (
            <g key={`${m.kind}${m.seconds}`} data-marker={m.kind}>
              <line x1={px} x2={px} y1={M.top} y2={HEIGHT - M.bottom} stroke={colour} strokeDasharray={m.kind === 'candidate' ? '4 3' : undefined} strokeWidth="1.5" />
              <text x={px > WIDTH - 150 ? px - 4 : px + 4} y={M.top + 10 + (i % 3) * 13} textAnchor={px > WIDTH - 150 ? 'end' : 'start'} fontSize="11" fill={colour}>
                {m.label}
              </text>
            </g>
          );
        })}
      </svg>
    </figure>
  );
}
