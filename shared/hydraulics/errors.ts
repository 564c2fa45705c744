import type { QcFlag } from './flags';

/**
 * An input the engine cannot work with. `field` is the dotted path of the offending input
 * (e.g. `geometry.casingRadiusM`), `problem` says what is wrong with it; the message joins both
 * so it reads on its own in a log, a toast or the command line.
 */
export class EngineInputError extends Error {
  readonly field: string;
  readonly problem: string;
  /** A stable code for a refusal a client acts on (e.g. TEST_START_NOT_FOUND); absent for plain input errors. */
  readonly code: string | undefined;
  /** Numbers behind the refusal, e.g. `candidatesSeconds` for a test start that could not be found. */
  readonly details: Readonly<Record<string, unknown>> | undefined;

  constructor(field: string, problem: string, options: { code?: string; details?: Record<string, unknown> } = {}) {
    super(`${field}: ${problem}`);
    this.name = 'EngineInputError';
    this.field = field;
    this.problem = problem;
    this.code = options.code;
    this.details = options.details;
  }
}

/**
 * The record oscillates, so the overdamped models (Hvorslev, Bouwer-Rice) do not apply
 * (Butler & Garnett 2000). Fitting it anyway needs `allowOscillation: true`.
 */
export class OscillatingResponseError extends Error {
  readonly field = 'record';
  readonly flag: QcFlag;

  constructor(flag: QcFlag) {
    super(`record: ${flag.message} Set allowOscillation to fit it anyway.`);
    this.name = 'OscillatingResponseError';
    this.flag = flag;
  }
}

/** A computed number for a message: four significant digits, no trailing noise. */
export function formatNumber(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(4))) : String(x);
}

export function requirePositive(field: string, value: number): void {
  if (!Number.isFinite(value)) throw new EngineInputError(field, `must be a finite number (got ${value})`);
  if (value <= 0) throw new EngineInputError(field, `must be greater than 0 (got ${value})`);
}

export function requireFinite(field: string, value: number): void {
  if (!Number.isFinite(value)) throw new EngineInputError(field, `must be a finite number (got ${value})`);
}
