import type { Bounds } from '@shared/schemas/basemaps';

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 ** 2) return `${(bytes / 1024).toFixed(0)} KB`;
  if (bytes < 1024 ** 3) return `${(bytes / 1024 ** 2).toFixed(1)} MB`;
  return `${(bytes / 1024 ** 3).toFixed(2)} GB`;
}

const deg = (v: number, pos: string, neg: string) => `${Math.abs(v).toFixed(2)}° ${v < 0 ? neg : pos}`;

/** "5.95° E – 10.49° E, 45.82° N – 47.81° N", or "Whole world". */
export function formatBounds([w, s, e, n]: Bounds): string {
  if (e - w >= 359 && n - s >= 170) return 'Whole world';
  return `${deg(w, 'E', 'W')} – ${deg(e, 'E', 'W')}, ${deg(s, 'N', 'S')} – ${deg(n, 'N', 'S')}`;
}
