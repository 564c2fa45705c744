import { useEffect, useId, useRef } from 'react';
import type { KUnit } from '@shared/units/conductivity';
import { InlineSelect } from '@/components/ui/field';
import { cn } from '@/lib/cn';
import { decadeTicks, unitLog10Offset, type DecadeDomain, type KColourScale } from '../colour';
import { decadeLabel, MAP_K_UNITS } from '../format';
import { MAP_COLOURS } from '../layers';
import type { KBin } from '../model';

export interface KLegendProps {
  domain: DecadeDomain;
  scale: KColourScale;
  bins: KBin[];
  /** Wells selected on the map, per bin. */
  selectedPerBin: number[];
  hoveredBin: number;
  onHoverBin: (bin: number) => void;
  onSelectBin: (bin: number, add: boolean) => void;
  unit: KUnit;
  onUnitChange: (unit: KUnit) => void;
  unanalysedCount: number;
}

/** log10 K in the legend's unit → log10 K in m/s (what the scale takes). */
const toSi = (domain: DecadeDomain, log10InUnit: number) => log10InUnit - unitLog10Offset(domain.unit);

/**
 * The legend of the K map: the colour bar with its decade ticks and, on the same log axis, the
 * histogram of Well K (four bins per decade). Hovering a bin rings its wells on the map; the bins
 * of the selected wells are marked.
 */
export function KLegend(props: KLegendProps) {
  const { domain, scale, bins, selectedPerBin, hoveredBin, onHoverBin, onSelectBin, unit, onUnitChange, unanalysedCount } = props;
  const titleId = useId();
  const maxCount = Math.max(1, ...bins.map((b) => b.count));
  const ticks = decadeTicks(domain);
  const withK = bins.reduce((s, b) => s + b.count, 0);
  const hovered = hoveredBin >= 0 ? bins[hoveredBin] : undefined;

  return (
    <figure aria-labelledby={titleId} className="space-y-2" data-testid="k-legend">
      <figcaption className="flex flex-wrap items-center justify-between gap-2">
        <span id={titleId} className="text-sm font-semibold text-slate-900">
          Well K <span className="font-normal text-slate-600">({unit}, log scale)</span>
        </span>
        <InlineSelect label="K unit" value={unit} onChange={(e) => onUnitChange(e.target.value as KUnit)}>
          {MAP_K_UNITS.map((u) => (
            <option key={u.id} value={u.id}>
              {u.label}
            </option>
          ))}
        </InlineSelect>
      </figcaption>
      <div className="px-4">
        <div
          role="group"
          aria-label={`Histogram of Well K: ${withK.toLocaleString('en')} wells in bins of a quarter decade`}
          className="flex h-20 items-end border-b border-slate-300"
          onMouseLeave={() => onHoverBin(-1)}
        >
          {bins.map((b) => {
            const colour = scale(toSi(domain, (b.fromLog10 + b.toLog10) / 2));
            const selected = selectedPerBin[b.index] ?? 0;
            return (
              <button
                key={b.index}
                type="button"
                className={cn(
                  'relative flex h-full min-w-0 flex-1 items-end px-px focus:outline-none focus-visible:bg-slate-100',
                  hoveredBin === b.index && 'bg-orange-50',
                )}
                aria-label={`${b.count} ${b.count === 1 ? 'well' : 'wells'} from ${binEdge(b.fromLog10)} to ${binEdge(b.toLog10)} ${unit}${selected ? `, ${selected} selected` : ''}`}
                aria-pressed={selected > 0}
                data-bin={b.index}
                onMouseEnter={() => onHoverBin(b.index)}
                onFocus={() => onHoverBin(b.index)}
                onBlur={() => onHoverBin(-1)}
                onClick={(e) => b.count > 0 && onSelectBin(b.index, e.shiftKey)}
              >
                <span
                  className={cn('block w-full rounded-t-sm', selected > 0 && 'ring-2 ring-slate-900 ring-offset-1')}
                  style={{ height: b.count ? `${Math.max(4, (b.count / maxCount) * 100)}%` : 0, background: colour }}
                />
              </button>
            );
          })}
        </div>
        <ColourBar domain={domain} scale={scale} />
        <div className="relative h-5 text-xs text-slate-700" aria-hidden="true">
          {ticks.map((t) => (
            <span
              key={t.decade}
              className="absolute top-0.5 -translate-x-1/2 tabular-nums whitespace-nowrap"
              style={{ left: `${t.fraction * 100}%` }}
              data-decade={t.decade}
            >
              {decadeLabel(t.decade)}
            </span>
          ))}
        </div>
        <p className="sr-only">
          Colour scale from 10^{domain.fromDecade} to 10^{domain.toDecade} {unit}, with a tick at every factor of ten, equally spaced.
        </p>
      </div>
      <p className="min-h-5 text-xs text-slate-600" aria-live="polite">
        {hovered
          ? `${hovered.count} ${hovered.count === 1 ? 'well' : 'wells'} between ${binEdge(hovered.fromLog10)} and ${binEdge(hovered.toLog10)} ${unit}, ringed on the map`
          : 'Point at a bar to ring its wells on the map; click it to select them.'}
      </p>
      <p className="flex items-center gap-2 text-xs text-slate-700">
        <span aria-hidden="true" className="inline-block size-3 rounded-full border-2" style={{ borderColor: MAP_COLOURS.unanalysed }} />
        {unanalysedCount.toLocaleString('en')} {unanalysedCount === 1 ? 'well' : 'wells'} without a Checked fit
      </p>
    </figure>
  );
}

/** A bin edge, a quarter decade: "10⁻⁵·²⁵" reads poorly, so the value is written out. */
function binEdge(log10: number): string {
  const v = 10 ** log10;
  return Number(v.toPrecision(2)).toExponential().replace(/e\+?/, 'e');
}

/** The colour bar, one canvas column per device pixel, each the scale's colour at its K. */
function ColourBar({ domain, scale }: { domain: DecadeDomain; scale: KColourScale }) {
  const ref = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    const canvas = ref.current;
    if (!canvas) return;
    const draw = () => {
      const ratio = window.devicePixelRatio || 1;
      const width = Math.max(1, Math.round(canvas.clientWidth * ratio));
      const height = Math.max(1, Math.round(canvas.clientHeight * ratio));
      canvas.width = width;
      canvas.height = height;
      const ctx = canvas.getContext('2d');
      if (!ctx) return;
      const [lo, hi] = scale.domain();
      for (let x = 0; x < width; x++) {
        ctx.fillStyle = scale(lo + ((hi - lo) * (x + 0.5)) / width);
        ctx.fillRect(x, 0, 1, height);
      }
    };
    draw();
    const observer = new ResizeObserver(draw);
    observer.observe(canvas);
    return () => observer.disconnect();
  }, [scale, domain]);
  return <canvas ref={ref} className="block h-4 w-full rounded-b-sm" data-testid="k-colour-bar" aria-hidden="true" />;
}
