import { EngineInputError } from './errors';
import { REFERENCES } from './references';

export interface WellK {
  /** Geometric mean of the fits' K. */
  kMetersPerSecond: number;
  count: number;
  log10Mean: number;
  /** Sample standard deviation of log10 K (n − 1); null for a single fit. */
  log10StdDev: number | null;
  reference: string;
}

/** Well K from the K of a well's checked fits (log-normal K, Freeze 1975). */
export function wellK(kValuesMetersPerSecond: ArrayLike<number>): WellK {
  const n = kValuesMetersPerSecond.length;
  if (n === 0) throw new EngineInputError('kValues', 'is empty; Well K needs at least one fit');
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const k = kValuesMetersPerSecond[i];
    if (!Number.isFinite(k) || k <= 0) throw new EngineInputError('kValues', `value ${i + 1} (${k}) must be a positive K in m/s`);
    sum += Math.log10(k);
  }
  const log10Mean = sum / n;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const d = Math.log10(kValuesMetersPerSecond[i]) - log10Mean;
    ss += d * d;
  }
  return {
    kMetersPerSecond: 10 ** log10Mean,
    count: n,
    log10Mean,
    log10StdDev: n > 1 ? Math.sqrt(ss / (n - 1)) : null,
    reference: REFERENCES.wellK,
  };
}
