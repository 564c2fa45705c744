import { useCallback, useMemo, useState } from 'react';
import type { FeatureCollection, Point } from 'geojson';
import type { SourceWellProperties } from '../model';
import type { SelectMode } from './k-map';

/** The selection after a click (replace), a shift-click (toggle) or a box or bin added (add). */
export function nextSelection(current: readonly string[], ids: readonly string[], mode: SelectMode): string[] {
  if (mode === 'replace') return [...ids];
  if (mode === 'add') return [...new Set([...current, ...ids])];
  const next = new Set(current);
  for (const id of ids) {
    if (next.has(id)) next.delete(id);
    else next.add(id);
  }
  return [...next];
}

/**
 * The wells selected on a K map, of those drawn: by click, shift-click, box or histogram bin, with
 * the count per bin the legend marks.
 */
export function useWellSelection(data: FeatureCollection<Point, SourceWellProperties>, binCount: number) {
  const [selectedIds, setSelectedIds] = useState<string[]>([]);
  const byId = useMemo(() => new Map(data.features.map((f) => [f.properties.id, f.properties])), [data]);
  const selected = useMemo(() => selectedIds.filter((id) => byId.has(id)), [selectedIds, byId]);
  const selectedPerBin = useMemo(() => {
    const counts = Array.from({ length: binCount }, () => 0);
    for (const id of selected) {
      const bin = byId.get(id)?.bin ?? -1;
      if (bin >= 0) counts[bin]++;
    }
    return counts;
  }, [selected, byId, binCount]);
  const select = useCallback((ids: string[], mode: SelectMode) => setSelectedIds((current) => nextSelection(current, ids, mode)), []);
  const binIds = useCallback((bin: number) => data.features.filter((f) => f.properties.bin === bin).map((f) => f.properties.id), [data]);
  return { byId, selected, selectedPerBin, select, binIds };
}
