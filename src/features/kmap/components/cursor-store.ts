import { useSyncExternalStore } from 'react';

export type LonLat = { lon: number; lat: number };

/** The pointer's position over the map, kept outside React state so that only the read-out re-renders. */
export interface CursorStore {
  set(value: LonLat | null): void;
  get(): LonLat | null;
  subscribe(listener: () => void): () => void;
}

export function createCursorStore(): CursorStore {
  let value: LonLat | null = null;
  const listeners = new Set<() => void>();
  return {
    set(next) {
      value = next;
      for (const l of listeners) l();
    },
    get: () => value,
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

export function useCursor(store: CursorStore): LonLat | null {
  return useSyncExternalStore(store.subscribe, store.get, store.get);
}
