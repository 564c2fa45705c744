import { useMemo, useRef, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { MapRef } from 'react-map-gl/maplibre';
import type { KSurface } from '@shared/schemas/ksurface';
import type { ViewInfo, ViewWells } from '@shared/schemas/viewer-links';
import { Alert } from '@/components/ui/alert';
import { Spinner } from '@/components/ui/spinner';
import { Wordmark } from '@/components/ui/wordmark';
import { describeError } from '@/lib/errors';
import { formatDate } from '@/lib/format';
import { colourExpression, decadeDomain, kColourScale } from '../colour';
import { defaultMapKUnit, formatLength } from '../format';
import { wellSizes } from '../layers';
import { boundsOf, hasWellK, histogram, labelMinZoom, pixelsPerMetre, sourceData, wellSpacing, type MapWellFeature } from '../model';
import { createCursorStore } from '../components/cursor-store';
import { FIT_MAX_ZOOM, FIT_PADDING, KMap } from '../components/k-map';
import { useWellSelection } from '../components/use-well-selection';
import { KLegend } from '../components/k-legend';
import { Panel } from '../components/panel';
import { Row, WellKBox } from '../components/well-panel';
import { colourTable, paintSurface } from '../surface/model';
import { SketchNumbers } from '../surface/sketch-panel';
import type { SurfaceImageData } from '../surface/overlays';
import { viewOutlinesQueryOptions, viewSketchesQueryOptions, viewSurfaceQueryOptions, viewWellsQueryOptions } from './api';
import { ViewOverlays } from './view-overlays';

type Corners = SurfaceImageData['corners'];
type ViewWell = ViewWells['features'][number];

/** The server's grid: base64 of little-endian Float32 log10 K, NaN for empty cells. */
export function decodeSurface(surface: Pick<KSurface, 'log10K' | 'cols' | 'rows'>): Float32Array {
  const bytes = Uint8Array.from(atob(surface.log10K), (c) => c.charCodeAt(0));
  const values = new Float32Array(bytes.buffer, 0, Math.floor(bytes.length / 4));
  if (values.length !== surface.cols * surface.rows) throw new Error('The K surface grid has the wrong size');
  return values;
}

/** Bounds of a few lon/lat points (outline rings, surface corners), for where the map opens without wells. */
function pointsBounds(points: Iterable<[number, number]>): [number, number, number, number] | null {
  let w = Infinity, s = Infinity, e = -Infinity, n = -Infinity;
  for (const [x, y] of points) {
    w = Math.min(w, x);
    e = Math.max(e, x);
    s = Math.min(s, y);
    n = Math.max(n, y);
  }
  return Number.isFinite(w) ? [w, s, e, n] : null;
}

/**
 * The wells of the view as the K map's features. Without the link's leave a well has no name: the
 * panel then calls it by its place in the list, and no label is drawn.
 */
function asMapWells(features: readonly ViewWell[]): MapWellFeature[] {
  return features.map((f) => ({
    ...f,
    properties: {
      groundElevationM: NaN, screenTopDepthM: NaN, screenBottomDepthM: NaN, screenTopElevationM: NaN, screenBottomElevationM: NaN,
      ...f.properties,
      name: f.properties.name ?? '',
    },
  }));
}

/** The read-only K map of a viewer link: the layers the link shows, the legend and histogram, the cautions. Nothing here edits. */
export function ViewPage({ token, info }: { token: string; info: ViewInfo }) {
  const mapRef = useRef<MapRef>(null);
  const cursor = useMemo(() => createCursorStore(), []);
  const [kUnit, setKUnit] = useState(defaultMapKUnit(info.displayUnits));
  const [hoveredBin, setHoveredBin] = useState(-1);
  const [shown, setShown] = useState({ wells: info.layers.wells, surface: info.layers.surface, outlines: info.layers.outlines, sketches: info.layers.sketches, names: info.showNames });
  const [style, setStyle] = useState({ hasGlyphs: false, attribution: '' });

  const wellsQuery = useQuery(viewWellsQueryOptions(token, info.layers.wells));
  const surfaceQuery = useQuery(viewSurfaceQueryOptions(token, info.layers.surface));
  const outlinesQuery = useQuery(viewOutlinesQueryOptions(token, info.layers.outlines));
  const sketchesQuery = useQuery(viewSketchesQueryOptions(token, info.layers.sketches));

  const wells = useMemo(() => asMapWells(wellsQuery.data?.features ?? []), [wellsQuery.data]);
  const surfaceValues = useMemo(() => (surfaceQuery.data ? decodeSurface(surfaceQuery.data) : null), [surfaceQuery.data]);
  // The colour scale spans the wells' Well K; a link without wells takes it from the surface's cells.
  const domain = useMemo(() => {
    const fromWells = wells.filter((w) => hasWellK(w.properties)).map((w) => w.properties.log10K as number);
    if (fromWells.length > 0 || !surfaceValues) return decadeDomain(fromWells, kUnit);
    return decadeDomain(Array.from(surfaceValues).filter(Number.isFinite), kUnit);
  }, [wells, surfaceValues, kUnit]);
  const scale = useMemo(() => kColourScale(domain), [domain]);
  const colour = useMemo(() => colourExpression(scale), [scale]);
  const bins = useMemo(() => histogram(wells, domain), [wells, domain]);
  const data = useMemo(() => sourceData(wells, domain), [wells, domain]);
  const namesFrom = useMemo(() => labelMinZoom(wells), [wells]);
  const sizes = useMemo(() => {
    const spacing = wellSpacing(wells);
    return wellSizes(spacing ? (zoom) => spacing.spacingM * pixelsPerMetre(zoom, spacing.latDeg) : null);
  }, [wells]);
  const image = useMemo<SurfaceImageData | null>(() => {
    const s = surfaceQuery.data;
    if (!s || !surfaceValues) return null;
    return { pixels: paintSurface(surfaceValues, colourTable(scale)), cols: s.cols, rows: s.rows, corners: s.corners as Corners };
  }, [surfaceQuery.data, surfaceValues, scale]);

  const outlines = useMemo(() => outlinesQuery.data ?? [], [outlinesQuery.data]);
  const sketches = useMemo(() => sketchesQuery.data ?? [], [sketchesQuery.data]);
  const siteBounds = useMemo(() => {
    const fromWells = wellsQuery.data?.bbox ?? boundsOf(wells);
    if (fromWells) return fromWells;
    const points: [number, number][] = [...(surfaceQuery.data?.corners ?? [])] as [number, number][];
    for (const o of outlines) for (const poly of o.geometry.type === 'Polygon' ? [o.geometry.coordinates] : o.geometry.coordinates) for (const ring of poly) points.push(...(ring as [number, number][]));
    for (const k of sketches) points.push([k.lon, k.lat]);
    return pointsBounds(points);
  }, [wellsQuery.data, wells, surfaceQuery.data, outlines, sketches]);

  const loading = [wellsQuery, surfaceQuery, outlinesQuery, sketchesQuery].some((q) => q.isPending && q.fetchStatus !== 'idle');
  const failed = [
    ['wells', wellsQuery.error],
    ['K surface', surfaceQuery.error],
    ['outlines', outlinesQuery.error],
    ['capture sketches', sketchesQuery.error],
  ].filter(([, e]) => e) as [string, unknown][];
  // The map opens once it knows where: on the wells, else on the other layers.
  const ready = !loading && (siteBounds !== null || failed.length > 0);

  const { byId, selected: selectedIds, selectedPerBin, select, binIds } = useWellSelection(data, bins.length);
  const order = useMemo(() => new Map(wells.map((w, i) => [w.properties.id, i + 1])), [wells]);
  const selected = selectedIds.length > 0 ? (byId.get(selectedIds[selectedIds.length - 1]) ?? null) : null;
  const selectBin = (bin: number, add: boolean) => select(binIds(bin), add ? 'add' : 'replace');
  const unanalysedCount = wells.filter((w) => !hasWellK(w.properties)).length;
  const len = (m: number) => formatLength(m, info.displayUnits, 'elevation');

  const layerChoices: { key: keyof typeof shown; label: string; offered: boolean }[] = [
    { key: 'wells', label: 'Wells coloured by Well K', offered: info.layers.wells },
    { key: 'names', label: 'Well names (close zooms)', offered: info.layers.wells && info.showNames && style.hasGlyphs },
    { key: 'surface', label: 'K surface (IDW of log10 K)', offered: info.layers.surface },
    { key: 'outlines', label: 'Outlines', offered: info.layers.outlines },
    { key: 'sketches', label: 'Capture sketches', offered: info.layers.sketches },
  ];

  return (
    <div className="flex min-h-dvh flex-col bg-slate-100 lg:h-dvh lg:min-h-0" data-testid="view-page">
      <header className="flex flex-wrap items-center gap-x-4 gap-y-1 border-b border-slate-200 bg-white px-4 py-2">
        <Wordmark />
        {/* On a phone the site's name has a line of its own, under the mark and the notice of expiry. */}
        <h1 className="order-last w-full text-lg leading-snug font-semibold tracking-tight text-slate-900 sm:order-none sm:w-auto sm:min-w-0 sm:flex-1" data-testid="view-site-name">
          {info.siteName} <span className="font-normal whitespace-nowrap text-slate-600">· K map</span>
        </h1>
        <p className="ml-auto text-xs text-slate-600 sm:ml-0">
          <span className="mr-2 inline-flex items-center rounded-full bg-slate-900 px-2 py-0.5 font-medium text-white">Read-only</span>
          Link works until {formatDate(info.expiresAt)}
        </p>
      </header>
      <p className="border-b border-amber-200 bg-amber-50 px-4 py-1.5 text-xs text-amber-950" data-testid="view-notice">
        A read-only view shared by the site’s project team: nothing here can be changed, and only what the team chose to share is shown. K values are measured at
        the wells; anything between them is an estimate. Please do not forward this link.
      </p>

      <div className="flex flex-1 flex-col gap-3 p-3 lg:min-h-0 lg:flex-row">
        <section
          aria-label="Map of the wells"
          className="relative h-[56vh] min-h-72 overflow-hidden rounded-lg bg-slate-200 ring-1 ring-slate-300 lg:h-auto lg:flex-1"
          data-testid="view-map"
        >
          {ready ? (
            <KMap
              mapRef={mapRef}
              mapStyle={info.basemapStyleUrl}
              data={data}
              colour={colour}
              initialBounds={siteBounds}
              padding={FIT_PADDING}
              hoveredBin={hoveredBin}
              selectedIds={selectedIds}
              onSelect={select}
              visibility={{ wells: shown.wells, unanalysed: shown.wells, labels: shown.names }}
              displayUnits={info.displayUnits}
              cursor={cursor}
              hasGlyphs={style.hasGlyphs}
              onStyleReady={(next) => setStyle((c) => (c.hasGlyphs === next.hasGlyphs && c.attribution === next.attribution ? c : next))}
              labelMinZoom={namesFrom}
              sizes={sizes}
              overlays={
                <ViewOverlays
                  image={image}
                  outlines={outlines}
                  surfaceOutlineId={surfaceQuery.data?.settings.outlineId ?? null}
                  sketches={sketches}
                  shown={shown}
                  hasGlyphs={style.hasGlyphs}
                  siteBounds={siteBounds}
                />
              }
            />
          ) : (
            <div className="grid h-full place-items-center">
              <Spinner label="Loading the map…" />
            </div>
          )}
          {ready && siteBounds ? (
            <button
              type="button"
              className="absolute top-2.5 left-2.5 z-10 inline-flex h-8 items-center rounded-md bg-white px-2.5 text-sm font-medium text-slate-800 shadow ring-1 ring-slate-300 hover:bg-slate-50"
              onClick={() => mapRef.current?.fitBounds(siteBounds, { padding: FIT_PADDING, maxZoom: FIT_MAX_ZOOM, duration: 600 })}
            >
              Whole site
            </button>
          ) : null}
        </section>

        <aside aria-label="About this map" className="flex flex-col gap-2 lg:w-[22rem] lg:overflow-y-auto">
          {failed.length > 0 ? (
            <Alert tone="error" title="Part of the map could not be loaded">
              {failed.map(([what, e]) => (
                <p key={what}>
                  The {what}: {describeError(e)}
                </p>
              ))}
            </Alert>
          ) : null}
          <Panel title="Legend" titleId="view-legend-title">
            <KLegend
              domain={domain}
              scale={scale}
              bins={bins}
              selectedPerBin={selectedPerBin}
              hoveredBin={hoveredBin}
              onHoverBin={setHoveredBin}
              onSelectBin={selectBin}
              unit={kUnit}
              onUnitChange={setKUnit}
              unanalysedCount={unanalysedCount}
            />
            {!info.layers.wells ? <p className="mt-2 text-xs text-slate-600">This link does not show the wells; the colours are those of the K surface.</p> : null}
          </Panel>
          {info.layers.wells ? (
            <Panel title="Well" titleId="view-well-title">
              {selected ? (
                <article className="space-y-3 text-sm" data-testid="view-well-panel">
                  <h3 className="text-base font-semibold text-slate-900">{selected.name || `Well ${order.get(selected.id) ?? ''} of ${wells.length}`}</h3>
                  <WellKBox well={selected} kUnit={kUnit} />
                  <dl className="divide-y divide-slate-100">
                    <Row label="Hydrostratigraphic unit">{selected.hydroUnit ?? 'Not given'}</Row>
                    {info.showConstruction && Number.isFinite(selected.screenTopDepthM) ? (
                      <>
                        <Row label="Screen, depth below ground">
                          {len(selected.screenTopDepthM)} – {len(selected.screenBottomDepthM)}
                        </Row>
                        <Row label="Screen, elevation">
                          {len(selected.screenTopElevationM)} – {len(selected.screenBottomElevationM)}
                        </Row>
                        <Row label="Ground elevation">{len(selected.groundElevationM)}</Row>
                      </>
                    ) : null}
                  </dl>
                </article>
              ) : (
                <p className="text-sm text-slate-600">Tap or click a well on the map to see its Well K{info.showConstruction ? ' and screen' : ''}.</p>
              )}
            </Panel>
          ) : null}
          <Panel title="Layers" titleId="view-layers-title">
            <fieldset className="space-y-1.5 text-sm">
              <legend className="sr-only">Layers shown on the map</legend>
              {layerChoices
                .filter((c) => c.offered)
                .map((c) => (
                  <label key={c.key} className="flex items-center gap-2">
                    <input type="checkbox" checked={shown[c.key]} onChange={(e) => setShown((s) => ({ ...s, [c.key]: e.target.checked }))} />
                    {c.label}
                  </label>
                ))}
            </fieldset>
            {surfaceQuery.data ? (
              <p className="mt-2 text-xs text-slate-600" data-testid="view-surface-settings">
                K surface from {surfaceQuery.data.wellsUsed} wells, power {surfaceQuery.data.settings.power}
                {surfaceQuery.data.settings.neighbours ? `, nearest ${surfaceQuery.data.settings.neighbours}` : ''}
                {surfaceQuery.data.settings.searchRadiusM ? `, within ${len(surfaceQuery.data.settings.searchRadiusM)}` : ''}
                {surfaceQuery.data.settings.outlineId ? `, clipped to ${outlines.find((o) => o.id === surfaceQuery.data.settings.outlineId)?.name ?? 'an outline'}` : ''}.
                {surfaceQuery.data.warnings.map((w) => ` ${w}`)}
              </p>
            ) : null}
            {style.attribution ? <p className="mt-2 text-xs text-slate-500">Basemap: {style.attribution}</p> : null}
          </Panel>
          {info.layers.sketches && sketches.length > 0 ? (
            <Panel title="Capture sketches" titleId="view-sketches-title" defaultOpen={false}>
              <ul className="space-y-2">
                {sketches.map((k) => (
                  <li key={k.id} className="rounded-md p-2 ring-1 ring-slate-200">
                    <p className="text-sm font-medium text-slate-900">{k.name}</p>
                    <SketchNumbers results={k.results} kUnit={kUnit} displayUnits={info.displayUnits} rate={`${(k.results.rateM3PerS * 1000).toPrecision(3)} L/s`} />
                  </li>
                ))}
              </ul>
            </Panel>
          ) : null}
          <Panel title="Cautions" titleId="view-cautions-title" testId="view-cautions">
            <div className="space-y-1.5 text-xs leading-relaxed text-amber-950">
              {info.cautions.map((c) => (
                <p key={c}>{c}</p>
              ))}
            </div>
          </Panel>
        </aside>
      </div>
    </div>
  );
}
