import { useCallback, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import type { MapRef } from 'react-map-gl/maplibre';
import type { StyleSpecification } from 'maplibre-gl';
import type { MapWells } from '@shared/schemas/map';
import type { Site } from '@shared/schemas/sites';
import { CAUTIONS } from '@shared/cautions';
import { Button } from '@/components/ui/button';
import { useToast } from '@/components/ui/toast';
import { describeError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { useSessionState } from '@/lib/use-session-state';
import type { BasemapOption } from '../api';
import { colourExpression, decadeDomain, kColourScale } from '../colour';
import { defaultMapKUnit, isMapKUnit } from '../format';
import { wellSizes } from '../layers';
import { boundsOf, filterWells, hasWellK, histogram, labelMinZoom, NO_FILTER, pixelsPerMetre, sourceData, unitsPresent, wellSpacing, type KMapFilter } from '../model';
import { downloadBlob, renderViewPng } from '../export-png';
import { CursorReadout } from './cursor-readout';
import { createCursorStore } from './cursor-store';
import { FIT_MAX_ZOOM, fitPadding, KMap, type LayerVisibility, type SelectMode } from './k-map';
import { KLegend } from './k-legend';
import { KMapFilters } from './k-map-filters';
import { MapOverlay } from './map-overlay';
import { useWellSelection } from './use-well-selection';
import { WellFinder } from './well-finder';
import { WellPanel } from './well-panel';
import { Panel } from './panel';
import { useWorkspace } from '../surface/use-workspace';
import { SurfaceOverlays } from '../surface/overlays';
import { SurfacePanel } from '../surface/surface-panel';
import { CrossValidationPanel } from '../surface/cross-validation-panel';
import { OutlinesPanel } from '../surface/outlines-panel';
import { SketchPanel } from '../surface/sketch-panel';
import { ExportMenu } from '@/components/export-menu';
import { SiteReportButton } from '@/components/site-report-button';
import { surfaceQueryString } from '../surface/api';

const count = (n: number) => n.toLocaleString('en');

/** No basemap: a plain background, for an instance whose tiles are missing or a cleaner print. */
export const PLAIN_BASEMAP_ID = 'plain';
function plainStyle(): StyleSpecification {
  return {
    version: 8,
    // The app's own glyphs, so the well names still show; maplibre wants an absolute URL.
    glyphs: `${window.location.origin}/tiles/glyphs/{fontstack}/{range}.pbf`,
    sources: {},
    layers: [{ id: 'background', type: 'background', paint: { 'background-color': '#eef1ee' } }],
  };
}

interface Props {
  site: Site;
  wells: MapWells;
  crsUnit: string | null;
  basemaps: BasemapOption[];
  /** Leads and Analysts (and Admins) change outlines and sketches; Viewers and Checkers read them. */
  canEdit: boolean;
}

/** The top of the workspace on a wide screen: just under the app's top bar. */
function useWorkspaceTop(): number | null {
  const [top, setTop] = useState<number | null>(null);
  useLayoutEffect(() => {
    const wide = window.matchMedia('(min-width: 1024px)');
    const measure = () => {
      const bar = document.querySelector('body header');
      setTop(wide.matches ? Math.max(0, Math.round(bar ? bar.getBoundingClientRect().bottom + window.scrollY : 0)) : null);
    };
    measure();
    wide.addEventListener('change', measure);
    window.addEventListener('resize', measure);
    return () => {
      wide.removeEventListener('change', measure);
      window.removeEventListener('resize', measure);
    };
  }, []);
  return top;
}

export function KMapPage({ site, wells, crsUnit, basemaps, canEdit }: Props) {
  const toast = useToast();
  const mapRef = useRef<MapRef>(null);
  const cursor = useMemo(() => createCursorStore(), []);
  const [kUnit, setKUnit] = useSessionState(`kfield.kmap.kUnit.${site.id}`, defaultMapKUnit(site.displayUnits), isMapKUnit);
  const [filter, setFilter] = useState<KMapFilter>(NO_FILTER);
  const [hoveredBin, setHoveredBin] = useState(-1);
  const [focusedId, setFocusedId] = useState<string | null>(null);
  const [visibility, setVisibility] = useState<LayerVisibility>({ wells: true, unanalysed: true, labels: true });
  const [style, setStyle] = useState({ hasGlyphs: false, attribution: '' });
  const hasGlyphs = style.hasGlyphs;
  const [exporting, setExporting] = useState(false);

  const basemapChoices = useMemo(() => {
    const list = basemaps.map((b) => ({ id: b.id, name: b.name, styleUrl: b.styleUrl as string | StyleSpecification }));
    if (!list.some((b) => b.styleUrl === site.basemapStyleUrl)) list.unshift({ id: 'site', name: 'Site basemap', styleUrl: site.basemapStyleUrl });
    list.push({ id: PLAIN_BASEMAP_ID, name: 'None (plain background)', styleUrl: plainStyle() });
    return list;
  }, [basemaps, site.basemapStyleUrl]);
  const [basemapId, setBasemapId] = useState(() => basemapChoices.find((b) => b.styleUrl === site.basemapStyleUrl)?.id ?? basemapChoices[0].id);
  const basemap = basemapChoices.find((b) => b.id === basemapId) ?? basemapChoices[0];

  const all = wells.features;
  const units = useMemo(() => unitsPresent(all, site.hydroUnits), [all, site.hydroUnits]);
  const shown = useMemo(() => filterWells(all, filter), [all, filter]);
  const domain = useMemo(() => decadeDomain(shown.filter((w) => hasWellK(w.properties)).map((w) => w.properties.log10K as number), kUnit), [shown, kUnit]);
  const scale = useMemo(() => kColourScale(domain), [domain]);
  const colour = useMemo(() => colourExpression(scale), [scale]);
  const bins = useMemo(() => histogram(shown, domain), [shown, domain]);
  const data = useMemo(() => sourceData(shown, domain), [shown, domain]);
  const namesFrom = useMemo(() => labelMinZoom(all), [all]);
  const sizes = useMemo(() => {
    const spacing = wellSpacing(all);
    return wellSizes(spacing ? (zoom) => spacing.spacingM * pixelsPerMetre(zoom, spacing.latDeg) : null);
  }, [all]);
  const siteBounds = useMemo(() => wells.bbox ?? boundsOf(all), [wells.bbox, all]);
  const unanalysedCount = useMemo(() => shown.filter((w) => !hasWellK(w.properties)).length, [shown]);

  const selection = useWellSelection(data, bins.length);
  const { byId, selected: selectedShown, selectedPerBin } = selection;
  const top = useWorkspaceTop();
  const ws = useWorkspace({ site, all, shown, filter, crsUnit, scale, mapRef, kUnit });
  const focused = focusedId !== null && byId.has(focusedId) ? byId.get(focusedId)! : selectedShown.length > 0 ? byId.get(selectedShown[selectedShown.length - 1])! : null;

  const select = useCallback(
    (ids: string[], mode: SelectMode) => {
      selection.select(ids, mode);
      setFocusedId(mode === 'add' ? null : (ids[ids.length - 1] ?? null));
    },
    [selection.select],
  );

  const selectBin = (bin: number, add: boolean) => {
    select(selection.binIds(bin), add ? 'add' : 'replace');
    setFocusedId(null);
  };

  const fitToSite = () => {
    const b = boundsOf(shown) ?? siteBounds;
    if (b) mapRef.current?.fitBounds(b, { padding: fitPadding(), maxZoom: FIT_MAX_ZOOM, duration: 600 });
  };

  const pickWell = (id: string) => {
    select([id], 'replace');
    const w = all.find((f) => f.id === id);
    const map = mapRef.current;
    if (w && map) map.easeTo({ center: w.geometry.coordinates, zoom: Math.max(map.getZoom(), 16), duration: 500 });
  };

  const exportView = async () => {
    const map = mapRef.current?.getMap();
    if (!map) return;
    setExporting(true);
    try {
      const attribution = style.attribution;
      const filters = [
        filter.units ? `units: ${filter.units.map((u) => u || 'no unit given').join(', ')}` : null,
        filter.elevationMinM !== null || filter.elevationMaxM !== null ? 'a screen-elevation range' : null,
      ].filter(Boolean);
      const blob = await renderViewPng(map.getCanvas(), {
        title: `${site.name} — K map`,
        domain,
        scale,
        unit: kUnit,
        unanalysedCount,
        notes: [
          `${count(shown.length)} of ${count(all.length)} wells${filters.length ? `, filtered by ${filters.join(' and ')}` : ''}. Exported ${formatDateTime(new Date().toISOString())}.`,
          attribution ? `Basemap: ${attribution}` : '',
          CAUTIONS[0],
        ].filter(Boolean),
      });
      downloadBlob(blob, `${site.name.replace(/[^\w-]+/g, '-')}-k-map.png`);
    } catch (error) {
      toast.error(describeError(error));
    } finally {
      setExporting(false);
    }
  };

  const panelGap = 'space-y-2 lg:pointer-events-none lg:absolute lg:overflow-y-auto lg:overscroll-contain lg:pb-2';
  return (
    <div
      className="flex flex-col lg:fixed lg:inset-x-0 lg:bottom-0 lg:z-10 lg:bg-white"
      style={top !== null ? { top } : undefined}
      data-testid="kmap-workspace"
    >
      <div className="flex flex-wrap items-center justify-between gap-x-4 gap-y-2 pb-3 lg:border-b lg:border-slate-200 lg:px-4 lg:py-1.5">
        <div className="flex min-w-0 flex-wrap items-baseline gap-x-3 gap-y-1">
          <nav aria-label="Breadcrumb">
            <ol className="flex flex-wrap items-center gap-1 text-sm text-slate-500">
              <li>
                <Link to="/" className="rounded hover:text-accent-700 hover:underline">
                  Sites
                </Link>
              </li>
              <li aria-hidden="true">/</li>
              <li>
                <Link to={`/sites/${site.id}`} className="rounded hover:text-accent-700 hover:underline">
                  {site.name}
                </Link>
              </li>
              <li aria-hidden="true">/</li>
            </ol>
          </nav>
          <h1 className="text-xl font-semibold tracking-tight text-slate-900">K map</h1>
          <p className="hidden text-xs text-slate-600 xl:block">Wells coloured by Well K; click one for what lies behind its colour, shift-drag to select several.</p>
        </div>
        <div className="flex items-center gap-2">
          <ExportMenu siteId={site.id} size="sm" surfaceQuery={ws.wellsUsed >= 2 ? surfaceQueryString(ws.surfaceQuery) : null} />
          <SiteReportButton siteId={site.id} size="sm" />
          <Button variant="secondary" size="sm" pending={exporting} onClick={() => void exportView()}>
            Export view as PNG
          </Button>
        </div>
      </div>

      <div className="relative flex min-h-0 flex-1 flex-col lg:block">
        <h2 id="kmap-map-title" className="sr-only">
          Map of the wells
        </h2>
        <div
          className="relative h-[58vh] min-h-80 overflow-hidden rounded-lg ring-1 ring-slate-200 lg:absolute lg:inset-0 lg:h-auto lg:rounded-none lg:ring-0 lg:[&_.maplibregl-ctrl-top-right]:right-[23rem]! lg:[&_.maplibregl-ctrl-bottom-left]:bottom-[5.75rem]! lg:[&_.maplibregl-ctrl-bottom-left]:left-[21.5rem]!"
          data-testid="kmap-map"
          aria-labelledby="kmap-map-title"
          role="region"
        >
          <KMap
            mapRef={mapRef}
            mapStyle={basemap.styleUrl}
            data={data}
            colour={colour}
            initialBounds={siteBounds}
            hoveredBin={hoveredBin}
            selectedIds={selectedShown}
            onSelect={select}
            visibility={visibility}
            displayUnits={site.displayUnits}
            cursor={cursor}
            hasGlyphs={hasGlyphs}
            onStyleReady={(next) => setStyle((c) => (c.hasGlyphs === next.hasGlyphs && c.attribution === next.attribution ? c : next))}
            labelMinZoom={namesFrom}
            sizes={sizes}
            overlays={<SurfaceOverlays ws={ws} hasGlyphs={hasGlyphs} siteBounds={siteBounds} />}
            onPlace={ws.placing ? ws.placeTrial : null}
            selectionPaused={ws.draw.phase.kind !== 'off'}
          />
          <MapOverlay
            onFitToSite={fitToSite}
            canFit={siteBounds !== null}
            visibility={visibility}
            onVisibilityChange={setVisibility}
            hasLabels={hasGlyphs}
            basemaps={basemapChoices}
            basemapId={basemap.id}
            onBasemapChange={setBasemapId}
          />
        </div>

        {/* On a phone the panels lie in a sheet under the map; on a wide screen they float over it. */}
        <div className="relative z-10 -mx-4 -mt-3 rounded-t-2xl bg-slate-100 px-3 pt-2 pb-4 shadow-[0_-2px_8px_rgba(15,23,42,0.12)] lg:contents" data-testid="kmap-sheet">
          <div aria-hidden="true" className="mx-auto mb-2 h-1 w-10 rounded-full bg-slate-300 lg:hidden" />
          <div className="mb-2 space-y-1 rounded-lg bg-white px-3 py-2 text-xs ring-1 ring-slate-200 lg:absolute lg:bottom-2 lg:left-[21.5rem] lg:right-[23.5rem] lg:z-10 lg:mb-0 lg:bg-white/95 lg:shadow">
            <CursorReadout store={cursor} epsgCode={site.epsgCode} crsName={site.crsName} crsUnit={crsUnit} readK={ws.readK} />
            {style.attribution ? (
              <p className="text-xs text-slate-500" data-testid="kmap-attribution">
                Basemap: {style.attribution}
              </p>
            ) : null}
          </div>
          <div className="flex flex-col gap-2 lg:contents">
            <div className={`${panelGap} lg:top-3 lg:right-3 lg:bottom-2 lg:w-[22rem]`} data-testid="kmap-panels-right">
              <Panel title="Legend" titleId="kmap-legend-title">
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
              </Panel>
              <Panel
                titleId="kmap-selection-title"
                title={selectedShown.length > 1 ? `${selectedShown.length} wells selected` : 'Well'}
                actions={
                  selectedShown.length > 0 ? (
                    <Button variant="ghost" size="sm" onClick={() => select([], 'replace')}>
                      Clear selection
                    </Button>
                  ) : null
                }
              >
                <div className="space-y-4">
                  <WellFinder wells={shown} onPick={pickWell} />
                  {selectedShown.length > 1 ? (
                    <ul aria-label="Selected wells" className="flex max-h-28 flex-wrap gap-1.5 overflow-auto">
                      {selectedShown.map((id) => (
                        <li key={id}>
                          <button
                            type="button"
                            className={`rounded px-2 py-0.5 text-xs ring-1 ${id === focused?.id ? 'bg-slate-900 text-white ring-slate-900' : 'bg-white text-slate-800 ring-slate-300 hover:bg-slate-50'}`}
                            onClick={() => setFocusedId(id)}
                          >
                            {byId.get(id)?.name}
                          </button>
                        </li>
                      ))}
                    </ul>
                  ) : null}
                  {focused ? (
                    <WellPanel key={focused.id} siteId={site.id} well={focused} units={site.displayUnits} kUnit={kUnit} />
                  ) : (
                    <p className="text-sm text-slate-600">Click a well on the map, or find one by name, to see its Well K, screen, construction and fits.</p>
                  )}
                </div>
              </Panel>
              <Panel title="Filters" titleId="kmap-filters-title">
                <KMapFilters filter={filter} onChange={setFilter} units={units} displayUnits={site.displayUnits} shown={shown.length} total={all.length} />
              </Panel>
              <Panel title="Cautions" titleId="kmap-cautions-title" defaultOpen={false} testId="kmap-cautions">
                <div className="space-y-1.5 text-xs leading-relaxed text-amber-950">
                  <p className="font-medium">What a colour on this map does and does not say:</p>
                  {CAUTIONS.map((c) => (
                    <p key={c}>{c}</p>
                  ))}
                </div>
              </Panel>
            </div>

            <div className={`${panelGap} lg:top-14 lg:left-3 lg:bottom-2 lg:w-80`} data-testid="kmap-panels-left">
              <Panel title="K surface" titleId="ksurface-title" defaultOpen={false} testId="ksurface-section">
                <SurfacePanel
                  settings={ws.effectiveSettings}
                  onChange={ws.setSettings}
                  outlines={ws.outlines}
                  state={ws.surface}
                  wellsUsed={ws.wellsUsed}
                  stats={ws.stats}
                  zones={ws.zones}
                  onExportZones={ws.exportZones}
                  kUnit={kUnit}
                  displayUnits={site.displayUnits}
                  gridLabel={ws.gridCrs?.label ?? null}
                  renderMs={ws.renderMs}
                />
              </Panel>
              <Panel title="Cross-validation" titleId="kcv-title" defaultOpen={false} testId="kcv-section" onOpenChange={ws.setCvOpen}>
                <CrossValidationPanel
                  cv={ws.cv.data}
                  pending={ws.cv.isFetching}
                  shown={ws.effectiveSettings.show}
                  error={ws.cv.error ? describeError(ws.cv.error) : null}
                  power={ws.effectiveSettings.power}
                  onUsePower={(power) => ws.setSettings({ ...ws.effectiveSettings, power })}
                  kUnit={kUnit}
                  displayUnits={site.displayUnits}
                  epsgCode={site.epsgCode}
                />
              </Panel>
              <Panel title="Outlines" titleId="koutlines-title" defaultOpen={false} testId="koutlines-section">
                <OutlinesPanel
                  siteId={site.id}
                  siteCrsLabel={`EPSG:${site.epsgCode}`}
                  outlines={ws.outlines}
                  canEdit={canEdit}
                  displayUnits={site.displayUnits}
                  draw={ws.draw}
                  chosenId={ws.effectiveSettings.outlineId}
                  onChoose={(outlineId) => ws.setSettings({ ...ws.effectiveSettings, outlineId })}
                />
              </Panel>
              <Panel title="Capture sketches" titleId="ksketch-title" defaultOpen={false} testId="ksketch-section">
                <SketchPanel
                  siteId={site.id}
                  canEdit={canEdit}
                  epsgCode={site.epsgCode}
                  placing={ws.placing}
                  onPlacingChange={ws.setPlacing}
                  trial={ws.trial}
                  onTrialChange={ws.setTrial}
                  fromSite={ws.fromSite}
                  surface={ws.surfaceQuery}
                  sketches={ws.sketches}
                  hidden={ws.hiddenSketches}
                  onToggleHidden={ws.toggleSketch}
                  wells={shown}
                  kUnit={kUnit}
                  displayUnits={site.displayUnits}
                />
              </Panel>
            </div>
          </div>
        </div>
      </div>
    </div>
  );
}

