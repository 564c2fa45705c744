import { useCallback, useMemo, useRef, useState } from 'react';
import type { MapRef } from 'react-map-gl/maplibre';
import type { StyleSpecification } from 'maplibre-gl';
import type { MapWells } from '@shared/schemas/map';
import type { Site } from '@shared/schemas/sites';
import { CAUTIONS } from '@shared/cautions';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
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
import { FIT_MAX_ZOOM, FIT_PADDING, KMap, type LayerVisibility, type SelectMode } from './k-map';
import { KLegend } from './k-legend';
import { KMapFilters } from './k-map-filters';
import { MapOverlay } from './map-overlay';
import { WellFinder } from './well-finder';
import { WellPanel } from './well-panel';

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
}

export function KMapPage({ site, wells, crsUnit, basemaps }: Props) {
  const toast = useToast();
  const mapRef = useRef<MapRef>(null);
  const cursor = useMemo(() => createCursorStore(), []);
  const [kUnit, setKUnit] = useSessionState(`kfield.kmap.kUnit.${site.id}`, defaultMapKUnit(site.displayUnits), isMapKUnit);
  const [filter, setFilter] = useState<KMapFilter>(NO_FILTER);
  const [hoveredBin, setHoveredBin] = useState(-1);
  const [selectedIds, setSelectedIds] = useState<string[]>([]);
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

  const byId = useMemo(() => new Map(data.features.map((f) => [f.properties.id, f.properties])), [data]);
  const selectedShown = useMemo(() => selectedIds.filter((id) => byId.has(id)), [selectedIds, byId]);
  const selectedPerBin = useMemo(() => {
    const counts = Array.from({ length: bins.length }, () => 0);
    for (const id of selectedShown) {
      const bin = byId.get(id)?.bin ?? -1;
      if (bin >= 0) counts[bin]++;
    }
    return counts;
  }, [selectedShown, byId, bins.length]);
  const focused = focusedId !== null && byId.has(focusedId) ? byId.get(focusedId)! : selectedShown.length > 0 ? byId.get(selectedShown[selectedShown.length - 1])! : null;

  const select = useCallback((ids: string[], mode: SelectMode) => {
    setSelectedIds((current) => {
      if (mode === 'replace') return ids;
      if (mode === 'add') return [...new Set([...current, ...ids])];
      const next = new Set(current);
      for (const id of ids) {
        if (next.has(id)) next.delete(id);
        else next.add(id);
      }
      return [...next];
    });
    setFocusedId(mode === 'add' ? null : (ids[ids.length - 1] ?? null));
  }, []);

  const selectBin = (bin: number, add: boolean) => {
    const ids = data.features.filter((f) => f.properties.bin === bin).map((f) => f.properties.id);
    select(ids, add ? 'add' : 'replace');
    setFocusedId(null);
  };

  const fitToSite = () => {
    const b = boundsOf(shown) ?? siteBounds;
    if (b) mapRef.current?.fitBounds(b, { padding: FIT_PADDING, maxZoom: FIT_MAX_ZOOM, duration: 600 });
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

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-start justify-between gap-x-4 gap-y-2">
        <p className="min-w-0 flex-1 basis-80 text-sm text-slate-600">
          Each well is coloured by its Well K, the geometric mean of its Checked fits. Click a well for what lies behind its colour; shift-click or
          shift-drag to select several.
        </p>
        <Button variant="secondary" size="sm" pending={exporting} onClick={() => void exportView()}>
          Export view as PNG
        </Button>
      </div>
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <Card aria-labelledby="kmap-map-title" className="overflow-hidden lg:sticky lg:top-4 lg:self-start">
          <h2 id="kmap-map-title" className="sr-only">
            Map of the wells
          </h2>
          <div className="relative h-[62vh] min-h-80 lg:h-[640px]" data-testid="kmap-map">
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
          <div className="space-y-1.5 border-t border-slate-200 px-4 py-2">
            <CursorReadout store={cursor} epsgCode={site.epsgCode} crsName={site.crsName} crsUnit={crsUnit} />
            {style.attribution ? (
              <p className="text-xs text-slate-500" data-testid="kmap-attribution">
                Basemap: {style.attribution}
              </p>
            ) : null}
          </div>
        </Card>

        <div className="space-y-4">
          <Card aria-labelledby="kmap-legend-title">
            <h2 id="kmap-legend-title" className="sr-only">
              Legend and histogram
            </h2>
            <CardBody>
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
            </CardBody>
          </Card>

          <Card aria-labelledby="kmap-selection-title">
            <CardHeader
              titleId="kmap-selection-title"
              title={selectedShown.length > 1 ? `${selectedShown.length} wells selected` : 'Well'}
              actions={
                selectedShown.length > 0 ? (
                  <Button variant="ghost" size="sm" onClick={() => select([], 'replace')}>
                    Clear selection
                  </Button>
                ) : null
              }
            />
            <CardBody className="space-y-4">
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
            </CardBody>
          </Card>

          <Card aria-labelledby="kmap-filters-title">
            <CardHeader titleId="kmap-filters-title" title="Filters" />
            <CardBody>
              <KMapFilters filter={filter} onChange={setFilter} units={units} displayUnits={site.displayUnits} shown={shown.length} total={all.length} />
            </CardBody>
          </Card>
        </div>
      </div>

      <details className="rounded-lg bg-amber-50 px-4 py-3 text-sm text-amber-950 ring-1 ring-amber-200" data-testid="kmap-cautions">
        <summary className="cursor-pointer font-medium">Cautions: what a colour on this map does and does not say</summary>
        <div className="mt-2 space-y-1.5 leading-relaxed">
          {CAUTIONS.map((c) => (
            <p key={c}>{c}</p>
          ))}
        </div>
      </details>
    </div>
  );
}
