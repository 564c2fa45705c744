import { useCallback, useEffect, useMemo, useState, type RefObject } from 'react';
import { useQuery } from '@tanstack/react-query';
import proj4 from 'proj4';
import type { MapRef } from 'react-map-gl/maplibre';
import type { FeatureCollection, Point } from 'geojson';
import type { Site } from '@shared/schemas/sites';
import type { KUnit } from '@shared/units/conductivity';
import { loadCrs, WGS84 } from '../crs';
import type { KColourScale } from '../colour';
import { downloadBlob } from '../export-png';
import { formatK } from '../format';
import type { KMapFilter, MapWellFeature } from '../model';
import { crossValidationQueryOptions, outlinesQueryOptions, sketchesQueryOptions, surfaceQueryString, type SurfaceQuery } from './api';
import {
  colourTable,
  gridCorners,
  highKZones,
  paintSurface,
  pointsBounds,
  projectRings,
  ringsBounds,
  surfacePoints,
  surfaceStats,
  valueAt,
} from './model';
import { DEFAULT_SURFACE, MIN_WELLS, type SurfaceSettings } from './surface-panel';
import type { TrialWell } from './sketch-panel';
import { useDraw } from './use-draw';
import { useGridCrs, useSurface, type SurfaceInput } from './use-surface';

/** The site's own x/y and back (identity for a geographic site); null while its definition loads. */
function useSiteXY(epsgCode: number) {
  const [name, setName] = useState<string | null>(epsgCode === 4326 ? WGS84 : null);
  useEffect(() => {
    let live = true;
    loadCrs(epsgCode).then(
      (n) => live && setName(n),
      () => live && setName(null),
    );
    return () => {
      live = false;
    };
  }, [epsgCode]);
  return useMemo(() => {
    if (!name) return null;
    if (name === WGS84) return { toSite: (lon: number, lat: number): [number, number] => [lon, lat], fromSite: (x: number, y: number): [number, number] => [x, y] };
    const c = proj4(WGS84, name);
    return { toSite: (lon: number, lat: number) => c.forward([lon, lat]) as [number, number], fromSite: (x: number, y: number) => c.inverse([x, y]) as [number, number] };
  }, [name]);
}

function useDebounced<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return settled;
}

/** The preferred outline when none is chosen yet: a plume's, else the first. */
const defaultOutline = (outlines: { id: string; name: string }[]) => (outlines.find((o) => /plume/i.test(o.name)) ?? outlines[0])?.id ?? null;

interface Args {
  site: Site;
  all: readonly MapWellFeature[];
  shown: readonly MapWellFeature[];
  filter: KMapFilter;
  crsUnit: string | null;
  scale: KColourScale;
  mapRef: RefObject<MapRef | null>;
  kUnit: KUnit;
}

/** The K surface, outlines, cross-validation and capture sketches of the workspace: state and derived layers. */
export function useWorkspace({ site, all, shown, filter, crsUnit, scale, mapRef, kUnit }: Args) {
  const outlinesQuery = useQuery(outlinesQueryOptions(site.id));
  const sketchesQuery = useQuery(sketchesQueryOptions(site.id));
  const outlines = useMemo(() => outlinesQuery.data ?? [], [outlinesQuery.data]);
  const sketches = useMemo(() => sketchesQuery.data ?? [], [sketchesQuery.data]);
  const [settings, setSettingsState] = useState<SurfaceSettings>(DEFAULT_SURFACE);
  const [outlineTouched, setOutlineTouched] = useState(false);
  const [placing, setPlacing] = useState(false);
  const [trial, setTrial] = useState<TrialWell | null>(null);
  const [hiddenSketches, setHidden] = useState<ReadonlySet<string>>(new Set());
  const draw = useDraw(mapRef);
  const siteXY = useSiteXY(site.epsgCode);

  const chosen = outlineTouched ? settings.outlineId : (settings.outlineId ?? defaultOutline(outlines));
  const outline = outlines.find((o) => o.id === chosen) ?? null;
  const effectiveSettings = useMemo(() => ({ ...settings, outlineId: outline?.id ?? null }), [settings, outline]);
  const setSettings = useCallback(
    (next: SurfaceSettings) => {
      if (next.outlineId !== effectiveSettings.outlineId) setOutlineTouched(true);
      setSettingsState(next);
    },
    [effectiveSettings.outlineId],
  );

  const centre = useMemo<[number, number] | null>(() => {
    if (all.length === 0) return null;
    let lon = 0;
    let lat = 0;
    for (const w of all) {
      lon += w.geometry.coordinates[0];
      lat += w.geometry.coordinates[1];
    }
    return [lon / all.length, lat / all.length];
  }, [all]);
  const gridCrs = useGridCrs(site.epsgCode, crsUnit, centre);
  const points = useMemo(() => (gridCrs ? surfacePoints(shown, gridCrs.project) : []), [shown, gridCrs]);
  const wellsUsed = useMemo(() => shown.filter((w) => w.properties.log10K !== null).length, [shown]);
  const rings = useMemo(() => (gridCrs && outline ? projectRings(outline.geometry, gridCrs.project) : null), [gridCrs, outline]);

  const input = useMemo<SurfaceInput | null>(() => {
    if (!settings.show || !gridCrs || points.length < MIN_WELLS) return null;
    const bounds = rings ? ringsBounds(rings) : pointsBounds(points);
    if (!bounds) return null;
    return {
      points,
      bounds,
      cellSizeM: settings.cellSizeM,
      options: { power: settings.power, neighbours: settings.neighbours, searchRadiusM: settings.searchRadiusM },
      rings,
      outlineKey: `${outline?.id ?? 'none'}:${outline?.updatedAt ?? ''}:${gridCrs.label}`,
    };
  }, [settings.show, settings.cellSizeM, settings.power, settings.neighbours, settings.searchRadiusM, gridCrs, points, rings, outline]);
  const surface = useSurface(input);
  const result = surface.status === 'ready' ? surface.result : surface.status === 'running' ? surface.previous : null;

  const table = useMemo(() => colourTable(scale), [scale]);
  const image = useMemo(() => {
    if (!result || !gridCrs) return null;
    const started = performance.now();
    const pixels = paintSurface(result.values, table);
    const corners = gridCorners(result.grid).map(([x, y]) => gridCrs.unproject(x, y)) as [[number, number], [number, number], [number, number], [number, number]];
    return { pixels, cols: result.grid.cols, rows: result.grid.rows, corners, paintMs: performance.now() - started, result };
  }, [result, table, gridCrs]);
  const renderMs = image && surface.status === 'ready' && image.result === surface.result ? surface.result.totalMs + image.paintMs : null;
  const stats = useMemo(() => (result ? surfaceStats(result.values) : null), [result]);
  const zones = useMemo(
    () => (result && gridCrs && settings.thresholdLog10 !== null ? highKZones(result.grid, result.values, settings.thresholdLog10, gridCrs.unproject) : null),
    [result, gridCrs, settings.thresholdLog10],
  );

  const readK = useMemo(() => {
    if (!settings.show || !result || !gridCrs) return null;
    return (lon: number, lat: number) => {
      const [x, y] = gridCrs.project(lon, lat);
      const v = valueAt(result.grid, result.values, x, y);
      return Number.isFinite(v) ? formatK(10 ** v, kUnit) : null;
    };
  }, [settings.show, result, gridCrs, kUnit]);

  const surfaceQuery: SurfaceQuery = useMemo(
    () => ({
      outlineId: effectiveSettings.outlineId,
      power: settings.power,
      neighbours: settings.neighbours,
      searchRadiusM: settings.searchRadiusM,
      cellSizeM: settings.cellSizeM,
      units: filter.units,
      screenElevationMinM: filter.elevationMinM,
      screenElevationMaxM: filter.elevationMaxM,
    }),
    [effectiveSettings.outlineId, settings.power, settings.neighbours, settings.searchRadiusM, settings.cellSizeM, filter],
  );
  // Asked for only while its panel is open, and once the settings rest: a server round trip must not slow the surface's redraw.
  const [cvOpen, setCvOpen] = useState(false);
  const cvQuery = useDebounced(surfaceQueryString(surfaceQuery), 300);
  const cv = useQuery(crossValidationQueryOptions(site.id, cvQuery, cvOpen && settings.show && wellsUsed >= MIN_WELLS));

  const wellAt = useMemo(() => new Map(all.map((w) => [w.id, w.geometry.coordinates])), [all]);
  const cvRings = useMemo<FeatureCollection<Point>>(
    () => ({
      type: 'FeatureCollection',
      features:
        settings.show && cv.data
          ? cv.data.wells.flatMap((w) => {
              const c = wellAt.get(w.wellId);
              return c ? [{ type: 'Feature' as const, geometry: { type: 'Point' as const, coordinates: c }, properties: { errorLog10: w.errorLog10, name: w.name } }] : [];
            })
          : [],
    }),
    [settings.show, cv.data, wellAt],
  );
  const spots = useMemo<FeatureCollection<Point>>(
    () => ({
      type: 'FeatureCollection',
      features: settings.show && cv.data ? cv.data.nextTestSpots.map((s, i) => ({ type: 'Feature' as const, geometry: { type: 'Point' as const, coordinates: [s.lon, s.lat] }, properties: { rank: i + 1 } })) : [],
    }),
    [settings.show, cv.data],
  );

  const placeTrial = useCallback(
    (lon: number, lat: number) => {
      if (!siteXY) return;
      const [x, y] = siteXY.toSite(lon, lat);
      setTrial({ lon, lat, x, y });
      setPlacing(false);
    },
    [siteXY],
  );

  const exportZones = useCallback(() => {
    if (!zones) return;
    const blob = new Blob([JSON.stringify(zones)], { type: 'application/geo+json' });
    downloadBlob(blob, `${site.name.replace(/[^\w-]+/g, '-')}-high-k-zones.geojson`);
  }, [zones, site.name]);

  const toggleSketch = useCallback(
    (id: string) =>
      setHidden((h) => {
        const next = new Set(h);
        if (next.has(id)) next.delete(id);
        else next.add(id);
        return next;
      }),
    [],
  );

  return {
    outlines,
    sketches,
    effectiveSettings,
    setSettings,
    gridCrs,
    points,
    wellsUsed,
    surface,
    image: settings.show ? image : null,
    opacity: settings.opacity,
    renderMs,
    stats,
    zones: settings.show ? zones : null,
    exportZones,
    readK,
    surfaceQuery,
    cv,
    cvOpen,
    setCvOpen,
    cvRings,
    spots,
    draw,
    placing,
    setPlacing,
    trial,
    setTrial,
    placeTrial,
    fromSite: siteXY?.fromSite ?? null,
    hiddenSketches,
    toggleSketch,
    chosenOutlineId: outline?.id ?? null,
  };
}

export type Workspace = ReturnType<typeof useWorkspace>;
