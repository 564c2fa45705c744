import { EngineInputError } from '../hydraulics/errors';

/** One entry of a unit select box. */
export interface UnitOption<Id extends string = string> {
  readonly id: Id;
  readonly label: string;
}

export function factorOf<Id extends string>(
  factors: Readonly<Record<Id, number>>,
  unit: Id,
  field: string,
): number {
  const factor = Object.prototype.hasOwnProperty.call(factors, unit) ? factors[unit] : undefined;
  if (factor === undefined) {
    throw new EngineInputError(field, `unknown unit "${unit}" (expected one of ${Object.keys(factors).join(', ')})`);
  }
  return factor;
}

export function isUnitOf<Id extends string>(options: readonly UnitOption<Id>[], value: string): value is Id {
  return options.some((o) => o.id === value);
}

/** Multiplies every element by `factor` into `out` (a new array unless given); no per-sample objects. */
export function scaleSeries(values: ArrayLike<number>, factor: number, out?: Float64Array): Float64Array {
  const n = values.length;
  const target = out ?? new Float64Array(n);
  if (target.length < n) throw new EngineInputError('out', `holds ${target.length} values; ${n} needed`);
  for (let i = 0; i < n; i++) target[i] = values[i] * factor;
  return target;
}
