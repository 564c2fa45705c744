export type QcSeverity = 'info' | 'warning' | 'error';

export type QcCode =
  | 'oscillation'
  | 'drift-after-recovery'
  | 'concave-upward'
  | 'too-few-readings'
  | 'low-r-squared'
  | 'window-outside-recommended'
  | 'h0-mismatch'
  | 'k-implausible'
  | 'k-outside-material'
  | 'shape-factor-validity'
  | 'repeat-tests-disagree'
  | 'intake-screen-in-filter-pack';

/** A QC finding as data: the UI renders `message`, a checker reads `values`. */
export interface QcFlag {
  code: QcCode;
  severity: QcSeverity;
  message: string;
  values: Record<string, number | string | boolean | null>;
  suggestion?: string;
  reference?: string;
}
