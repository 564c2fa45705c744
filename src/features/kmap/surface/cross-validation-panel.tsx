import type { CrossValidation } from '@shared/schemas/ksurface';
import type { DisplayUnits } from '@shared/schemas/sites';
import { unitLog10Offset } from '../colour';
import type { KUnit } from '@shared/units/conductivity';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { decadeLabel, formatLength } from '../format';
import { COLOURS } from './layers';
import { decades, plotFrame, spreadLabels, toPixelX, toPixelY, worstPredicted } from './plot-math';

const fixed = (v: number, d = 3) => (Object.is(v, -0) ? 0 : v).toFixed(d);
const grouped = new Intl.NumberFormat('en', { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const latLon = (lat: number, lon: number) => `${Math.abs(lat).toFixed(5)}° ${lat >= 0 ? 'N' : 'S'}, ${Math.abs(lon).toFixed(5)}° ${lon >= 0 ? 'E' : 'W'}`;

interface Props {
  cv: CrossValidation | undefined;
  pending: boolean;
  /** Whether the K surface is shown (the cross-validation follows its settings). */
  shown: boolean;
  error: string | null;
  power: number;
  onUsePower: (p: number) => void;
  kUnit: KUnit;
  displayUnits: DisplayUnits;
  epsgCode: number;
}

/** Leave-one-out cross-validation of the surface's settings: errors by power, the plot, next-test spots. */
export function CrossValidationPanel({ cv, pending, shown, error, power, onUsePower, kUnit, displayUnits, epsgCode }: Props) {
  if (error) return <p className="text-sm text-red-700">{error}</p>;
  if (!shown) return <p className="text-sm text-slate-600">Show the K surface to cross-validate its settings.</p>;
  if (!cv) return pending ? <Spinner label="Cross-validating…" /> : <p className="text-sm text-slate-600">Needs at least two wells with a Well K.</p>;
  const rows = [{ power: cv.power, rmseLog10: cv.rmseLog10, meanErrorLog10: cv.meanErrorLog10, current: true }, ...cv.byPower.map((r) => ({ ...r, current: false }))];
  return (
    <div className="space-y-3 text-sm" data-testid="cv-panel">
      <p className="text-xs text-slate-600">
        Each of the {cv.n} wells is left out in turn and predicted from the others; errors are predicted − observed, in log10 units (1 = a factor of ten).
      </p>
      <table className="w-full text-xs tabular-nums" data-testid="cv-table">
        <caption className="sr-only">Leave-one-out errors by power</caption>
        <thead>
          <tr className="text-left text-slate-600">
            <th scope="col" className="py-1 font-medium">
              Power
            </th>
            <th scope="col" className="py-1 text-right font-medium">
              RMSE
            </th>
            <th scope="col" className="py-1 text-right font-medium">
              Mean error
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.power}-${r.current}`} className={r.current ? 'bg-accent-50 font-semibold' : r.power === cv.suggestedPower ? 'text-accent-800' : ''}>
              <td className="py-0.5">
                {r.power}
                {r.current ? ' (current)' : r.power === cv.suggestedPower ? ' (lowest RMSE)' : ''}
              </td>
              <td className="py-0.5 text-right">{fixed(r.rmseLog10)}</td>
              <td className="py-0.5 text-right">{fixed(r.meanErrorLog10)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="flex flex-wrap items-center gap-2">
        <p className="text-xs text-slate-700" data-testid="cv-suggested">
          Suggested power: <strong>{cv.suggestedPower}</strong>
        </p>
        <Button size="sm" variant="secondary" disabled={cv.suggestedPower === power} onClick={() => onUsePower(cv.suggestedPower)}>
          Use power {cv.suggestedPower}
        </Button>
      </div>
      <ObservedPredictedPlot cv={cv} kUnit={kUnit} />
      <p className="flex flex-wrap gap-x-3 text-xs text-slate-600">
        <span>
          <span aria-hidden="true" className="mr-1 inline-block size-2.5 rounded-full border-2" style={{ borderColor: COLOURS.overPredicted }} />
          ring on the map: predicted too high
        </span>
        <span>
          <span aria-hidden="true" className="mr-1 inline-block size-2.5 rounded-full border-2" style={{ borderColor: COLOURS.underPredicted }} />
          predicted too low (wider = larger error)
        </span>
      </p>
      <div>
        <h3 className="text-xs font-semibold text-slate-700">Next-test spots</h3>
        {cv.nextTestSpots.length === 0 ? (
          <p className="text-xs text-slate-600">None: choose an outline to look for places inside it.</p>
        ) : (
          <ol className="mt-1 space-y-1 text-xs" data-testid="next-test-spots">
            {cv.nextTestSpots.map((s, i) => (
              <li key={`${s.x},${s.y}`} className="flex gap-2">
                <span className="inline-flex size-5 shrink-0 items-center justify-center rounded-full bg-white font-semibold ring-2 ring-slate-900">{i + 1}</span>
                <span className="tabular-nums">
                  {epsgCode === 4326 ? '' : `x ${grouped.format(s.x)}, y ${grouped.format(s.y)} (EPSG:${epsgCode}); `}
                  {latLon(s.lat, s.lon)}; nearest well {formatLength(s.nearestWellM, displayUnits, 'elevation')}
                </span>
              </li>
            ))}
          </ol>
        )}
      </div>
    </div>
  );
}

function ObservedPredictedPlot({ cv, kUnit }: { cv: CrossValidation; kUnit: KUnit }) {
  const offset = unitLog10Offset(kUnit);
  const size = 260;
  const frame = plotFrame(
    cv.wells.flatMap((w) => [w.observedLog10K + offset, w.predictedLog10K + offset]),
    size,
  );
  const worstList = worstPredicted(cv.wells, 3);
  const worst = new Set(worstList.map((w) => w.wellId));
  const labelYs = spreadLabels(worstList.map((w) => toPixelY(frame, w.predictedLog10K + offset) - 5));
  const labelY = new Map(worstList.map((w, i) => [w.wellId, labelYs[i]]));
  const ds = decades(frame);
  const lo = toPixelX(frame, frame.from);
  const hi = toPixelX(frame, frame.to);
  return (
    <figure>
      <svg viewBox={`0 0 ${size} ${size}`} className="w-full max-w-[260px]" role="img" aria-label={`Observed against predicted K of ${cv.n} wells, log scales, with the three worst-predicted named`} data-testid="cv-plot">
        <rect x={lo} y={toPixelY(frame, frame.to)} width={hi - lo} height={toPixelY(frame, frame.from) - toPixelY(frame, frame.to)} fill="#f8fafc" stroke="#cbd5e1" />
        {ds.map((d) => (
          <g key={d}>
            <line x1={toPixelX(frame, d)} x2={toPixelX(frame, d)} y1={toPixelY(frame, frame.from)} y2={toPixelY(frame, frame.to)} stroke="#e2e8f0" />
            <line x1={lo} x2={hi} y1={toPixelY(frame, d)} y2={toPixelY(frame, d)} stroke="#e2e8f0" />
            <text x={toPixelX(frame, d)} y={size - frame.margin + 14} fontSize="10" textAnchor="middle" fill="#475569">
              {decadeLabel(d)}
            </text>
            <text x={frame.margin - 4} y={toPixelY(frame, d) + 3} fontSize="10" textAnchor="end" fill="#475569">
              {decadeLabel(d)}
            </text>
          </g>
        ))}
        <line x1={lo} y1={toPixelY(frame, frame.from)} x2={hi} y2={toPixelY(frame, frame.to)} stroke="#64748b" strokeDasharray="4 3" />
        {cv.wells.map((w) => {
          const x = toPixelX(frame, w.observedLog10K + offset);
          const y = toPixelY(frame, w.predictedLog10K + offset);
          const bad = worst.has(w.wellId);
          return (
            <g key={w.wellId}>
              <circle cx={x} cy={y} r={bad ? 4 : 3} fill={bad ? '#b91c1c' : '#0f766e'} fillOpacity={0.8}>
                <title>{`${w.name}: observed ${(10 ** (w.observedLog10K + offset)).toExponential(2)}, predicted ${(10 ** (w.predictedLog10K + offset)).toExponential(2)} ${kUnit}`}</title>
              </circle>
              {bad ? (
                <text
                  x={x > size * 0.65 ? x - 6 : x + 6}
                  textAnchor={x > size * 0.65 ? 'end' : 'start'}
                  y={labelY.get(w.wellId) ?? y - 5}
                  fontSize="10"
                  fill="#7f1d1d"
                  data-worst-well={w.name}
                >
                  {w.name}
                </text>
              ) : null}
            </g>
          );
        })}
        <text x={(lo + hi) / 2} y={size - 4} fontSize="10" textAnchor="middle" fill="#334155">
          Observed Well K ({kUnit})
        </text>
        <text transform={`translate(10 ${size / 2}) rotate(-90)`} fontSize="10" textAnchor="middle" fill="#334155">
          Predicted without the well ({kUnit})
        </text>
      </svg>
      <figcaption className="text-xs text-slate-600">Dashed: predicted = observed. Named: the three worst-predicted wells.</figcaption>
    </figure>
  );
}
