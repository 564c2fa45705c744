import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode, type Ref } from 'react';
import MapView, { Layer, NavigationControl, ScaleControl, Source, useMap, type MapLayerMouseEvent, type MapRef } from 'react-map-gl/maplibre';
import type { ExpressionSpecification, MapMouseEvent, StyleSpecification } from 'maplibre-gl';
import type { FeatureCollection, Point } from 'geojson';
import type { DisplayUnits } from '@shared/schemas/sites';
import { maplibre } from '@/lib/maplibre-init';
import { WELL_LAYER_IDS, WELLS_SOURCE, binHighlightLayer, labelsFilter, labelsLayer, selectedLayers, unanalysedLayer, wellsLayer, type WellSizes } from '../layers';
import type { SourceWellProperties } from '../model';
import type { CursorStore } from './cursor-store';

export type Bounds = [number, number, number, number];
export type SelectMode = 'replace' | 'toggle' | 'add';

export interface LayerVisibility {
  wells: boolean;
  unanalysed: boolean;
  labels: boolean;
}

export interface KMapProps {
  mapRef: Ref<MapRef>;
  mapStyle: string | StyleSpecification;
  data: FeatureCollection<Point, SourceWellProperties>;
  colour: ExpressionSpecification;
  /** Where the map opens: the site's wells. */
  initialBounds: Bounds | null;
  hoveredBin: number;
  selectedIds: readonly string[];
  /** A click picks the wells under the pointer (or none); shift-click adds or removes them; a shift-drag box adds its wells. */
  onSelect: (ids: string[], mode: SelectMode) => void;
  visibility: LayerVisibility;
  displayUnits: DisplayUnits;
  cursor: CursorStore;
  /** Called when a style has loaded: whether it has glyphs (for the names) and its sources' attributions. */
  onStyleReady: (style: { hasGlyphs: boolean; attribution: string }) => void;
  hasGlyphs: boolean;
  /** The zoom from which well names are drawn. */
  labelMinZoom: number;
  /** Circle sizes for the network's density. */
  sizes: WellSizes;
  /** Sources and layers drawn under the wells (surface, outlines, sketches): added after the wells, placed below them. */
  overlays?: ReactNode;
  /** When set, a click places a point (a trial well) instead of selecting wells. */
  onPlace?: ((lon: number, lat: number) => void) | null;
  /** While drawing an outline a click belongs to the drawing, not to the selection. */
  selectionPaused?: boolean;
  /** The padding the site is fitted with at start (default: room for the workspace's floating panels). */
  padding?: number;
}

export const FIT_PADDING = 48;

/** On a wide screen the panels float over the map's sides: the site is fitted into the space between them. */
export function fitPadding(): number | { top: number; bottom: number; left: number; right: number } {
  if (typeof window === 'undefined' || !window.matchMedia('(min-width: 1024px)').matches) return FIT_PADDING;
  return { top: FIT_PADDING + 8, bottom: FIT_PADDING + 72, left: 21 * 16 + 24, right: 23 * 16 + 16 };
}
export const FIT_MAX_ZOOM = 17;

const visible = (on: boolean) => (on ? 'visible' : 'none') as 'visible' | 'none';

/** The K map: basemap, wells coloured by Well K, unanalysed wells apart, names at close zooms. */
export function KMap(props: KMapProps) {
  const { mapRef, mapStyle, data, colour, initialBounds, hoveredBin, selectedIds, onSelect, visibility, displayUnits, cursor, onStyleReady, hasGlyphs, labelMinZoom, sizes } =
    props;
  const { overlays, onPlace = null, selectionPaused = false, padding } = props;
  // data-map-state says when the map has finished drawing (browser tests wait for "idle").
  const [state, setState] = useState<'loading' | 'idle'>('loading');

  const onClick = useCallback(
    (e: MapLayerMouseEvent) => {
      // A tap has no hover: the read-out follows the tap.
      cursor.set({ lon: e.lngLat.lng, lat: e.lngLat.lat });
      if (onPlace) {
        onPlace(e.lngLat.lng, e.lngLat.lat);
        return;
      }
      if (selectionPaused) return;
      // Every well under the pointer: nested wells (a shallow and a deep screen) share one spot.
      const ids = [...new Set((e.features ?? []).map((f) => String(f.properties.id)))];
      const shift = e.originalEvent.shiftKey;
      if (ids.length === 0 && shift) return;
      onSelect(ids, shift ? 'toggle' : 'replace');
    },
    [onSelect, cursor, onPlace, selectionPaused],
  );

  // Fresh layer objects only when their content changes: react-map-gl then leaves the map alone.
  const [halo, ring] = useMemo(() => selectedLayers(selectedIds, sizes), [selectedIds, sizes]);
  const wells = useMemo(() => wellsLayer(colour, sizes), [colour, sizes]);
  const unanalysed = useMemo(() => unanalysedLayer(sizes), [sizes]);
  const highlight = useMemo(() => binHighlightLayer(hoveredBin, sizes), [hoveredBin, sizes]);

  return (
    <div className={onPlace ? 'absolute inset-0 [&_canvas]:cursor-crosshair' : 'absolute inset-0'} data-map-state={state} data-testid="kmap-view">
      <MapView
        ref={mapRef}
        mapLib={maplibre}
        mapStyle={mapStyle}
        initialViewState={
          initialBounds
            ? { bounds: initialBounds, fitBoundsOptions: { padding: padding ?? fitPadding(), maxZoom: FIT_MAX_ZOOM } }
            : { longitude: 0, latitude: 20, zoom: 1.5 }
        }
        style={{ width: '100%', height: '100%' }}
        canvasContextAttributes={{ preserveDrawingBuffer: true }}
        interactiveLayerIds={WELL_LAYER_IDS}
        onClick={onClick}
        boxZoom={false}
        dragRotate={false}
        pitchWithRotate={false}
        touchPitch={false}
        maxZoom={19}
        // The basemap's attribution is written under the map, where it covers nothing on a phone.
        attributionControl={false}
        onStyleData={(e) => onStyleReady(describeStyle(e.target.getStyle()))}
        onMoveStart={() => setState('loading')}
        onData={() => setState('loading')}
        onIdle={() => setState('idle')}
      >
        <NavigationControl position="top-right" showCompass={false} />
        <ScaleControl position="bottom-left" unit={displayUnits === 'US' ? 'imperial' : 'metric'} maxWidth={120} />
        {/* Tiled up to zoom 14 and over-zoomed beyond: zooming in on 20,000 wells re-tiles nothing. */}
        <Source id={WELLS_SOURCE} type="geojson" data={data} promoteId="id" maxzoom={14} buffer={16}>
          <Layer {...halo} layout={{ visibility: visible(visibility.wells || visibility.unanalysed) }} />
          <Layer {...unanalysed} layout={{ visibility: visible(visibility.unanalysed) }} />
          <Layer {...wells} layout={{ visibility: visible(visibility.wells) }} />
          <Layer {...highlight} layout={{ visibility: visible(hoveredBin >= 0) }} />
          <Layer {...ring} layout={{ visibility: visible(visibility.wells || visibility.unanalysed) }} />
          {hasGlyphs ? (
            <Layer
              {...labelsLayer}
              minzoom={labelMinZoom}
              filter={labelsFilter(visibility.wells, visibility.unanalysed)}
              layout={{ ...labelsLayer.layout, visibility: visible(visibility.labels) }}
            />
          ) : null}
        </Source>
        {overlays}
        <PointerTracker cursor={cursor} />
        <BoxSelect onSelect={(ids) => onSelect(ids, 'add')} />
      </MapView>
    </div>
  );
}

/**
 * The pointer's position for the read-out, and a hand over a well. Outside React state and not
 * while the map moves: a pan over thousands of wells then costs no feature queries.
 */
function PointerTracker({ cursor }: { cursor: CursorStore }) {
  const { current: map } = useMap();
  useEffect(() => {
    if (!map) return;
    const m = map.getMap();
    const canvas = m.getCanvas();
    let frame = 0;
    let last: MapMouseEvent | null = null;
    const update = () => {
      frame = 0;
      if (!last) return;
      cursor.set({ lon: last.lngLat.lng, lat: last.lngLat.lat });
      if (m.isMoving()) return;
      const layers = WELL_LAYER_IDS.filter((id) => m.getLayer(id));
      const over = layers.length > 0 && m.queryRenderedFeatures(last.point, { layers }).length > 0;
      canvas.style.cursor = over ? 'pointer' : '';
    };
    const onMove = (e: MapMouseEvent) => {
      last = e;
      frame ||= requestAnimationFrame(update);
    };
    const onOut = () => {
      last = null;
      cursor.set(null);
      canvas.style.cursor = '';
    };
    m.on('mousemove', onMove);
    m.on('mouseout', onOut);
    return () => {
      m.off('mousemove', onMove);
      m.off('mouseout', onOut);
      if (frame) cancelAnimationFrame(frame);
    };
  }, [map, cursor]);
  return null;
}

/** Whether a style can draw text, and the attributions of its sources (each once). */
function describeStyle(style: StyleSpecification | undefined): { hasGlyphs: boolean; attribution: string } {
  // Sources of one tileset often repeat each other's credits ("A · B" and "A"): each part once.
  const parts = new Map<string, string>();
  for (const source of Object.values(style?.sources ?? {})) {
    const a = 'attribution' in source ? source.attribution : undefined;
    for (const part of (a ?? '').split(/\s+·\s+/)) {
      const text = part.trim();
      if (text && !parts.has(text.toLowerCase())) parts.set(text.toLowerCase(), text);
    }
  }
  return { hasGlyphs: Boolean(style?.glyphs), attribution: [...parts.values()].join(' · ') };
}

/** Shift-drag draws a box; the wells inside it join the selection. */
function BoxSelect({ onSelect }: { onSelect: (ids: string[]) => void }) {
  const { current: map } = useMap();
  const [box, setBox] = useState<{ x0: number; y0: number; x1: number; y1: number } | null>(null);
  const onSelectRef = useRef(onSelect);
  onSelectRef.current = onSelect;

  useEffect(() => {
    if (!map) return;
    const m = map.getMap();
    const container = m.getCanvasContainer();
    let start: { x: number; y: number } | null = null;
    const local = (e: MouseEvent) => {
      const r = container.getBoundingClientRect();
      return { x: e.clientX - r.left, y: e.clientY - r.top };
    };
    const onMove = (e: MouseEvent) => {
      if (!start) return;
      const p = local(e);
      setBox({ x0: start.x, y0: start.y, x1: p.x, y1: p.y });
    };
    const onUp = (e: MouseEvent) => {
      document.removeEventListener('mousemove', onMove);
      document.removeEventListener('mouseup', onUp);
      m.dragPan.enable();
      if (!start) return;
      const p = local(e);
      const a = start;
      start = null;
      setBox(null);
      if (Math.abs(p.x - a.x) < 3 && Math.abs(p.y - a.y) < 3) return;
      const layers = WELL_LAYER_IDS.filter((id) => m.getLayer(id));
      const features = m.queryRenderedFeatures(
        [
          [Math.min(a.x, p.x), Math.min(a.y, p.y)],
          [Math.max(a.x, p.x), Math.max(a.y, p.y)],
        ],
        { layers },
      );
      onSelectRef.current([...new Set(features.map((f) => String(f.properties.id)))]);
    };
    const onDown = (e: MouseEvent) => {
      if (!e.shiftKey || e.button !== 0) return;
      e.preventDefault();
      m.dragPan.disable();
      start = local(e);
      document.addEventListener('mousemove', onMove);
      document.addEventListener('mouseup', onUp);
    };
    container.addEventListener('mousedown', onDown, true);
    return () => {
      container.removeEventListener('mousedown', onDown, true);
      document.removeEventListener('mousemove', onMove);
      document.removeEventListener('mouseup', onUp);
    };
  }, [map]);

  if (!box) return null;
  return (
    <div
      aria-hidden="true"
      className="pointer-events-none absolute border-2 border-slate-900 bg-slate-900/10"
      style={{ left: Math.min(box.x0, box.x1), top: Math.min(box.y0, box.y1), width: Math.abs(box.x1 - box.x0), height: Math.abs(box.y1 - box.y0) }}
    />
  );
}

