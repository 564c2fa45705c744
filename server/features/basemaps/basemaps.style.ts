import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { FONT_BOLD, FONT_REGULAR, LOCAL_LAYERS, LOCAL_SOURCE_ID, WORLD_LAYERS, WORLD_SOURCE_ID } from '@shared/geo/basemap';
import type { BasemapMetadata, VectorLayer } from '@shared/schemas/basemaps';

type Json = Record<string, unknown>;
type StyleLayer = Json & { id: string; source?: string };
export interface Style extends Json {
  version: 8;
  name: string;
  glyphs: string;
  sources: Record<string, Json>;
  layers: StyleLayer[];
}

const TEMPLATE_PATH = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../tiles/style.json');
let template: Style | null = null;

/** Kfield's own style (tiles/style.json), read once. */
export function kfieldTemplate(): Style {
  template ??= JSON.parse(fs.readFileSync(TEMPLATE_PATH, 'utf8')) as Style;
  return template;
}

/** Kfield's style applies when a tileset carries Kfield's layer names (most of the large-scale ones). */
export function styleKindOf(meta: BasemapMetadata): 'kfield' | 'generic' {
  const ids = new Set(meta.vectorLayers.map((l) => l.id));
  const local = LOCAL_LAYERS.filter((l) => ids.has(l)).length;
  const world = WORLD_LAYERS.filter((l) => ids.has(l)).length;
  return local >= 4 || world === WORLD_LAYERS.length ? 'kfield' : 'generic';
}

export interface StyleUrls {
  /** Absolute tile URL template with {z}/{x}/{y}. */
  tiles: string;
  /** Absolute glyph URL template with {fontstack}/{range}. */
  glyphs: string;
}

function zoomSpan(layers: VectorLayer[], fallback: { minzoom: number; maxzoom: number }) {
  if (layers.length === 0) return fallback;
  const min = Math.min(...layers.map((l) => l.minzoom ?? fallback.minzoom));
  const max = Math.max(...layers.map((l) => l.maxzoom ?? fallback.maxzoom));
  return { minzoom: min, maxzoom: Math.max(min, max) };
}

/**
 * Kfield's style for a tileset with Kfield's layer names: each of its two sources gets the
 * tileset's URL and the zoom range of its own layers (maplibre over-zooms beyond a source's
 * maxzoom, so the world layers stay under the large-scale ones); a source whose layers the
 * tileset lacks is left out with its style layers.
 */
export function kfieldStyle(name: string, meta: BasemapMetadata, urls: StyleUrls): Style {
  const t = structuredClone(kfieldTemplate());
  const byId = new Map(meta.vectorLayers.map((l) => [l.id, l]));
  const world = WORLD_LAYERS.map((id) => byId.get(id)).filter((l): l is VectorLayer => Boolean(l));
  const local = LOCAL_LAYERS.map((id) => byId.get(id)).filter((l): l is VectorLayer => Boolean(l));
  const span = { minzoom: meta.minzoom, maxzoom: meta.maxzoom };
  const sources: Record<string, Json> = {};
  if (world.length > 0) sources[WORLD_SOURCE_ID] = { ...t.sources[WORLD_SOURCE_ID], tiles: [urls.tiles], ...zoomSpan(world, span) };
  if (local.length > 0) {
    sources[LOCAL_SOURCE_ID] = {
      ...t.sources[LOCAL_SOURCE_ID],
      tiles: [urls.tiles],
      ...zoomSpan(local, span),
      bounds: meta.localBounds ?? meta.bounds,
      ...(meta.attribution ? { attribution: meta.attribution } : {}),
    };
  }
  return {
    ...t,
    name,
    glyphs: urls.glyphs,
    sources,
    layers: t.layers.filter((l) => !l.source || l.source in sources),
  };
}

type Role = 'water' | 'green' | 'land' | 'building' | 'road' | 'rail' | 'boundary' | 'place' | 'other';

function roleOf(id: string): Role {
  const s = id.toLowerCase();
  if (/water|ocean|sea|lake|river|hydro/.test(s)) return 'water';
  if (/park|wood|forest|grass|green|landcover|vegetation|meadow/.test(s)) return 'green';
  if (/building|house/.test(s)) return 'building';
  if (/rail/.test(s)) return 'rail';
  if (/road|street|transport|highway|path|way/.test(s)) return 'road';
  if (/bound|admin|border/.test(s)) return 'boundary';
  if (/place|poi|label|name/.test(s)) return 'place';
  if (/land|earth|urban|residential/.test(s)) return 'land';
  return 'other';
}

const FILL: Partial<Record<Role, string>> = { water: '#bcd4e3', green: '#d9e6cd', land: '#ebe7e1', building: '#ddd7cf', other: '#e9e6e0' };
const LINE: Record<Role, string> = {
  water: '#a9c6d9', green: '#c3d6b6', land: '#d8d1c7', building: '#c9c2b8', road: '#ffffff', rail: '#b9b4b7', boundary: '#a79fb3', place: '#cfc8bf', other: '#cfc8bf',
};
const ORDER: Role[] = ['land', 'green', 'water', 'other', 'building', 'road', 'rail', 'boundary', 'place'];
const isPoly = ['==', ['geometry-type'], 'Polygon'];
const isLine = ['==', ['geometry-type'], 'LineString'];
const isPoint = ['==', ['geometry-type'], 'Point'];

/**
 * A plain, calm style for any other vector tileset, from its layer list: areas tinted by what
 * the layer name suggests (water, green, buildings), lines for roads and boundaries, and names
 * where the layer has a name field. Layer geometry types are not known in advance, so each layer
 * gets a fill, a line and a label layer filtered by geometry type.
 */
export function genericStyle(name: string, meta: BasemapMetadata, urls: StyleUrls): Style {
  const source = 'basemap';
  const layers: StyleLayer[] = [{ id: 'background', type: 'background', paint: { 'background-color': '#f3f1ec' } }];
  const vls = [...meta.vectorLayers].sort((a, b) => ORDER.indexOf(roleOf(a.id)) - ORDER.indexOf(roleOf(b.id)));
  const labels: StyleLayer[] = [];
  for (const vl of vls) {
    const role = roleOf(vl.id);
    const base = { source, 'source-layer': vl.id, ...(vl.minzoom !== undefined ? { minzoom: vl.minzoom } : {}) };
    const fill = FILL[role];
    if (fill) layers.push({ id: `${vl.id}-fill`, type: 'fill', ...base, filter: isPoly, paint: { 'fill-color': fill, 'fill-outline-color': LINE[role] } });
    layers.push({
      id: `${vl.id}-line`,
      type: 'line',
      ...base,
      filter: isLine,
      layout: { 'line-join': 'round', 'line-cap': 'round' },
      paint: {
        'line-color': LINE[role],
        'line-width': role === 'road' ? ['interpolate', ['exponential', 1.5], ['zoom'], 8, 0.5, 14, 3, 18, 16] : ['interpolate', ['linear'], ['zoom'], 4, 0.5, 14, 1.2],
        ...(role === 'boundary' ? { 'line-dasharray': [3, 2] } : {}),
      },
    });
    if (role === 'road') {
      layers.splice(layers.length - 1, 0, {
        id: `${vl.id}-casing`, type: 'line', ...base, filter: isLine, layout: { 'line-join': 'round', 'line-cap': 'round' },
        paint: { 'line-color': '#d6cfc5', 'line-width': ['interpolate', ['exponential', 1.5], ['zoom'], 8, 1, 14, 5, 18, 20] },
      });
    }
    if (role !== 'water' && role !== 'road' && role !== 'rail') {
      layers.push({ id: `${vl.id}-point`, type: 'circle', ...base, filter: isPoint, paint: { 'circle-radius': 2, 'circle-color': '#8d857b', 'circle-opacity': 0.6 } });
    }
    const nameField = Object.keys(vl.fields ?? {}).find((f) => f === 'name' || f === 'name:latin' || f === 'name_en');
    if (nameField || !vl.fields) {
      labels.push({
        id: `${vl.id}-label`,
        type: 'symbol',
        ...base,
        filter: ['has', nameField ?? 'name'],
        layout: {
          'text-field': ['get', nameField ?? 'name'],
          'text-font': [role === 'place' ? FONT_BOLD : FONT_REGULAR],
          'text-size': role === 'place' ? 13 : 11,
          'symbol-placement': role === 'road' || role === 'water' ? 'line-center' : 'point',
          'text-max-width': 8,
        },
        paint: { 'text-color': role === 'water' ? '#4a7391' : '#55504a', 'text-halo-color': '#ffffff', 'text-halo-width': 1.4 },
      });
    }
  }
  // Labels last, and only points and lines get them (a polygon label would repeat on every tile).
  for (const l of labels) l.filter = ['all', l.filter, ['!=', ['geometry-type'], 'Polygon']];
  return {
    version: 8,
    name,
    glyphs: urls.glyphs,
    sources: {
      [source]: {
        type: 'vector',
        tiles: [urls.tiles],
        minzoom: meta.minzoom,
        maxzoom: meta.maxzoom,
        bounds: meta.bounds,
        ...(meta.attribution ? { attribution: meta.attribution } : {}),
      },
    },
    layers: [...layers, ...labels],
  };
}
