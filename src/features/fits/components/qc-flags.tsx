import type { QcFlag } from '@shared/hydraulics/flags';
import { cn } from '@/lib/cn';
import { formatQuantity } from '../format';

const SEVERITY = {
  error: { label: 'Error', icon: '■', tone: 'border-red-300 bg-red-50 text-red-900', iconTone: 'text-red-700' },
  warning: { label: 'Warning', icon: '▲', tone: 'border-amber-300 bg-amber-50 text-amber-950', iconTone: 'text-amber-700' },
  info: { label: 'Note', icon: '●', tone: 'border-slate-200 bg-slate-50 text-slate-800', iconTone: 'text-slate-500' },
} as const;

const SUFFIXES: readonly [string, string][] = [
  ['MetersPerSecond', 'm/s'],
  ['PerSecond', '1/s'],
  ['Seconds', 's'],
  ['Percent', '%'],
  ['M3', 'm³'],
  ['M', 'm'],
];
const SPECIAL: Record<string, string> = { rSquared: 'r²', mLOverD: 'mL/D' };

/** A value's key as words with its unit: "measuredH0M" → "measured H0 (m)". */
export function describeValueName(key: string): string {
  if (SPECIAL[key]) return SPECIAL[key];
  let base = key;
  let unit = '';
  for (const [suffix, u] of SUFFIXES) {
    if (base.length > suffix.length && base.endsWith(suffix)) {
      base = base.slice(0, -suffix.length);
      unit = u;
      break;
    }
  }
  const words = base
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .split(' ')
    .map((w) => (/^H0$/.test(w) ? w : w.toLowerCase()))
    .join(' ');
  return unit ? `${words} (${unit})` : words;
}

function describeValues(values: QcFlag['values']): string[] {
  return Object.entries(values).map(([key, value]) => {
    const shown = typeof value === 'number' ? formatQuantity(value, 3) : value === null ? '—' : String(value);
    return `${describeValueName(key)} = ${shown}`;
  });
}

/** What to do about a flag whose engine message names no action. */
const DEFAULT_SUGGESTIONS: Partial<Record<string, string>> = {
  'window-outside-recommended':
    'Move the window into the recommended range, or say in the note why this window suits the record better.',
  'shape-factor-validity': 'Nothing to change: K comes from the full form; the simplified form is shown for comparison.',
  'too-few-readings': 'Widen the window.',
};

export function QcFlagList({ flags }: { flags: readonly QcFlag[] }) {
  if (flags.length === 0) {
    return <p className="text-sm text-slate-600">No QC flags: the fit passes every check Kfield makes.</p>;
  }
  const order = { error: 0, warning: 1, info: 2 };
  const sorted = [...flags].sort((a, b) => order[a.severity] - order[b.severity]);
  return (
    <ul className="space-y-2" aria-label="QC flags">
      {sorted.map((flag) => {
        const s = SEVERITY[flag.severity];
        return (
          <li key={flag.code} className={cn('rounded-md border px-3 py-2 text-sm', s.tone)} data-flag={flag.code}>
            <p className="flex gap-2">
              <span aria-hidden="true" className={cn('shrink-0 text-xs leading-5', s.iconTone)}>
                {s.icon}
              </span>
              <span>
                <span className="sr-only">{s.label}: </span>
                {flag.message}
              </span>
            </p>
            {(flag.suggestion ?? DEFAULT_SUGGESTIONS[flag.code]) ? (
              <p className="mt-1 pl-5 font-medium">{flag.suggestion ?? DEFAULT_SUGGESTIONS[flag.code]}</p>
            ) : null}
            <details className="mt-1 pl-5 text-xs opacity-80">
              <summary className="cursor-pointer">The numbers</summary>
              <ul className="mt-1 space-y-0.5 font-mono">
                {describeValues(flag.values).map((v) => (
                  <li key={v}>{v}</li>
                ))}
              </ul>
              {flag.reference ? <p className="mt-1 italic">{flag.reference}</p> : null}
            </details>
          </li>
        );
      })}
    </ul>
  );
}
