import type {
  CircleLayerSpecification,
  FillLayerSpecification,
  LineLayerSpecification,
  RasterLayerSpecification,
  SymbolLayerSpecification,
} from 'maplibre-gl';
import { LABEL_FONT } from '../layers';

/*
 * The workspace's layers over the basemap and under the wells, bottom to top: the K surface,
 * outlines, high-K zones, capture sketches, leave-one-out rings and next-test spots. Each is added
 * just below the wells' lowest layer, in this order, so the order holds whatever mounts later.
 */

export const SOURCES = {
  surface: 'ksurface-image',
  outlines: 'ksurface-outlines',
  zones: 'ksurface-zones',
  sketches: 'ksurface-sketches',
  trial: 'ksurface-trial',
  cvRings: 'ksurface-cv-rings',
  spots: 'ksurface-next-spots',
} as const;

export const COLOURS = {
  outline: '#0f766e',
  zone: '#c026d3',
  envelope: '#2563eb',
  stagnation: '#1d4ed8',
  trial: '#dc2626',
  overPredicted: '#b91c1c',
  underPredicted: '#1d4ed8',
  spot: '#0f172a',
} as const;

type On<T, S extends string> = Omit<T, 'source'> & { source: S };

export const surfaceLayer: On<RasterLayerSpecification, typeof SOURCES.surface> = {
  id: 'ksurface-raster',
  type: 'raster',
  source: SOURCES.surface,
  // Nearest: each cell keeps the scale's colour for its value, as the legend shows it.
  paint: { 'raster-opacity': 0.75, 'raster-resampling': 'nearest', 'raster-fade-duration': 0 },
};

export const outlineFillLayer: On<FillLayerSpecification, typeof SOURCES.outlines> = {
  id: 'ksurface-outline-fill',
  type: 'fill',
  source: SOURCES.outlines,
  // Under a shown surface the fill would tint its colours away from the legend's: the chosen outline is a line only.
  paint: { 'fill-color': COLOURS.outline, 'fill-opacity': ['case', ['boolean', ['get', 'chosen'], false], 0, 0.08] },
};

export const outlineLineLayer: On<LineLayerSpecification, typeof SOURCES.outlines> = {
  id: 'ksurface-outline-line',
  type: 'line',
  source: SOURCES.outlines,
  paint: { 'line-color': COLOURS.outline, 'line-width': ['case', ['boolean', ['get', 'chosen'], false], 3, 1.75] },
};

export const outlineLabelLayer: On<SymbolLayerSpecification, typeof SOURCES.outlines> = {
  id: 'ksurface-outline-labels',
  type: 'symbol',
  source: SOURCES.outlines,
  layout: { 'text-field': ['get', 'name'], 'text-font': LABEL_FONT, 'text-size': 13, 'symbol-placement': 'point' },
  paint: { 'text-color': COLOURS.outline, 'text-halo-color': '#ffffff', 'text-halo-width': 1.5 },
};

export const zoneCasingLayer: On<LineLayerSpecification, typeof SOURCES.zones> = {
  id: 'ksurface-zone-casing',
  type: 'line',
  source: SOURCES.zones,
  paint: { 'line-color': '#ffffff', 'line-width': 4.5 },
};

export const zoneLineLayer: On<LineLayerSpecification, typeof SOURCES.zones> = {
  id: 'ksurface-zone-line',
  type: 'line',
  source: SOURCES.zones,
  paint: { 'line-color': COLOURS.zone, 'line-width': 2.5, 'line-dasharray': [2, 1] },
};

export const envelopeFillLayer: On<FillLayerSpecification, typeof SOURCES.sketches> = {
  id: 'ksurface-envelope-fill',
  type: 'fill',
  source: SOURCES.sketches,
  filter: ['==', ['get', 'kind'], 'envelope'],
  paint: { 'fill-color': COLOURS.envelope, 'fill-opacity': 0.15 },
};

export const envelopeLineLayer: On<LineLayerSpecification, typeof SOURCES.sketches> = {
  id: 'ksurface-envelope-line',
  type: 'line',
  source: SOURCES.sketches,
  filter: ['==', ['get', 'kind'], 'envelope'],
  paint: { 'line-color': COLOURS.envelope, 'line-width': 2 },
};

export const sketchPointsLayer: On<CircleLayerSpecification, typeof SOURCES.sketches> = {
  id: 'ksurface-sketch-points',
  type: 'circle',
  source: SOURCES.sketches,
  filter: ['in', ['get', 'kind'], ['literal', ['well', 'stagnation']]],
  paint: {
    'circle-radius': ['case', ['==', ['get', 'kind'], 'well'], 6, 4.5],
    'circle-color': ['case', ['==', ['get', 'kind'], 'well'], COLOURS.trial, '#ffffff'],
    'circle-stroke-color': ['case', ['==', ['get', 'kind'], 'well'], '#ffffff', COLOURS.stagnation],
    'circle-stroke-width': 2.5,
  },
};

export const trialLayer: On<CircleLayerSpecification, typeof SOURCES.trial> = {
  id: 'ksurface-trial-well',
  type: 'circle',
  source: SOURCES.trial,
  paint: { 'circle-radius': 7, 'circle-color': COLOURS.trial, 'circle-opacity': 0.35, 'circle-stroke-color': COLOURS.trial, 'circle-stroke-width': 2.5 },
};

/** A ring around each well as wide as its leave-one-out error: red where the surface over-predicts it, blue where it under-predicts. */
export const cvRingLayer: On<CircleLayerSpecification, typeof SOURCES.cvRings> = {
  id: 'ksurface-cv-rings',
  type: 'circle',
  source: SOURCES.cvRings,
  paint: {
    'circle-radius': ['+', 9, ['*', 14, ['min', 1.5, ['abs', ['get', 'errorLog10']]]]],
    'circle-opacity': 0,
    'circle-stroke-color': ['case', ['>', ['get', 'errorLog10'], 0], COLOURS.overPredicted, COLOURS.underPredicted],
    'circle-stroke-width': 2,
    'circle-stroke-opacity': 0.85,
  },
};

export const spotCircleLayer: On<CircleLayerSpecification, typeof SOURCES.spots> = {
  id: 'ksurface-spot-circles',
  type: 'circle',
  source: SOURCES.spots,
  paint: { 'circle-radius': 9, 'circle-color': '#ffffff', 'circle-stroke-color': COLOURS.spot, 'circle-stroke-width': 2 },
};

export const spotLabelLayer: On<SymbolLayerSpecification, typeof SOURCES.spots> = {
  id: 'ksurface-spot-labels',
  type: 'symbol',
  source: SOURCES.spots,
  layout: { 'text-field': ['to-string', ['get', 'rank']], 'text-font': ['Roboto Flex Bold'], 'text-size': 12, 'text-allow-overlap': true, 'text-ignore-placement': true },
  paint: { 'text-color': COLOURS.spot },
};
