import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { RATE_UNITS, type CaptureSketch } from '@shared/schemas/ksurface';
import type { DisplayUnits } from '@shared/schemas/sites';
import type { KUnit } from '@shared/units/conductivity';
import { Button } from '@/components/ui/button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { Spinner } from '@/components/ui/spinner';
import { Cautions } from '@/features/fits/components/cautions';
import { describeError } from '@/lib/errors';
import { formatK, formatLength } from '../format';
import type { MapWellFeature } from '../model';
import { createSketch, deleteSketch, downloadUrl, kAtQueryOptions, sketchesGeojsonUrl, surfaceBody, surfaceKeys, surfaceQueryString, type SurfaceQuery } from './api';

const input =
  'block h-8 w-full rounded-md border-0 bg-white px-2 text-sm text-slate-900 ring-1 ring-slate-300 ring-inset focus-visible:outline-2 focus-visible:outline-accent-600';
const label = 'block text-xs font-medium text-slate-700';
const grouped = new Intl.NumberFormat('en', { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const RATE_LABEL: Record<(typeof RATE_UNITS)[number], string> = { 'L/s': 'L/s', 'm3/d': 'm³/d', gpm: 'US gpm' };

/** A trial extraction well: where it is on the map and in the site's system. */
export interface TrialWell {
  lon: number;
  lat: number;
  x: number;
  y: number;
}

interface Props {
  siteId: string;
  canEdit: boolean;
  epsgCode: number;
  placing: boolean;
  onPlacingChange: (on: boolean) => void;
  trial: TrialWell | null;
  onTrialChange: (t: TrialWell | null) => void;
  /** Site x/y → lon/lat; null while the site's system loads. */
  fromSite: ((x: number, y: number) => [number, number]) | null;
  surface: SurfaceQuery;
  sketches: CaptureSketch[];
  hidden: ReadonlySet<string>;
  onToggleHidden: (id: string) => void;
  wells: readonly MapWellFeature[];
  kUnit: KUnit;
  displayUnits: DisplayUnits;
}

const num = (s: string) => (s.trim() === '' ? NaN : Number(s));

/** Capture sketches: place a trial well, read K there, save the sketch; the saved ones listed with their figures. */
export function SketchPanel(props: Props) {
  const { siteId, canEdit, epsgCode, placing, onPlacingChange, trial, onTrialChange, fromSite, surface, sketches, hidden, onToggleHidden, wells, kUnit, displayUnits } = props;
  const queryClient = useQueryClient();
  const [typedX, setTypedX] = useState('');
  const [typedY, setTypedY] = useState('');
  const [name, setName] = useState('');
  const [rate, setRate] = useState('2');
  const [rateUnit, setRateUnit] = useState<(typeof RATE_UNITS)[number]>('L/s');
  const [thickness, setThickness] = useState('');
  const [gradientMode, setGradientMode] = useState<'typed' | 'wells'>('typed');
  const [magnitude, setMagnitude] = useState('0.005');
  const [direction, setDirection] = useState('90');
  const [gradientWells, setGradientWells] = useState<string[]>([]);
  const [error, setError] = useState<string | null>(null);
  const [listError, setListError] = useState<string | null>(null);

  const kAt = useQuery(kAtQueryOptions(siteId, trial ? surfaceQueryString(surface, { x: trial.x, y: trial.y }) : '', trial !== null));
  const k = kAt.data?.kMetersPerSecond ?? null;
  const b = thickness === '' ? (kAt.data?.suggestedThicknessM ?? NaN) : num(thickness);
  const t = k !== null && Number.isFinite(b) ? k * b : null;

  const save = useMutation({
    mutationFn: () => {
      if (!trial) throw new Error('Place the trial well first.');
      const gradient =
        gradientMode === 'typed' ? { mode: 'typed' as const, magnitude: num(magnitude), flowDirectionDeg: num(direction) } : { mode: 'wells' as const, wellIds: gradientWells };
      return createSketch(siteId, {
        name: name.trim() || `Trial well at ${grouped.format(trial.x)}, ${grouped.format(trial.y)}`,
        x: trial.x,
        y: trial.y,
        rate: { value: num(rate), unit: rateUnit },
        thicknessM: b,
        gradient,
        surface: surfaceBody(surface),
      });
    },
    onSuccess: () => {
      setError(null);
      setName('');
      onTrialChange(null);
      onPlacingChange(false);
      void queryClient.invalidateQueries({ queryKey: surfaceKeys.sketches(siteId) });
    },
    onError: (e) => setError(describeError(e)),
  });
  const remove = useMutation({
    mutationFn: (id: string) => deleteSketch(siteId, id),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: surfaceKeys.sketches(siteId) }),
    onError: (e) => setListError(describeError(e)),
  });

  const placeTyped = () => {
    const x = num(typedX);
    const y = num(typedY);
    if (!Number.isFinite(x) || !Number.isFinite(y) || !fromSite) return setError('Type x and y as numbers in the site’s system.');
    const [lon, lat] = fromSite(x, y);
    setError(null);
    onTrialChange({ lon, lat, x, y });
  };

  return (
    <div className="space-y-3 text-sm" data-testid="sketch-panel">
      {canEdit ? (
        <div className="space-y-2">
          <div className="flex flex-wrap items-center gap-2">
            <Button size="sm" variant={placing ? 'primary' : 'secondary'} aria-pressed={placing} onClick={() => onPlacingChange(!placing)}>
              {placing ? 'Click the map to place the well…' : 'Place a trial well on the map'}
            </Button>
          </div>
          <div className="flex items-end gap-1.5">
            <div className="min-w-0 flex-1">
              <label className={label} htmlFor="trial-x">
                x (EPSG:{epsgCode})
              </label>
              <input id="trial-x" className={input} inputMode="decimal" value={typedX} onChange={(e) => setTypedX(e.target.value)} />
            </div>
            <div className="min-w-0 flex-1">
              <label className={label} htmlFor="trial-y">
                y
              </label>
              <input id="trial-y" className={input} inputMode="decimal" value={typedY} onChange={(e) => setTypedY(e.target.value)} />
            </div>
            <Button size="sm" variant="secondary" onClick={placeTyped} disabled={!fromSite}>
              Place
            </Button>
          </div>
        </div>
      ) : null}

      {canEdit && trial ? (
        <form
          className="space-y-2 rounded-md bg-slate-50 p-2 ring-1 ring-slate-200"
          aria-label="New capture sketch"
          onSubmit={(e) => {
            e.preventDefault();
            save.mutate();
          }}
        >
          <p className="text-xs text-slate-700 tabular-nums" data-testid="trial-position">
            Trial well at x {grouped.format(trial.x)}, y {grouped.format(trial.y)}
          </p>
          <div aria-live="polite" className="text-xs" data-testid="trial-k">
            {kAt.isPending ? (
              <Spinner label="Reading K there…" />
            ) : kAt.error ? (
              <span className="text-red-700">{describeError(kAt.error)}</span>
            ) : (
              <>
                <p>
                  K there: <strong>{k !== null ? formatK(k, kUnit) : 'no estimate (outside the search radius)'}</strong> (from {kAt.data?.wellsUsed ?? 0} wells)
                </p>
                <ul className="mt-1 space-y-0.5 text-slate-600" aria-label="Nearest wells">
                  {kAt.data?.nearest.slice(0, 5).map((n) => (
                    <li key={n.wellId}>
                      {n.name}: {formatLength(n.distanceM, displayUnits, 'elevation')}, {n.kMetersPerSecond !== null ? formatK(n.kMetersPerSecond, kUnit) : 'no Well K'}
                    </li>
                  ))}
                </ul>
              </>
            )}
          </div>
          <div>
            <label className={label} htmlFor="sketch-name">
              Name
            </label>
            <input id="sketch-name" className={input} value={name} placeholder="e.g. Trial well A" onChange={(e) => setName(e.target.value)} />
          </div>
          <div className="grid grid-cols-2 gap-1.5">
            <div>
              <label className={label} htmlFor="sketch-rate">
                Pumping rate
              </label>
              <input id="sketch-rate" className={input} inputMode="decimal" value={rate} onChange={(e) => setRate(e.target.value)} />
            </div>
            <div>
              <label className={label} htmlFor="sketch-rate-unit">
                Rate unit
              </label>
              <select id="sketch-rate-unit" className={input} value={rateUnit} onChange={(e) => setRateUnit(e.target.value as (typeof RATE_UNITS)[number])}>
                {RATE_UNITS.map((u) => (
                  <option key={u} value={u}>
                    {RATE_LABEL[u]}
                  </option>
                ))}
              </select>
            </div>
            <div className="col-span-2">
              <label className={label} htmlFor="sketch-b">
                Saturated thickness b (m)
              </label>
              <input
                id="sketch-b"
                className={input}
                inputMode="decimal"
                placeholder={kAt.data?.suggestedThicknessM ? `${kAt.data.suggestedThicknessM.toFixed(2)} (from the nearest wells)` : 'metres'}
                value={thickness}
                onChange={(e) => setThickness(e.target.value)}
              />
            </div>
          </div>
          <p className="text-xs text-slate-700" data-testid="trial-t">
            T = K·b = {t !== null ? `${t.toExponential(2)} m²/s (${(t * 86_400).toPrecision(3)} m²/d)` : '—'}
          </p>
          <fieldset className="space-y-1.5">
            <legend className={label}>Hydraulic gradient</legend>
            <div className="flex gap-3 text-xs">
              <label className="flex items-center gap-1">
                <input type="radio" name="gradient-mode" checked={gradientMode === 'typed'} onChange={() => setGradientMode('typed')} /> Typed
              </label>
              <label className="flex items-center gap-1">
                <input type="radio" name="gradient-mode" checked={gradientMode === 'wells'} onChange={() => setGradientMode('wells')} /> From three or more wells
              </label>
            </div>
            {gradientMode === 'typed' ? (
              <div className="grid grid-cols-2 gap-1.5">
                <div>
                  <label className={label} htmlFor="sketch-gradient">
                    Magnitude (m/m)
                  </label>
                  <input id="sketch-gradient" className={input} inputMode="decimal" value={magnitude} onChange={(e) => setMagnitude(e.target.value)} />
                </div>
                <div>
                  <label className={label} htmlFor="sketch-direction">
                    Flow toward (° from north)
                  </label>
                  <input id="sketch-direction" className={input} inputMode="decimal" value={direction} onChange={(e) => setDirection(e.target.value)} />
                </div>
              </div>
            ) : (
              <ul className="max-h-32 space-y-0.5 overflow-auto text-xs" aria-label="Wells for the gradient">
                {wells.map((w) => (
                  <li key={w.id}>
                    <label className="flex items-center gap-1.5">
                      <input
                        type="checkbox"
                        checked={gradientWells.includes(w.id)}
                        onChange={(e) => setGradientWells((c) => (e.target.checked ? [...c, w.id] : c.filter((id) => id !== w.id)))}
                      />
                      {w.properties.name}
                    </label>
                  </li>
                ))}
              </ul>
            )}
          </fieldset>
          <div className="flex gap-1.5">
            <Button size="sm" type="submit" pending={save.isPending}>
              Save sketch
            </Button>
            <Button size="sm" variant="ghost" onClick={() => onTrialChange(null)}>
              Discard
            </Button>
          </div>
          {error ? (
            <p role="alert" className="text-xs text-red-700" data-testid="sketch-error">
              {error}
            </p>
          ) : null}
        </form>
      ) : canEdit && error ? (
        <p role="alert" className="text-xs text-red-700">
          {error}
        </p>
      ) : null}

      <div>
        <div className="flex items-center justify-between gap-2">
          <h3 className="text-xs font-semibold text-slate-700">Saved capture sketches</h3>
          <Button size="sm" variant="ghost" disabled={sketches.length === 0} onClick={() => void downloadUrl(sketchesGeojsonUrl(siteId), 'capture-sketches.geojson').catch((e) => setListError(describeError(e)))}>
            Export GeoJSON
          </Button>
        </div>
        {sketches.length === 0 ? <p className="text-xs text-slate-600">None yet.</p> : null}
        <ul className="mt-1 space-y-2" aria-label="Capture sketches">
          {sketches.map((s) => (
            <SketchItem key={s.id} sketch={s} shown={!hidden.has(s.id)} onToggle={() => onToggleHidden(s.id)} canEdit={canEdit} onDelete={() => remove.mutate(s.id)} kUnit={kUnit} displayUnits={displayUnits} />
          ))}
        </ul>
        {listError ? (
          <p role="alert" className="text-xs text-red-700">
            {listError}
          </p>
        ) : null}
      </div>
    </div>
  );
}

function SketchItem({
  sketch: s,
  shown,
  onToggle,
  canEdit,
  onDelete,
  kUnit,
  displayUnits,
}: {
  sketch: CaptureSketch;
  shown: boolean;
  onToggle: () => void;
  canEdit: boolean;
  onDelete: () => void;
  kUnit: KUnit;
  displayUnits: DisplayUnits;
}) {
  const r = s.results;
  const len = (m: number) => formatLength(m, displayUnits, 'elevation');
  return (
    <li className="rounded-md p-2 ring-1 ring-slate-200" data-sketch={s.name}>
      <div className="flex items-center justify-between gap-2">
        <label className="flex min-w-0 items-center gap-1.5 font-medium text-slate-900">
          <input type="checkbox" checked={shown} onChange={onToggle} aria-label={`Show ${s.name} on the map`} />
          <span className="truncate">{s.name}</span>
        </label>
        {canEdit ? (
          <ConfirmButton question={`Delete ${s.name}?`} confirmLabel="Delete" onConfirm={onDelete} aria-label={`Delete ${s.name}`}>
            Delete
          </ConfirmButton>
        ) : null}
      </div>
      <SketchNumbers
        results={r}
        kUnit={kUnit}
        displayUnits={displayUnits}
        rate={`${s.inputs.rate.value} ${RATE_LABEL[s.inputs.rate.unit]} (${(r.rateM3PerS * 1000).toPrecision(3)} L/s)`}
        drawdown={`${len(r.cooperJacob.drawdownM)} at ${len(s.inputs.drawdownRadiusM ?? 10)} after ${((s.inputs.drawdownTimeS ?? 86_400) / 3600).toPrecision(3)} h (Cooper-Jacob)`}
      />
      <p className={`mt-1 text-xs ${r.cooperJacob.valid ? 'text-slate-600' : 'text-amber-800'}`}>{r.cooperJacob.note}</p>
      <Cautions className="mt-2 rounded bg-amber-50 p-1.5 ring-1 ring-amber-200" />
    </li>
  );
}

/** A capture sketch's numbers: K, T, rate, gradient, stagnation point, capture width and (when given) drawdown. */
export function SketchNumbers({
  results: r,
  kUnit,
  displayUnits,
  rate,
  drawdown,
}: {
  results: CaptureSketch['results'];
  kUnit: KUnit;
  displayUnits: DisplayUnits;
  rate: string;
  drawdown?: string;
}) {
  const len = (m: number) => formatLength(m, displayUnits, 'elevation');
  return (
    <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-2 gap-y-0.5 text-xs tabular-nums" data-testid="sketch-results">
      <dt className="text-slate-600">K</dt>
      <dd>{formatK(r.kMetersPerSecond, kUnit)}</dd>
      <dt className="text-slate-600">T</dt>
      <dd>{r.transmissivityM2PerS.toExponential(2)} m²/s</dd>
      <dt className="text-slate-600">Rate</dt>
      <dd>{rate}</dd>
      <dt className="text-slate-600">Gradient</dt>
      <dd>
        {r.gradient.toPrecision(3)} toward {Math.round(r.flowDirectionDeg)}°
      </dd>
      <dt className="text-slate-600">Stagnation point</dt>
      <dd>{len(r.stagnationPointM)} downgradient</dd>
      <dt className="text-slate-600">Capture width</dt>
      <dd>
        {len(r.captureWidthAtWellM)} at the well, {len(r.captureWidthFarM)} far upgradient
      </dd>
      {drawdown ? (
        <>
          <dt className="text-slate-600">Drawdown</dt>
          <dd>{drawdown}</dd>
        </>
      ) : null}
    </dl>
  );
}
