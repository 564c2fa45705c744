import { useId, useState } from 'react';
import { RECOMMENDED_HEAD_RANGES, type FitMethod, type FitWindow } from '@shared/hydraulics/fitting';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field';
import { cn } from '@/lib/cn';
import { parseNumber } from '../geometry-form';
import { secondsPer, type PlotTimeUnit } from '../plot-math';

/** A number input that commits every valid value at once and keeps what is typed while focused. */
function CommitNumber({
  label,
  value,
  onCommit,
  readOnly,
  invalid,
}: {
  label: string;
  value: number | null;
  onCommit: (n: number) => void;
  readOnly: boolean;
  invalid?: boolean;
}) {
  const id = useId();
  const [editing, setEditing] = useState<string | null>(null);
  const shown = editing ?? (value === null ? '' : String(Number(value.toPrecision(5))));
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-slate-800">
        {label}
      </label>
      <input
        id={id}
        className={cn(
          'block w-full rounded-md border-0 bg-white px-3 py-2 text-sm text-slate-900 shadow-sm ring-1 ring-slate-300 ring-inset',
          'read-only:bg-slate-50 read-only:text-slate-600 aria-[invalid=true]:ring-red-400',
        )}
        inputMode="decimal"
        autoComplete="off"
        value={shown}
        readOnly={readOnly}
        aria-invalid={invalid || (editing !== null && typeof parseNumber(editing) !== 'number') || undefined}
        onFocus={() => setEditing(shown)}
        onBlur={() => setEditing(null)}
        onChange={(e) => {
          setEditing(e.target.value);
          const n = parseNumber(e.target.value);
          if (typeof n === 'number') onCommit(n);
        }}
      />
    </div>
  );
}

export interface ResolvedWindowView {
  fromSeconds: number;
  toSeconds: number;
  headMax: number;
  headMin: number;
}

export function WindowFields({
  window,
  resolved,
  method,
  timeUnit,
  onChange,
  readOnly,
  error,
}: {
  window: FitWindow | null;
  resolved: ResolvedWindowView | null;
  method: FitMethod;
  timeUnit: PlotTimeUnit;
  onChange: (window: FitWindow | null) => void;
  readOnly: boolean;
  error?: string;
}) {
  const [preferred, setPreferred] = useState<'time' | 'head'>('head');
  const mode = window?.kind ?? preferred;
  const per = secondsPer(timeUnit);
  const recommended = RECOMMENDED_HEAD_RANGES[method];

  const timeRange = window?.kind === 'time' ? window : resolved ? { fromSeconds: resolved.fromSeconds, toSeconds: resolved.toSeconds } : null;
  const headRange = window?.kind === 'head' ? window : window === null ? recommended : resolved ? { upper: resolved.headMax, lower: resolved.headMin * 0.999 } : null;

  const switchTo = (kind: 'time' | 'head') => {
    setPreferred(kind);
    if (!window || window.kind === kind) return;
    if (kind === 'time' && timeRange) onChange({ kind: 'time', ...timeRange });
    if (kind === 'head' && headRange) onChange({ kind: 'head', upper: headRange.upper, lower: headRange.lower });
  };

  return (
    <fieldset className="space-y-3">
      <legend className="text-sm font-medium text-slate-800">Fitting window</legend>
      <div role="radiogroup" aria-label="Window entered as" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {(['time', 'head'] as const).map((kind) => (
          <label key={kind} className="flex items-center gap-2">
            <input type="radio" name="window-kind" checked={mode === kind} onChange={() => switchTo(kind)} disabled={readOnly} className="accent-accent-700" />
            {kind === 'time' ? 'By time' : 'By normalized head'}
          </label>
        ))}
      </div>
      {mode === 'time' ? (
        <div className="grid grid-cols-2 gap-3">
          <CommitNumber
            label={`From (${timeUnit})`}
            value={timeRange ? timeRange.fromSeconds / per : null}
            readOnly={readOnly}
            invalid={Boolean(error)}
            onCommit={(n) => onChange({ kind: 'time', fromSeconds: n * per, toSeconds: timeRange?.toSeconds ?? n * per })}
          />
          <CommitNumber
            label={`To (${timeUnit})`}
            value={timeRange ? timeRange.toSeconds / per : null}
            readOnly={readOnly}
            invalid={Boolean(error)}
            onCommit={(n) => onChange({ kind: 'time', fromSeconds: timeRange?.fromSeconds ?? 0, toSeconds: n * per })}
          />
        </div>
      ) : (
        <div className="grid grid-cols-2 gap-3">
          <CommitNumber
            label="Upper H/H0"
            value={headRange?.upper ?? null}
            readOnly={readOnly}
            invalid={Boolean(error)}
            onCommit={(n) => onChange({ kind: 'head', upper: n, lower: headRange?.lower ?? recommended.lower })}
          />
          <CommitNumber
            label="Lower H/H0"
            value={headRange?.lower ?? null}
            readOnly={readOnly}
            invalid={Boolean(error)}
            onCommit={(n) => onChange({ kind: 'head', upper: headRange?.upper ?? recommended.upper, lower: n })}
          />
        </div>
      )}
      <FieldError message={error} />
      <div className="flex flex-wrap items-center gap-2 text-xs text-slate-600">
        <span>
          {window === null
            ? `Default: the recommended range H/H0 ${recommended.upper}–${recommended.lower} (all readings 0.05 < H/H0 ≤ 1 when it holds fewer than 3).`
            : 'Entered window.'}
        </span>
        {window !== null && !readOnly ? (
          <Button variant="ghost" size="sm" onClick={() => onChange(null)}>
            Use the recommended range
          </Button>
        ) : null}
      </div>
    </fieldset>
  );
}
