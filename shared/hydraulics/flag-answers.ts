import { RECOMMENDED_HEAD_RANGES, type FitMethod } from './fitting';
import { LATE_SEGMENT } from './qc';

/*
 * Which QC flags must be answered before a fit goes to its Checker, and how. A flag that says the
 * line or K is wrong (a double straight line, a window outside the recommended range, the screen
 * radius in a filter-packed well, an H0 that the slug cannot have made) blocks submission until the
 * analyst applies its suggested action (one click) or writes a reason. A flag about the record
 * itself rather than the fit's choices is a note. The same rules run in the workspace and on submit.
 */

/** Flags whose K is wrong unless the analyst acts. */
export const K_CHANGING_CODES: ReadonlySet<string> = new Set(['concave-upward', 'window-outside-recommended', 'h0-mismatch', 'intake-screen-in-filter-pack']);
/** Flags that describe the record (its shape, its repeats), not the choices of this fit. */
export const RECORD_NOTE_CODES: ReadonlySet<string> = new Set(['oscillation', 'drift-after-recovery', 'repeat-tests-disagree']);

export type FlagKind = 'changes-k' | 'record-note' | 'warning';
export function flagKind(code: string): FlagKind {
  return K_CHANGING_CODES.has(code) ? 'changes-k' : RECORD_NOTE_CODES.has(code) ? 'record-note' : 'warning';
}

/** The part of a fit these rules read. */
export interface FitChoices {
  method: FitMethod;
  /** Default 'line'. A high-K fit has no window or line to change. */
  model?: 'line' | 'high-k';
  line: 'anchored' | 'free';
  /** The head range the window actually spans (from the result). */
  window: { headMax: number; headMin: number };
}

/** A change to the fit that answers a flag: the same fields as a fit patch. */
export interface FlagActionPatch {
  line?: 'anchored' | 'free';
  window?: { kind: 'head'; upper: number; lower: number } | null;
  geometry?: { intake: 'borehole' };
}
export interface FlagAction {
  /** What the button says: "Fit a free line over H/H0 0.25–0.15". */
  label: string;
  patch: FlagActionPatch;
}

const range = (r: { upper: number; lower: number }) => `H/H0 ${r.upper}–${r.lower}`;

/** Flags about the straight line and its window: they never apply to a high-K fit. */
export const LINE_ONLY_CODES: ReadonlySet<string> = new Set(['concave-upward', 'window-outside-recommended', 'low-r-squared', 'too-few-readings']);

/** The one-click answer to a flag, or null when only a reason can answer it. */
export function flagAction(flag: { code: string }, method: FitMethod, model: 'line' | 'high-k' = 'line'): FlagAction | null {
  const recommended = RECOMMENDED_HEAD_RANGES[method];
  if (model === 'high-k' && LINE_ONLY_CODES.has(flag.code)) return null;
  switch (flag.code) {
    // The recommended range lies inside the late segment for both methods: one window answers both flags.
    case 'concave-upward':
      return { label: `Fit a free line over the later segment, ${range(recommended)}`, patch: { line: 'free', window: { kind: 'head', ...recommended } } };
    case 'window-outside-recommended':
      return { label: `Use the recommended window, ${range(recommended)}`, patch: { window: { kind: 'head', ...recommended } } };
    case 'intake-screen-in-filter-pack':
      return { label: 'Use the borehole radius as the intake', patch: { geometry: { intake: 'borehole' } } };
    default:
      return null;
  }
}

const EPS = 1e-9;

/**
 * Whether the fit as it stands already does what the flag asks. The double-straight-line flag is
 * raised from the record's shape and stays on the fit; a free line over the later segment answers it.
 */
export function answeredByFit(flag: { code: string }, fit: FitChoices): boolean {
  if (flag.code === 'concave-upward') {
    return fit.line === 'free' && fit.window.headMax <= LATE_SEGMENT.upper + EPS && fit.window.headMin >= LATE_SEGMENT.lower - EPS;
  }
  return false;
}

export type FlagStanding =
  /** Changes K and is not answered: submission waits for the action or a reason. */
  | 'open'
  /** Changes K; the fit does what it asks. */
  | 'resolved'
  /** Changes K; the analyst gave a reason to keep the fit as it is. */
  | 'reasoned'
  | 'note'
  | 'warning';

export function flagStanding(flag: { code: string }, fit: FitChoices, reasons: Readonly<Record<string, string>>): FlagStanding {
  const kind = flagKind(flag.code);
  if (kind === 'record-note') return 'note';
  if (kind === 'warning') return 'warning';
  if (answeredByFit(flag, fit)) return 'resolved';
  return (reasons[flag.code] ?? '').trim() ? 'reasoned' : 'open';
}

/** The codes that still block submission. */
export function unansweredFlags(flags: readonly { code: string }[], fit: FitChoices, reasons: Readonly<Record<string, string>>): string[] {
  return flags.filter((f) => flagStanding(f, fit, reasons) === 'open').map((f) => f.code);
}
