/*
 * The vector schema of Kfield's own basemap: the names the tiles build writes, the style reads
 * and the map pages can rely on. A tileset that uses these layer names (one built with
 * tiles/build.ts for another region) gets Kfield's style; any other vector MBTiles gets a
 * plain style generated from its layer list.
 */

/** The built-in basemap's id in every basemap route. */
export const BUILTIN_BASEMAP_ID = 'default';

/** Natural Earth land, country boundaries and country names, for the small scales. */
export const WORLD_SOURCE_ID = 'kfield-world';
/** The invented demo area (or a real region built the same way), for the large scales. */
export const LOCAL_SOURCE_ID = 'kfield-local';

export const WORLD_LAYERS = ['earth', 'boundary', 'country_label'] as const;
export const LOCAL_LAYERS = ['landuse', 'water', 'waterway', 'road', 'building', 'site', 'place', 'area_label'] as const;
export type WorldLayer = (typeof WORLD_LAYERS)[number];
export type LocalLayer = (typeof LOCAL_LAYERS)[number];

/** Zoom ranges written into the tiles; maplibre over-zooms each source beyond its maxzoom. */
export const WORLD_ZOOMS = { minzoom: 0, maxzoom: 8 } as const;
export const LOCAL_ZOOMS = { minzoom: 10, maxzoom: 16 } as const;

/** Font stacks served from /tiles/glyphs/{fontstack}/{range}.pbf. */
export const FONT_REGULAR = 'Roboto Flex Regular';
export const FONT_BOLD = 'Roboto Flex Bold';
export const FONT_STACKS = [FONT_REGULAR, FONT_BOLD] as const;

/**
 * The first label layer of Kfield's style. Map pages add their own data layers (wells, K surface)
 * before it, so that street and place names stay readable on top.
 */
export const FIRST_LABEL_LAYER_ID = 'label-waterway';

export const tileStyleUrl = (basemapId: string) =>
  basemapId === BUILTIN_BASEMAP_ID ? '/tiles/style.json' : `/tiles/${encodeURIComponent(basemapId)}/style.json`;
