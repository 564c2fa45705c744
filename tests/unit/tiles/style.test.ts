import fs from 'node:fs';
import { validateStyleMin } from '@maplibre/maplibre-gl-style-spec';
import { describe, expect, it } from 'vitest';
import { FIRST_LABEL_LAYER_ID, FONT_STACKS, LOCAL_SOURCE_ID, WORLD_SOURCE_ID } from '@shared/geo/basemap';
import type { BasemapMetadata } from '@shared/schemas/basemaps';
import { genericStyle, kfieldStyle, styleKindOf } from '../../../server/features/basemaps/basemaps.style';

const urls = { tiles: 'http://kfield.test/tiles/{z}/{x}/{y}.pbf?v=1', glyphs: 'http://kfield.test/tiles/glyphs/{fontstack}/{range}.pbf?v=1' };
const meta = (ids: string[]): BasemapMetadata => ({
  title: 't', description: '', attribution: 'Somebody', format: 'pbf', minzoom: 0, maxzoom: 14, bounds: [5, 45, 10, 48], center: [7, 46, 8],
  vectorLayers: ids.map((id) => ({ id, fields: { name: 'String', class: 'String' } })), gzipped: true, localBounds: null,
});
const errors = (style: unknown) => validateStyleMin(style as Parameters<typeof validateStyleMin>[0]).map((e) => e.message);

describe('basemap styles', () => {
  it('tiles/style.json is a valid MapLibre style that uses only the built fonts', () => {
    const style = JSON.parse(fs.readFileSync('tiles/style.json', 'utf8'));
    expect(errors(style)).toEqual([]);
    const fonts = JSON.stringify(style.layers.map((l: { layout?: { 'text-font'?: unknown } }) => l.layout?.['text-font'] ?? null));
    for (const f of fonts.match(/Roboto Flex [A-Za-z]+/g) ?? []) expect(FONT_STACKS).toContain(f);
    expect(style.layers.map((l: { id: string }) => l.id)).toContain(FIRST_LABEL_LAYER_ID);
  });

  it('gives a tileset with Kfield’s layer names Kfield’s style, with absolute URLs and each source’s zoom range', () => {
    const m = meta(['earth', 'boundary', 'country_label', 'landuse', 'water', 'waterway', 'road', 'building', 'site', 'place', 'area_label']);
    m.vectorLayers = m.vectorLayers.map((l) => ({ ...l, ...(['earth', 'boundary', 'country_label'].includes(l.id) ? { minzoom: 0, maxzoom: 8 } : { minzoom: 10, maxzoom: 16 }) }));
    expect(styleKindOf(m)).toBe('kfield');
    const s = kfieldStyle('Test', m, urls);
    expect(errors(s)).toEqual([]);
    expect(s.glyphs).toBe(urls.glyphs);
    expect(s.sources[WORLD_SOURCE_ID]).toMatchObject({ tiles: [urls.tiles], minzoom: 0, maxzoom: 8 });
    expect(s.sources[LOCAL_SOURCE_ID]).toMatchObject({ tiles: [urls.tiles], minzoom: 10, maxzoom: 16, bounds: [5, 45, 10, 48] });
  });

  it('leaves out the world source and its layers when a Kfield-schema tileset has no world layers', () => {
    const s = kfieldStyle('Local only', meta(['landuse', 'water', 'waterway', 'road', 'building', 'place']), urls);
    expect(Object.keys(s.sources)).toEqual([LOCAL_SOURCE_ID]);
    expect(s.layers.some((l) => l.source === WORLD_SOURCE_ID)).toBe(false);
    expect(errors(s)).toEqual([]);
  });

  it('generates a plain valid style for any other tileset from its layer list', () => {
    const m = meta(['water', 'landcover', 'transportation', 'building', 'boundary', 'place', 'mystery']);
    expect(styleKindOf(m)).toBe('generic');
    const s = genericStyle('Other', m, urls);
    expect(errors(s)).toEqual([]);
    const ids = s.layers.map((l) => l.id);
    expect(ids.indexOf('water-fill')).toBeLessThan(ids.indexOf('transportation-line'));
    expect(ids.indexOf('transportation-casing')).toBeLessThan(ids.indexOf('transportation-line'));
    expect(ids[ids.length - 1]).toMatch(/-label$/);
    expect(s.sources.basemap).toMatchObject({ tiles: [urls.tiles], minzoom: 0, maxzoom: 14, bounds: [5, 45, 10, 48], attribution: 'Somebody' });
  });
});
