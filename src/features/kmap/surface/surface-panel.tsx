import { useState } from 'react';
import type { DisplayUnits } from '@shared/schemas/sites';
import type { Outline } from '@shared/schemas/ksurface';
import { kFromSi, kToSi, type KUnit } from '@shared/units/conductivity';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { Cautions } from '@/features/fits/components/cautions';
import { formatK } from '../format';
import { formatArea, type SurfaceStats, type ZoneProperties } from './model';
import type { SurfaceState } from './use-surface';

export interface SurfaceSettings {
  show: boolean;
  outlineId: string | null;
  power: number;
  /** null: every well. */
  neighbours: number | null;
  searchRadiusM: number | null;
  /** null: about 200 cells across. */
  cellSizeM: number | null;
  opacity: number;
  /** High-permeability zones: cells above this K (log10 m/s); null: none drawn. */
  thresholdLog10: number | null;
}

export const DEFAULT_SURFACE: SurfaceSettings = {
  show: false,
  outlineId: null,
  power: 2,
  neighbours: null,
  searchRadiusM: null,
  cellSizeM: null,
  opacity: 0.75,
  thresholdLog10: null,
};

/** Fewer wells than this and the surface is refused; fewer than WARN_BELOW and it says how thin it is. */
export const MIN_WELLS = 2;
export const WARN_BELOW = 5;

const input =
  'block h-8 w-full rounded-md border-0 bg-white px-2 text-sm text-slate-900 ring-1 ring-slate-300 ring-inset focus-visible:outline-2 focus-visible:outline-accent-600';
const label = 'block text-xs font-medium text-slate-700';

function optionalNumber(text: string): number | null | 'bad' {
  if (text.trim() === '') return null;
  const v = Number(text);
  return Number.isFinite(v) && v > 0 ? v : 'bad';
}

interface Props {
  settings: SurfaceSettings;
  onChange: (s: SurfaceSettings) => void;
  outlines: Outline[];
  state: SurfaceState;
  wellsUsed: number;
  stats: SurfaceStats | null;
  zones: { features: { properties: ZoneProperties }[] } | null;
  onExportZones: () => void;
  kUnit: KUnit;
  displayUnits: DisplayUnits;
  gridLabel: string | null;
  /** The figure from a change of the settings to the surface painted, ms. */
  renderMs: number | null;
}

/** The K surface's settings and what it shows: wells used, geometric mean, high-K zones. */
export function SurfacePanel(props: Props) {
  const { settings, onChange, outlines, state, wellsUsed, stats, zones, onExportZones, kUnit, displayUnits, gridLabel, renderMs } = props;
  const set = (patch: Partial<SurfaceSettings>) => onChange({ ...settings, ...patch });
  const [radiusText, setRadiusText] = useState(settings.searchRadiusM?.toString() ?? '');
  const [cellText, setCellText] = useState(settings.cellSizeM?.toString() ?? '');
  // The panel's fields start from the settings: a collapsed panel unmounts them.
  const [thresholdText, setThresholdText] = useState(settings.thresholdLog10 === null ? '' : Number(kFromSi(10 ** settings.thresholdLog10, kUnit).toPrecision(3)).toString());
  const [powerText, setPowerText] = useState(String(settings.power));
  // The suggested power (cross-validation) changes the setting from outside: the field follows.
  const [seenPower, setSeenPower] = useState(settings.power);
  if (seenPower !== settings.power) {
    setSeenPower(settings.power);
    if (Number(powerText) !== settings.power) setPowerText(String(settings.power));
  }

  const radius = optionalNumber(radiusText);
  const cell = optionalNumber(cellText);
  const threshold = thresholdText.trim() === '' ? null : Number(thresholdText);
  const thresholdBad = threshold !== null && !(Number.isFinite(threshold) && threshold > 0);
  const running = state.status === 'running';
  const zoneArea = zones ? zones.features.reduce((s, f) => s + f.properties.areaM2, 0) : 0;
  const zoneProps = zones?.features[0]?.properties;

  return (
    <div
      className="space-y-3 text-sm"
      data-testid="surface-panel"
      data-surface-state={settings.show ? state.status : 'off'}
      data-surface-power={state.status === 'ready' ? state.result.power : ''}
      data-surface-compute-ms={state.status === 'ready' ? state.result.computeMs.toFixed(1) : ''}
      data-surface-render-ms={renderMs !== null ? renderMs.toFixed(1) : ''}
      data-surface-cells={state.status === 'ready' ? `${state.result.grid.cols}x${state.result.grid.rows}` : ''}
    >
      <label className="flex items-center gap-2 font-medium text-slate-800">
        <input type="checkbox" className="size-4 accent-accent-700" checked={settings.show} onChange={(e) => set({ show: e.target.checked })} />
        Show the K surface (IDW of log10 K)
      </label>

      <div>
        <label className={label} htmlFor="surface-outline">
          Clip to outline
        </label>
        <select id="surface-outline" className={input} value={settings.outlineId ?? ''} onChange={(e) => set({ outlineId: e.target.value || null })}>
          <option value="">None (the wells’ extent)</option>
          {outlines.map((o) => (
            <option key={o.id} value={o.id}>
              {o.name}
            </option>
          ))}
        </select>
      </div>

      <div className="grid grid-cols-2 gap-2">
        <div>
          <label className={label} htmlFor="surface-power">
            Power
          </label>
          <input
            id="surface-power"
            className={input}
            type="number"
            inputMode="decimal"
            min={0.5}
            max={6}
            // Steps through the powers cross-validation compares; any other value can still be typed.
            step={0.5}
            value={powerText}
            onChange={(e) => {
              setPowerText(e.target.value);
              const v = Number(e.target.value);
              if (e.target.value !== '' && Number.isFinite(v) && v >= 0.5 && v <= 6) set({ power: v });
            }}
          />
        </div>
        <div>
          <label className={label} htmlFor="surface-neighbours">
            Neighbours
          </label>
          <div className="flex gap-1">
            <select
              id="surface-neighbours"
              className={input}
              value={settings.neighbours === null ? 'all' : 'nearest'}
              onChange={(e) => set({ neighbours: e.target.value === 'all' ? null : Math.min(8, Math.max(1, wellsUsed)) })}
            >
              <option value="all">All wells</option>
              <option value="nearest">Nearest</option>
            </select>
            {settings.neighbours !== null ? (
              <input
                aria-label="Number of nearest wells"
                className={`${input} w-14`}
                type="number"
                min={1}
                step={1}
                value={settings.neighbours}
                onChange={(e) => {
                  const v = Math.round(Number(e.target.value));
                  if (v >= 1) set({ neighbours: v });
                }}
              />
            ) : null}
          </div>
        </div>
        <div>
          <label className={label} htmlFor="surface-radius">
            Search radius (m)
          </label>
          <input
            id="surface-radius"
            className={input}
            inputMode="decimal"
            placeholder="none"
            value={radiusText}
            aria-invalid={radius === 'bad' || undefined}
            onChange={(e) => {
              setRadiusText(e.target.value);
              const v = optionalNumber(e.target.value);
              if (v !== 'bad') set({ searchRadiusM: v });
            }}
          />
        </div>
        <div>
          <label className={label} htmlFor="surface-cell">
            Cell size (m)
          </label>
          <input
            id="surface-cell"
            className={input}
            inputMode="decimal"
            placeholder="auto"
            value={cellText}
            aria-invalid={cell === 'bad' || undefined}
            onChange={(e) => {
              setCellText(e.target.value);
              const v = optionalNumber(e.target.value);
              if (v !== 'bad') set({ cellSizeM: v });
            }}
          />
        </div>
      </div>
      {radius === 'bad' || cell === 'bad' ? <p className="text-xs text-red-700">Search radius and cell size must be numbers greater than 0 (or blank).</p> : null}

      <div>
        <label className={label} htmlFor="surface-opacity">
          Opacity: {Math.round(settings.opacity * 100)} %
        </label>
        <input
          id="surface-opacity"
          type="range"
          min={10}
          max={100}
          step={5}
          className="w-full accent-accent-700"
          value={Math.round(settings.opacity * 100)}
          onChange={(e) => set({ opacity: Number(e.target.value) / 100 })}
        />
      </div>

      <p className="text-xs text-slate-700" data-testid="surface-wells-used">
        Uses {wellsUsed} {wellsUsed === 1 ? 'well' : 'wells'} with a Well K (the map’s filters apply).
      </p>
      {settings.show && wellsUsed < MIN_WELLS ? (
        <Alert tone="error">A K surface needs at least {MIN_WELLS} wells with a Well K; the wells shown have {wellsUsed}.</Alert>
      ) : settings.show && wellsUsed < WARN_BELOW ? (
        <Alert tone="warning">Only {wellsUsed} wells feed this surface: between them it is little more than a guess.</Alert>
      ) : null}

      {settings.show ? (
        <div aria-live="polite" className="min-h-5 text-xs text-slate-700">
          {running ? (
            <Spinner label="Computing the K surface…" />
          ) : state.status === 'error' ? (
            <span className="text-red-700">{state.message}</span>
          ) : state.status === 'ready' ? (
            <span data-testid="surface-summary">
              {state.result.grid.cols} × {state.result.grid.rows} cells of {Number(state.result.grid.cellSizeM.toPrecision(3))} m
              {gridLabel ? ` in ${gridLabel}` : ''}; computed in {Math.round(state.result.computeMs)} ms.
              {stats?.geometricMeanK ? ` Geometric mean K ${settings.outlineId ? 'inside the outline' : 'over the surface'}: ${formatK(stats.geometricMeanK, kUnit)}.` : ''}
            </span>
          ) : null}
        </div>
      ) : null}

      <fieldset className="space-y-1.5 rounded-md bg-slate-50 p-2 ring-1 ring-slate-200">
        <legend className="px-1 text-xs font-semibold text-slate-700">High-permeability zones</legend>
        <label className={label} htmlFor="surface-threshold">
          Outline cells with K above ({kUnit})
        </label>
        <div className="flex gap-1.5">
          <input
            id="surface-threshold"
            className={input}
            inputMode="decimal"
            placeholder="e.g. 1e-4"
            value={thresholdText}
            aria-invalid={thresholdBad || undefined}
            onChange={(e) => {
              setThresholdText(e.target.value);
              const v = e.target.value.trim() === '' ? null : Number(e.target.value);
              if (v === null) set({ thresholdLog10: null });
              else if (Number.isFinite(v) && v > 0) set({ thresholdLog10: Math.log10(kToSi(v, kUnit)) });
            }}
          />
          <Button variant="secondary" size="sm" disabled={!zones || zones.features.length === 0} onClick={onExportZones}>
            Export GeoJSON
          </Button>
        </div>
        {thresholdBad ? <p className="text-xs text-red-700">Write K as a number greater than 0, such as 1e-4.</p> : null}
        {settings.thresholdLog10 !== null && zones ? (
          <p className="text-xs text-slate-700" data-testid="zones-summary">
            {zones.features.length === 0
              ? `No cell is above ${formatK(10 ** settings.thresholdLog10, kUnit)}.`
              : `${zoneProps?.cells ?? 0} cells above ${formatK(10 ** settings.thresholdLog10, kUnit)}: ${formatArea(zoneArea, displayUnits)}, geometric mean K ${zoneProps?.geometricMeanK ? formatK(zoneProps.geometricMeanK, kUnit) : '—'}.`}
          </p>
        ) : null}
        {stats && stats.cells > 0 ? (
          <p className="text-xs text-slate-500">
            The surface runs from {formatK(10 ** stats.minLog10, kUnit)} to {formatK(10 ** stats.maxLog10, kUnit)}.
          </p>
        ) : null}
      </fieldset>

      <Cautions className="rounded-md bg-amber-50 p-2 ring-1 ring-amber-200" />
    </div>
  );
}
