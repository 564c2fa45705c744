import type { ReactNode } from 'react';
import { K_UNITS, type KUnit } from '@shared/units/conductivity';
import { InlineSelect } from '@/components/ui/field';
import { describeRegime, formatDuration, formatK, formatLengthIn, formatPercent, formatQuantity } from '../format';
import type { GeometryUnits } from '../geometry-form';
import { secondsPer, type PlotTimeUnit } from '../plot-math';
import type { ResultView } from '../preview';

const WINDOW_SOURCES = {
  recommended: 'the recommended range',
  fallback: 'all readings 0.05 < H/H0 ≤ 1 (fewer than 3 in the recommended range)',
  entered: 'entered',
  'all-readings': 'every reading from the test start',
} as const;

function Row({ term, children }: { term: ReactNode; children: ReactNode }) {
  return (
    <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-0.5 border-b border-slate-100 py-1.5 last:border-0">
      <dt className="text-slate-600">{term}</dt>
      <dd className="text-right font-medium text-slate-900 tabular-nums">{children}</dd>
    </div>
  );
}

export function FitResults({
  view,
  kUnit,
  onKUnitChange,
  units,
  timeUnit,
  anchored,
  heading,
  sources,
}: {
  view: ResultView;
  kUnit: KUnit;
  onKUnitChange: (unit: KUnit) => void;
  units: GeometryUnits;
  timeUnit: PlotTimeUnit;
  anchored: boolean;
  heading: ReactNode;
  /** Whether the record's static level and test start were entered or detected. */
  sources?: { staticSource: 'entered' | 'pre-test'; testStartSource: 'entered' | 'detected'; preTestCount: number };
}) {
  const per = secondsPer(timeUnit);
  const t = (seconds: number) => `${formatQuantity(seconds / per)} ${timeUnit}`;
  return (
    <section aria-label="Result" className="space-y-3">
      <div>{heading}</div>
      <div className="rounded-md bg-accent-50 px-3 py-3 ring-1 ring-accent-200 ring-inset">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <p className="text-sm text-accent-800">Hydraulic conductivity K</p>
          <InlineSelect label="K unit" value={kUnit} onChange={(e) => onKUnitChange(e.target.value as KUnit)}>
            {K_UNITS.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </InlineSelect>
        </div>
        <p className="mt-1 text-2xl font-semibold text-slate-900 tabular-nums" data-testid="k-value" data-k-si={view.kMetersPerSecond}>
          {formatK(view.kMetersPerSecond, kUnit)}
        </p>
        {kUnit !== 'm/s' ? (
          <p className="text-sm text-slate-700 tabular-nums" data-testid="k-value-si">
            {formatK(view.kMetersPerSecond, 'm/s')}
          </p>
        ) : null}
      </div>
      {view.highK ? (
        <HighKRows view={view} highK={view.highK} units={units} t={t} />
      ) : (
      <dl className="text-sm">
        <Row term="Basic time lag T0">
          <span data-testid="t0-value">{formatDuration(view.t0Seconds)}</span>
        </Row>
        <Row term="r²">
          <span className="block">{Math.max(0, view.rSquared).toFixed(4)}</span>
          <span className="block text-xs font-normal text-slate-600">{anchored ? 'about the origin (line through H/H0 = 1)' : 'about the mean'}</span>
        </Row>
        <Row term="Readings used">
          <span data-testid="readings-used">{view.count}</span>
        </Row>
        <Row term="Window used">
          <span className="block" data-testid="window-used">
            t = {t(view.window.fromSeconds)} – {t(view.window.toSeconds)}
          </span>
          <span className="block text-xs font-normal text-slate-600">
            H/H0 {formatQuantity(view.window.headMax)} – {formatQuantity(view.window.headMin)}, {WINDOW_SOURCES[view.window.source]}
          </span>
        </Row>
        <Row term="Slope of ln(H/H0)">{formatQuantity(view.slopePerSecond)} per s</Row>
        {!anchored ? (
          <>
            <Row term="Intercept of ln(H/H0)">{formatQuantity(view.intercept)}</Row>
            <Row term="Effective H0 (line)">{formatLengthIn(view.effectiveH0M, units.length)}</Row>
          </>
        ) : null}
        <Row term="Line reaches 1/e">{t(view.lineCrossingSeconds)}</Row>
        <Row term="Record reaches 1/e">{view.recordCrossingSeconds === null ? 'never' : t(view.recordCrossingSeconds)}</Row>
        <Row term="Measured H0">{formatLengthIn(Math.abs(view.h0M), units.length)}</Row>
        {sources ? (
          <Row term="Test start and static level">
            <span className="block" data-testid="start-source">
              test start {sources.testStartSource === 'entered' ? 'entered' : 'detected from the record'}
            </span>
            <span className="block" data-testid="static-source">
              static level {sources.staticSource === 'entered' ? 'entered' : `detected (from ${sources.preTestCount} pre-test readings)`}
            </span>
          </Row>
        ) : null}
        <Row term="Expected H0 (slug volume)">
          {view.expectedH0M === null ? (
            <span className="font-normal text-slate-500">no slug volume recorded</span>
          ) : (
            <>
              {formatLengthIn(view.expectedH0M, units.length)}
              <span className="ml-1 text-xs font-normal text-slate-600">
                (measured is {formatQuantity(Math.abs(view.h0M) / view.expectedH0M, 2)}×)
              </span>
            </>
          )}
        </Row>
        {view.simplified ? (
          <Row term="K, simplified form ln(L/R)">
            <span className="block">{formatK(view.simplified.kMetersPerSecond, kUnit)}</span>
            <span className="block text-xs font-normal text-slate-600">
              {Number.isFinite(view.simplified.mLOverD)
                ? view.simplified.valid
                  ? `valid: mL/D = ${formatQuantity(view.simplified.mLOverD)} > 4`
                  : `outside its validity: mL/D = ${formatQuantity(view.simplified.mLOverD)} ≤ 4`
                : ''}
              {`; ${formatPercent(view.simplified.differencePercent)} from the full form`}
            </span>
          </Row>
        ) : null}
        {view.bouwerRice ? (
          <>
            <Row term="ln(Re/rw)">{formatQuantity(view.bouwerRice.lnReOverRw, 4)}</Row>
            <Row term="Le/rw">{formatQuantity(view.bouwerRice.leOverRw)}</Row>
            <Row term="Penetration">
              {view.bouwerRice.penetration === 'full' ? 'full (D = Lw)' : 'partial'}
              {view.bouwerRice.capApplied ? <span className="block text-xs font-normal text-slate-600">ln((D − Lw)/rw) capped at 6</span> : null}
            </Row>
          </>
        ) : null}
        <CasingRow view={view} units={units} />
      </dl>
      )}
      <div className="space-y-0.5 text-xs text-slate-500">
        <p>{view.lineReference}</p>
        <p>{view.kReference}</p>
      </div>
    </section>
  );
}

function CasingRow({ view, units }: { view: ResultView; units: GeometryUnits }) {
  return (
    <Row term={view.casingRadiusIsEffective ? 'Effective casing radius used' : 'Casing radius used'}>
      {formatLengthIn(view.casingRadiusUsedM, units.radius, 4)}
      {view.casingRadiusIsEffective ? <span className="block text-xs font-normal text-slate-600">level in the filter pack</span> : null}
    </Row>
  );
}

/** A high-K fit's numbers: C_D and its regime, L_e (fitted or held, beside the well's estimate), the fit's quality. */
function HighKRows({ view, highK, units, t }: { view: ResultView; highK: NonNullable<ResultView['highK']>; units: GeometryUnits; t: (seconds: number) => string }) {
  const regime = describeRegime(highK.regime);
  return (
    <div className="space-y-2">
      <p className="rounded-md bg-slate-50 px-3 py-2 text-sm text-slate-800 ring-1 ring-slate-200 ring-inset">
        <span className="font-semibold" data-testid="damping-regime" data-regime={highK.regime}>
          {regime.label}
        </span>
        : {regime.meaning}.
      </p>
    <dl className="text-sm" data-testid="high-k-result">
      <Row term="Damping parameter C_D">
        <span data-testid="damping-parameter">{formatQuantity(highK.dampingParameter, 3)}</span>
      </Row>
      <Row term="Effective length L_e">
        <span className="block" data-testid="effective-length">
          {formatLengthIn(highK.effectiveLengthM, units.length)}
        </span>
        <span className="block text-xs font-normal text-slate-600">{highK.effectiveLengthFitted ? 'fitted to the record' : 'held as entered'}</span>
        <span className="block text-xs font-normal text-slate-600">
          {highK.effectiveLengthEstimateM === null ? 'no estimate from the well' : `well estimate ${formatLengthIn(highK.effectiveLengthEstimateM, units.length)}`}
        </span>
      </Row>
      {highK.dampedPeriodSeconds !== null ? <Row term="Damped period">{t(highK.dampedPeriodSeconds)}</Row> : null}
      <Row term="Equivalent time lag C_D √(L_e/g)">
        <span data-testid="t0-value">{formatDuration(view.t0Seconds)}</span>
      </Row>
      <Row term="Residual RMS">
        <span data-testid="residual-rms">{formatQuantity(highK.residualRms, 2)}</span>
        <span className="ml-1 text-xs font-normal text-slate-600">in H/H0</span>
      </Row>
      <Row term="r²">
        <span className="block">{Math.max(0, view.rSquared).toFixed(4)}</span>
        <span className="block text-xs font-normal text-slate-600">about the mean</span>
      </Row>
      {highK.kRelativeStandardError !== null ? <Row term="Standard error of K">± {formatQuantity(highK.kRelativeStandardError * 100, 2)} %</Row> : null}
      <Row term="Readings used">
        <span className="block" data-testid="readings-used">
          {view.count}
        </span>
        <span className="block text-xs font-normal text-slate-600">all from the test start</span>
        <span className="block text-xs font-normal text-slate-600">
          t = {t(view.window.fromSeconds)} – {t(view.window.toSeconds)}
        </span>
      </Row>
      <Row term="Measured H0">{formatLengthIn(Math.abs(view.h0M), units.length)}</Row>
      <CasingRow view={view} units={units} />
    </dl>
    </div>
  );
}
