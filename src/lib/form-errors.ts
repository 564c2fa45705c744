import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client';
import { describeError } from './errors';

/** Maps a server field name (e.g. "hydroUnits.2") to a form path, or null when the form has no such field. */
export type FieldMapper<T extends FieldValues> = (serverField: string) => Path<T> | null;

export function fieldsOf<T extends FieldValues>(...names: Array<Path<T>>): FieldMapper<T> {
  const known = new Set<string>(names);
  return (serverField) => (known.has(serverField) ? (serverField as Path<T>) : null);
}

/**
 * Puts a failed submission's messages where the person will look: `fields` beside their inputs,
 * anything else (and the general message) above the submit button as `root.server`.
 */
export function applyServerErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  mapField: FieldMapper<T>,
): void {
  const leftOver: string[] = [];
  let placed = 0;
  if (isApiError(error) && error.fields) {
    for (const [serverField, message] of Object.entries(error.fields)) {
      const path = mapField(serverField);
      if (path) {
        setError(path, { type: 'server', message }, { shouldFocus: placed === 0 });
        placed += 1;
      } else {
        leftOver.push(message);
      }
    }
  }
  if (placed === 0 || leftOver.length > 0) {
    const message = leftOver.length > 0 ? leftOver.join(' ') : describeError(error);
    setError('root.server' as Path<T>, { type: 'server', message });
  }
}
