import { useEffect, useMemo } from 'react';
import { Layer, Source, useMap, type SourceProps } from 'react-map-gl/maplibre';
import type { CanvasSource } from 'maplibre-gl';
import type { Feature, FeatureCollection, Geometry } from 'geojson';
import { LAYER_IDS } from '../layers';
import {
  cvRingLayer,
  envelopeFillLayer,
  envelopeLineLayer,
  outlineFillLayer,
  outlineLabelLayer,
  outlineLineLayer,
  sketchPointsLayer,
  SOURCES,
  spotCircleLayer,
  spotLabelLayer,
  surfaceLayer,
  trialLayer,
  zoneCasingLayer,
  zoneLineLayer,
} from './layers';
import type { Workspace } from './use-workspace';

export type Corners = [[number, number], [number, number], [number, number], [number, number]];
/** react-map-gl's types leave out canvas sources, which it passes through to maplibre all the same. */
const canvasSource = (canvas: HTMLCanvasElement, coordinates: Corners) => ({ type: 'canvas', canvas, animate: false, coordinates }) as unknown as SourceProps;
const EMPTY: FeatureCollection = { type: 'FeatureCollection', features: [] };
const BELOW_WELLS = LAYER_IDS.selectedHalo;
const visible = (on: boolean) => ({ visibility: (on ? 'visible' : 'none') as 'visible' | 'none' });

/** What the sketch layers draw of a capture sketch: its envelope, stagnation point and well. */
interface DrawnSketch {
  name: string;
  lon: number;
  lat: number;
  results: { envelope: Geometry; stagnationPoint: { lon: number; lat: number } };
}

/** The capture sketches as the sketch layers' features (envelope, stagnation point, trial well). */
export function sketchesCollection(sketches: readonly DrawnSketch[]): FeatureCollection {
  const features: Feature[] = [];
  for (const k of sketches) {
    features.push({ type: 'Feature', geometry: k.results.envelope, properties: { kind: 'envelope', name: k.name } });
    features.push({ type: 'Feature', geometry: { type: 'Point', coordinates: [k.results.stagnationPoint.lon, k.results.stagnationPoint.lat] }, properties: { kind: 'stagnation', name: k.name } });
    features.push({ type: 'Feature', geometry: { type: 'Point', coordinates: [k.lon, k.lat] }, properties: { kind: 'well', name: k.name } });
  }
  return { type: 'FeatureCollection', features };
}

/** The site's box as a canvas source's corners, where the surface source waits before a surface exists. */
export function useBlankCorners(siteBounds: [number, number, number, number] | null): Corners {
  const [w, s, e, n] = siteBounds ?? [0, 0, 1, 1];
  return useMemo(
    () =>
      [
        [w, n],
        [e, n],
        [e, s],
        [w, s],
      ] as Corners,
    [w, s, e, n],
  );
}

/** The workspace's sources and layers, all under the wells and in a fixed order. */
export function SurfaceOverlays({ ws, hasGlyphs, siteBounds }: { ws: Workspace; hasGlyphs: boolean; siteBounds: [number, number, number, number] | null }) {
  const blankCorners = useBlankCorners(siteBounds);
  const outlines = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: ws.outlines.map((o) => ({ type: 'Feature', id: o.id, geometry: o.geometry as Geometry, properties: { name: o.name, chosen: ws.effectiveSettings.show && o.id === ws.chosenOutlineId } })),
    }),
    [ws.outlines, ws.chosenOutlineId, ws.effectiveSettings.show],
  );
  const editingId = ws.draw.phase.kind === 'editing' ? ws.draw.phase.outlineId : null;
  const outlinesShown = useMemo<FeatureCollection>(
    () => (editingId ? { ...outlines, features: outlines.features.filter((f) => f.id !== editingId) } : outlines),
    [outlines, editingId],
  );
  const sketches = useMemo(() => sketchesCollection(ws.sketches.filter((k) => !ws.hiddenSketches.has(k.id))), [ws.sketches, ws.hiddenSketches]);
  const trial = useMemo<FeatureCollection>(
    () => (ws.trial ? { type: 'FeatureCollection', features: [{ type: 'Feature', geometry: { type: 'Point', coordinates: [ws.trial.lon, ws.trial.lat] }, properties: {} }] } : EMPTY),
    [ws.trial],
  );

  return (
    <>
      <SurfaceImage image={ws.image} blankCorners={blankCorners} opacity={ws.opacity} />
      <Source id={SOURCES.outlines} type="geojson" data={outlinesShown}>
        <Layer {...outlineFillLayer} beforeId={BELOW_WELLS} />
        <Layer {...outlineLineLayer} beforeId={BELOW_WELLS} />
        {hasGlyphs ? <Layer {...outlineLabelLayer} beforeId={BELOW_WELLS} /> : null}
      </Source>
      <Source id={SOURCES.zones} type="geojson" data={ws.zones ?? EMPTY}>
        <Layer {...zoneCasingLayer} beforeId={BELOW_WELLS} />
        <Layer {...zoneLineLayer} beforeId={BELOW_WELLS} />
      </Source>
      <Source id={SOURCES.sketches} type="geojson" data={sketches}>
        <Layer {...envelopeFillLayer} beforeId={BELOW_WELLS} />
        <Layer {...envelopeLineLayer} beforeId={BELOW_WELLS} />
        <Layer {...sketchPointsLayer} beforeId={BELOW_WELLS} />
      </Source>
      <Source id={SOURCES.trial} type="geojson" data={trial}>
        <Layer {...trialLayer} beforeId={BELOW_WELLS} />
      </Source>
      <Source id={SOURCES.cvRings} type="geojson" data={ws.cvRings}>
        <Layer {...cvRingLayer} beforeId={BELOW_WELLS} />
      </Source>
      <Source id={SOURCES.spots} type="geojson" data={ws.spots}>
        <Layer {...spotCircleLayer} beforeId={BELOW_WELLS} />
        {hasGlyphs ? <Layer {...spotLabelLayer} beforeId={BELOW_WELLS} /> : null}
      </Source>
    </>
  );
}

/** A painted K surface: RGBA pixels, one per cell, and the grid's corners in WGS84. */
export interface SurfaceImageData {
  pixels: Uint8ClampedArray<ArrayBuffer>;
  cols: number;
  rows: number;
  corners: Corners;
}

/** The K surface as a raster under the wells; `blankCorners` place the empty source before a surface exists. */
export function SurfaceImage({ image, blankCorners, opacity, shown = true }: { image: SurfaceImageData | null; blankCorners: Corners; opacity: number; shown?: boolean }) {
  const { current: map } = useMap();
  /*
   * A canvas source, one pixel per cell: no image URL to fetch (the page's CSP allows no data: fetch) and
   * no PNG to encode. It exists from the start, so the layers' order never changes; after each
   * repaint the source plays for two frames, which uploads the canvas to its texture.
   */
  const canvas = useMemo(() => {
    const c = document.createElement('canvas');
    c.width = 1;
    c.height = 1;
    return c;
  }, []);
  useEffect(() => {
    if (!image) return;
    canvas.width = image.cols;
    canvas.height = image.rows;
    canvas.getContext('2d')?.putImageData(new ImageData(image.pixels, image.cols, image.rows), 0, 0);
    const source = map?.getMap().getSource(SOURCES.surface) as CanvasSource | undefined;
    if (!source) return;
    source.play();
    let frame = requestAnimationFrame(() => {
      frame = requestAnimationFrame(() => source.pause());
    });
    return () => {
      cancelAnimationFrame(frame);
      source.pause();
    };
  }, [image, canvas, map]);
  const paint = useMemo(() => ({ ...surfaceLayer.paint, 'raster-opacity': opacity }), [opacity]);
  return (
    <Source id={SOURCES.surface} {...canvasSource(canvas, image?.corners ?? blankCorners)}>
      <Layer {...surfaceLayer} paint={paint} layout={visible(image !== null && shown)} beforeId={BELOW_WELLS} />
    </Source>
  );
}
