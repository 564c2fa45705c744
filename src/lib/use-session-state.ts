import { useCallback, useState } from 'react';

/** State that survives a navigation within the tab (a unit choice, say), kept in sessionStorage. */
export function useSessionState<T extends string>(key: string, initial: T, isValid: (value: string) => value is T): [T, (value: T) => void] {
  const [value, setValue] = useState<T>(() => {
    try {
      const stored = window.sessionStorage.getItem(key);
      return stored !== null && isValid(stored) ? stored : initial;
    } catch {
      return initial;
    }
  });
  const set = useCallback(
    (next: T) => {
      setValue(next);
      try {
        window.sessionStorage.setItem(key, next);
      } catch {
        // Storage may be full or disabled; the choice then lasts for this screen only.
      }
    },
    [key],
  );
  return [value, set];
}
