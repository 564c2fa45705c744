import type { CircleLayerSpecification, ExpressionSpecification, FilterSpecification, SymbolLayerSpecification } from 'maplibre-gl';

/*
 * Every layer the K map adds over the basemap, bottom to top. Interactivity is by layer id
 * (WELL_LAYER_IDS); the colour of the K layer is the legend's scale (colour.ts), set at render.
 */

export const WELLS_SOURCE = 'kmap-wells';

export const LAYER_IDS = {
  selectedHalo: 'kmap-selected-halo',
  unanalysed: 'kmap-wells-unanalysed',
  wells: 'kmap-wells-k',
  binHighlight: 'kmap-bin-highlight',
  selectedRing: 'kmap-selected-ring',
  labels: 'kmap-well-labels',
} as const;

/** The layers a click, a hover or a box selection picks wells from. */
export const WELL_LAYER_IDS: string[] = [LAYER_IDS.wells, LAYER_IDS.unanalysed];

/** Zooms at which the well sizes are given; maplibre interpolates between them (base 2, like the map's scale). */
const SIZE_ZOOMS = [8, 10, 12, 13, 14, 15, 16, 17, 18, 20];
/** Well radius in pixels by zoom: small dots for a whole network, bigger ones on a close view. */
const BASE_RADIUS: Record<number, number> = { 8: 2, 10: 2.25, 12: 2.5, 13: 3, 14: 3.5, 15: 5, 16: 7, 17: 8.5, 18: 10, 20: 12 };
/** A well may take this share of the gap to its neighbours (as a radius), so a dense network does not merge into a blot. */
const RADIUS_PER_SPACING = 0.4;
const MIN_RADIUS = 2;
/** Below this radius a dot has no outline: its fill would be hidden under it. */
const OUTLINE_FROM_RADIUS = 3;

/** Well radii in pixels at SIZE_ZOOMS. */
export interface WellSizes {
  radii: number[];
}

/**
 * Well radii for a network whose wells are `spacingPx(zoom)` pixels apart: the base size, shrunk
 * where the wells would otherwise overlap (which also keeps 20,000 wells cheap to draw).
 */
export function wellSizes(spacingPx: ((zoom: number) => number) | null): WellSizes {
  return {
    radii: SIZE_ZOOMS.map((z) => (spacingPx ? Math.min(BASE_RADIUS[z], Math.max(MIN_RADIUS, RADIUS_PER_SPACING * spacingPx(z))) : BASE_RADIUS[z])),
  };
}

/** A paint value by zoom from the well radius: sizes grow by powers of two like the map, others linearly. */
function byZoom(sizes: WellSizes, value: (radius: number) => number, curve: 'size' | 'linear' = 'size'): ExpressionSpecification {
  const stops = SIZE_ZOOMS.flatMap((z, i) => [z, value(sizes.radii[i])]);
  return ['interpolate', curve === 'size' ? ['exponential', 2] : ['linear'], ['zoom'], ...stops] as ExpressionSpecification;
}

const hasOutline = (r: number) => r >= OUTLINE_FROM_RADIUS;
const ringRadius = (sizes: WellSizes) => byZoom(sizes, (r) => r + 3.5);

/** Wells with a Well K carry their histogram bin (0 and up); the others −1. */
export const HAS_WELL_K: FilterSpecification = ['>=', ['get', 'bin'], 0];
export const NO_WELL_K: FilterSpecification = ['<', ['get', 'bin'], 0];

/** Kfield's map colours outside the K scale (which is viridis: violet, blue, green, yellow). */
export const MAP_COLOURS = {
  unanalysed: '#64748b',
  wellOutline: '#1e293b',
  binHighlight: '#ea580c',
  selected: '#0f172a',
  halo: '#ffffff',
} as const;

type WellsLayer<T> = Omit<T, 'source'> & { source: typeof WELLS_SOURCE };

/** Wells with no Checked fit: a hollow grey ring, apart from the coloured ones (a grey dot when tiny). */
export function unanalysedLayer(sizes: WellSizes): WellsLayer<CircleLayerSpecification> {
  return {
    id: LAYER_IDS.unanalysed,
    type: 'circle',
    source: WELLS_SOURCE,
    filter: NO_WELL_K,
    paint: {
      // The 2-pixel ring lies outside the radius: the ring's outer edge is where a coloured well's is.
      'circle-radius': byZoom(sizes, (r) => Math.max(0.5, r - 1)),
      'circle-color': MAP_COLOURS.unanalysed,
      'circle-opacity': byZoom(sizes, (r) => (hasOutline(r) ? 0 : 1), 'linear'),
      'circle-stroke-color': MAP_COLOURS.unanalysed,
      'circle-stroke-width': 2,
    },
  };
}

/** Wells coloured by Well K; the fill is opaque so the drawn colour is exactly the scale's. */
export function wellsLayer(colour: ExpressionSpecification, sizes: WellSizes): WellsLayer<CircleLayerSpecification> {
  return {
    id: LAYER_IDS.wells,
    type: 'circle',
    source: WELLS_SOURCE,
    filter: HAS_WELL_K,
    paint: {
      'circle-radius': byZoom(sizes, (r) => r),
      'circle-color': colour,
      'circle-opacity': 1,
      'circle-stroke-color': MAP_COLOURS.wellOutline,
      'circle-stroke-width': byZoom(sizes, (r) => (hasOutline(r) ? 1 : 0), 'linear'),
      'circle-stroke-opacity': 0.75,
    },
  };
}

/** A ring around the wells of the histogram bin under the pointer (−1: none). */
export function binHighlightLayer(bin: number, sizes: WellSizes): WellsLayer<CircleLayerSpecification> {
  return {
    id: LAYER_IDS.binHighlight,
    type: 'circle',
    source: WELLS_SOURCE,
    // No bin (−1) would match the unanalysed wells: then nothing is ringed.
    filter: bin >= 0 ? ['==', ['get', 'bin'], bin] : ['==', ['get', 'bin'], -2],
    paint: {
      'circle-radius': ringRadius(sizes),
      'circle-opacity': 0,
      'circle-stroke-color': MAP_COLOURS.binHighlight,
      'circle-stroke-width': 3,
    },
  };
}

function selectedFilter(ids: readonly string[]): FilterSpecification {
  return ['in', ['get', 'id'], ['literal', [...ids]]];
}

/** The selected wells: a dark ring on a white halo, legible on every colour of the scale. */
export function selectedLayers(ids: readonly string[], sizes: WellSizes): [WellsLayer<CircleLayerSpecification>, WellsLayer<CircleLayerSpecification>] {
  const filter = selectedFilter(ids);
  return [
    {
      id: LAYER_IDS.selectedHalo,
      type: 'circle',
      source: WELLS_SOURCE,
      filter,
      paint: { 'circle-radius': ringRadius(sizes), 'circle-color': MAP_COLOURS.halo, 'circle-opacity': 0.9, 'circle-stroke-color': MAP_COLOURS.halo, 'circle-stroke-width': 3 },
    },
    {
      id: LAYER_IDS.selectedRing,
      type: 'circle',
      source: WELLS_SOURCE,
      filter,
      paint: { 'circle-radius': ringRadius(sizes), 'circle-opacity': 0, 'circle-stroke-color': MAP_COLOURS.selected, 'circle-stroke-width': 2.5 },
    },
  ];
}

/** The font the built-in basemap's glyphs are made from (tiles/). */
export const LABEL_FONT = ['Roboto Flex Regular'];

/** The names of the wells drawn: all, only those with a Well K, or only those without. */
export function labelsFilter(withK: boolean, withoutK: boolean): FilterSpecification {
  if (withK && withoutK) return ['has', 'name'];
  if (withK) return HAS_WELL_K;
  if (withoutK) return NO_WELL_K;
  return ['==', ['get', 'bin'], -2];
}

/** Well names beside the wells once the view is close enough to read them (minzoom: see labelMinZoom). */
export const labelsLayer: WellsLayer<SymbolLayerSpecification> = {
  id: LAYER_IDS.labels,
  type: 'symbol',
  source: WELLS_SOURCE,
  minzoom: 15,
  layout: {
    'text-field': ['get', 'name'],
    'text-font': LABEL_FONT,
    'text-size': 12,
    'text-anchor': 'left',
    'text-offset': [1, 0],
    'text-padding': 2,
  },
  paint: { 'text-color': '#0f172a', 'text-halo-color': '#ffffff', 'text-halo-width': 1.5 },
};
