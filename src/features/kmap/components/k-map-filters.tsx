import { useEffect, useId, useRef, useState } from 'react';
import type { DisplayUnits } from '@shared/schemas/sites';
import { displayLengthUnit } from '@shared/schemas/wells';
import { lengthFromSi, lengthToSi } from '@shared/units/length';
import { Button } from '@/components/ui/button';
import { useDebouncedValue } from '@/lib/use-debounced-value';
import { NO_UNIT, type KMapFilter } from '../model';

interface Props {
  filter: KMapFilter;
  onChange: (filter: KMapFilter) => void;
  /** The units present among the site's wells (NO_UNIT for wells without one). */
  units: string[];
  displayUnits: DisplayUnits;
  shown: number;
  total: number;
}

const toText = (m: number | null, unit: 'm' | 'ft') => (m === null ? '' : String(Number(lengthFromSi(m, unit).toFixed(2))));

/** Filters by hydrostratigraphic unit and screen elevation; map, legend and histogram follow them. */
export function KMapFilters({ filter, onChange, units, displayUnits, shown, total }: Props) {
  const id = useId();
  const lengthUnit = displayLengthUnit(displayUnits, 'elevation') as 'm' | 'ft';
  const [minText, setMinText] = useState(() => toText(filter.elevationMinM, lengthUnit));
  const [maxText, setMaxText] = useState(() => toText(filter.elevationMaxM, lengthUnit));
  const min = useDebouncedValue(minText, 300);
  const max = useDebouncedValue(maxText, 300);

  const parse = (text: string) => {
    const t = text.trim().replace(',', '.');
    if (t === '') return null;
    const v = Number(t);
    return Number.isFinite(v) ? lengthToSi(v, lengthUnit) : undefined;
  };
  const minM = parse(min);
  const maxM = parse(max);

  // The typed range reaches the filter once typing pauses; the latest filter is read, not watched.
  const latest = useRef({ filter, onChange });
  latest.current = { filter, onChange };
  useEffect(() => {
    const { filter: f, onChange: change } = latest.current;
    if (minM === undefined || maxM === undefined) return;
    if (minM !== f.elevationMinM || maxM !== f.elevationMaxM) change({ ...f, elevationMinM: minM, elevationMaxM: maxM });
  }, [minM, maxM]);

  const chosen = filter.units ?? units;
  const toggle = (u: string) => {
    const next = chosen.includes(u) ? chosen.filter((x) => x !== u) : [...chosen, u];
    onChange({ ...filter, units: next.length === units.length && units.every((x) => next.includes(x)) ? null : next });
  };
  const badRange = minM !== undefined && maxM !== undefined && minM !== null && maxM !== null && minM > maxM;

  return (
    <div className="space-y-3" data-testid="kmap-filters">
      <fieldset>
        <legend className="text-sm font-medium text-slate-800">Hydrostratigraphic unit</legend>
        <div className="mt-1.5 flex flex-wrap gap-x-4 gap-y-1.5">
          {units.map((u) => (
            <label key={u || 'none'} className="flex items-center gap-2 text-sm text-slate-800">
              <input type="checkbox" className="size-4 rounded border-slate-300 accent-accent-700" checked={chosen.includes(u)} onChange={() => toggle(u)} />
              {u === NO_UNIT ? <span className="text-slate-600 italic">No unit given</span> : u}
            </label>
          ))}
        </div>
      </fieldset>
      <fieldset>
        <legend className="text-sm font-medium text-slate-800">Screen elevation ({lengthUnit})</legend>
        <p className="text-xs text-slate-500">Wells whose screen reaches into the range.</p>
        <div className="mt-1.5 flex flex-wrap items-center gap-2">
          <label htmlFor={`${id}-min`} className="text-sm text-slate-700">
            <span className="sr-only">Screen elevation </span>from
          </label>
          <input
            id={`${id}-min`}
            inputMode="decimal"
            className="h-8 w-24 rounded-md border-0 px-2 text-sm ring-1 ring-slate-300 ring-inset aria-[invalid=true]:ring-red-400"
            value={minText}
            aria-invalid={minM === undefined || badRange ? true : undefined}
            onChange={(e) => setMinText(e.target.value)}
          />
          <label htmlFor={`${id}-max`} className="text-sm text-slate-700">
            <span className="sr-only">Screen elevation </span>to
          </label>
          <input
            id={`${id}-max`}
            inputMode="decimal"
            className="h-8 w-24 rounded-md border-0 px-2 text-sm ring-1 ring-slate-300 ring-inset aria-[invalid=true]:ring-red-400"
            value={maxText}
            aria-invalid={maxM === undefined || badRange ? true : undefined}
            onChange={(e) => setMaxText(e.target.value)}
          />
          {minText || maxText ? (
            <Button
              variant="ghost"
              size="sm"
              onClick={() => {
                setMinText('');
                setMaxText('');
              }}
            >
              Clear
            </Button>
          ) : null}
        </div>
        {minM === undefined || maxM === undefined ? <p className="mt-1 text-xs text-red-700">Enter a number.</p> : null}
        {badRange ? <p className="mt-1 text-xs text-red-700">The first elevation is above the second: no screen can reach both.</p> : null}
      </fieldset>
      <p className="text-xs text-slate-600" aria-live="polite">
        Showing {shown.toLocaleString('en')} of {total.toLocaleString('en')} {total === 1 ? 'well' : 'wells'}.
      </p>
    </div>
  );
}
