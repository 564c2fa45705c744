import { useId } from 'react';
import { flagAction, flagStanding, type FitChoices, type FlagAction, type FlagStanding } from '@shared/hydraulics/flag-answers';
import type { QcFlag } from '@shared/hydraulics/flags';
import type { Fit } from '@shared/schemas/fits';
import { Button } from '@/components/ui/button';
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
    'Move the window into the recommended range, or say why this window suits the record better.',
  'shape-factor-validity': 'Nothing to change: K comes from the full form; the simplified form is shown for comparison.',
  'too-few-readings': 'Widen the window.',
};

/** Flags by name, where a code is shown in words (the audit trail). */
export const FLAG_NAMES: Record<string, string> = {
  'concave-upward': 'double straight line',
  'window-outside-recommended': 'window outside the recommended range',
  'h0-mismatch': 'H0 mismatch',
  'intake-screen-in-filter-pack': 'screen radius in a filter-packed well',
};

/** How a flag stands against the fit, and what may be done about it here. */
export interface FlagAnswering {
  choices: FitChoices;
  reasons: Readonly<Record<string, string>>;
  /** Null: the reasons are shown, not edited (a Checker, or a fit awaiting check). */
  onReasonChange: ((code: string, reason: string) => void) | null;
  /** Null: the action is described, not offered (unsaved changes, or not the preparer). */
  onApply: ((code: string, action: FlagAction) => void) | null;
  applyingCode: string | null;
  /** Why the action is not offered, when it is not. */
  applyBlockedReason?: string;
  /** Field errors of the last submit, by `reasons.<code>`. */
  errors?: Readonly<Record<string, string>>;
  resolved: readonly Fit['resolvedFlags'][number][];
}

const STANDING_TEXT: Record<FlagStanding, string> = {
  open: 'Changes K — apply the suggested action or give a reason before submitting',
  resolved: 'Resolved by this fit',
  reasoned: 'Kept, with the analyst’s reason',
  note: 'Note about the record',
  warning: '',
};

export function QcFlagList({ flags, answering = null }: { flags: readonly QcFlag[]; answering?: FlagAnswering | null }) {
  const stillResolved = answering ? answering.resolved.filter((r) => !flags.some((f) => f.code === r.code)) : [];
  if (flags.length === 0 && stillResolved.length === 0) {
    return <p className="text-sm text-slate-600">No QC flags: the fit passes every check Kfield makes.</p>;
  }
  const order = { error: 0, warning: 1, info: 2 };
  const standingOf = (flag: QcFlag): FlagStanding | null => (answering ? flagStanding(flag, answering.choices, answering.reasons) : null);
  const rank = (flag: QcFlag) => {
    const st = standingOf(flag);
    return st === 'open' ? -1 : st === 'resolved' || st === 'note' ? 3 : order[flag.severity];
  };
  const sorted = [...flags].sort((a, b) => rank(a) - rank(b));
  return (
    <ul className="space-y-2" aria-label="QC flags">
      {sorted.map((flag) => {
        const standing = standingOf(flag);
        const quiet = standing === 'resolved' || standing === 'note';
        const s = quiet ? SEVERITY.info : SEVERITY[flag.severity];
        const action = answering && standing === 'open' ? flagAction(flag, answering.choices.method) : null;
        const error = answering?.errors?.[`reasons.${flag.code}`];
        const resolvedBy = standing === 'resolved' ? answering?.resolved.find((r) => r.code === flag.code) : undefined;
        return (
          <li key={flag.code} className={cn('rounded-md border px-3 py-2 text-sm', s.tone, standing === 'open' && 'ring-2 ring-amber-400')} data-flag={flag.code} data-standing={standing ?? undefined}>
            {standing && STANDING_TEXT[standing] ? <p className="mb-1 pl-5 text-xs font-semibold tracking-wide uppercase opacity-80">{STANDING_TEXT[standing]}</p> : null}
            <p className="flex gap-2">
              <span aria-hidden="true" className={cn('shrink-0 text-xs leading-5', s.iconTone)}>
                {s.icon}
              </span>
              <span>
                <span className="sr-only">{standing === 'resolved' ? 'Resolved' : standing === 'note' ? 'Note' : s.label}: </span>
                {flag.message}
              </span>
            </p>
            {standing === 'resolved' ? (
              <p className="mt-1 pl-5">{resolvedBy ? `${resolvedBy.action} — applied by ${resolvedBy.by.name}.` : 'The fit’s line and window answer it.'}</p>
            ) : (flag.suggestion ?? DEFAULT_SUGGESTIONS[flag.code]) ? (
              <p className="mt-1 pl-5 font-medium">{flag.suggestion ?? DEFAULT_SUGGESTIONS[flag.code]}</p>
            ) : null}
            {answering && (standing === 'open' || standing === 'reasoned') ? (
              <FlagAnswer flag={flag} action={action} answering={answering} error={error} />
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
      {stillResolved.map((r) => (
        <li key={`resolved-${r.code}`} className={cn('rounded-md border px-3 py-2 text-sm', SEVERITY.info.tone)} data-flag={r.code} data-standing="resolved">
          <p className="mb-1 text-xs font-semibold tracking-wide uppercase opacity-80">Resolved</p>
          <p>
            <span className="line-through decoration-slate-400">{r.message}</span>
          </p>
          <p className="mt-1">
            {r.action} — applied by {r.by.name}.
          </p>
        </li>
      ))}
    </ul>
  );
}

function FlagAnswer({ flag, action, answering, error }: { flag: QcFlag; action: FlagAction | null; answering: FlagAnswering; error?: string }) {
  const reasonId = useId();
  const reason = answering.reasons[flag.code] ?? '';
  return (
    <div className="mt-2 space-y-2 pl-5">
      {action ? (
        answering.onApply ? (
          <Button size="sm" variant="secondary" className="h-auto max-w-full py-1 text-left whitespace-normal" pending={answering.applyingCode === flag.code} disabled={answering.applyingCode !== null} onClick={() => answering.onApply?.(flag.code, action)}>
            {action.label}
          </Button>
        ) : (
          <p className="text-xs">
            Suggested: {action.label.charAt(0).toLowerCase() + action.label.slice(1)}
            {answering.applyBlockedReason ? ` (${answering.applyBlockedReason})` : ''}.
          </p>
        )
      ) : null}
      {answering.onReasonChange ? (
        <div>
          <label htmlFor={reasonId} className="block text-xs font-medium">
            {action ? 'Or keep this fit, and say why for the Checker' : 'Say why this fit stands, for the Checker'}
          </label>
          <textarea
            id={reasonId}
            rows={2}
            maxLength={2000}
            value={reason}
            onChange={(e) => answering.onReasonChange?.(flag.code, e.target.value)}
            aria-invalid={error ? true : undefined}
            className="mt-1 block w-full rounded-md border border-slate-300 bg-white px-2 py-1 text-sm text-slate-900"
          />
          {error ? <p className="mt-1 text-xs font-medium text-red-700">{error}</p> : null}
        </div>
      ) : reason ? (
        <p className="text-xs">
          <span className="font-semibold">Analyst’s reason:</span> {reason}
        </p>
      ) : null}
    </div>
  );
}
