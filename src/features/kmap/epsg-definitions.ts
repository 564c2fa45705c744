/*
 * proj4 strings from epsg-index, one chunk per EPSG code holding only that code's proj4 string
 * (the other fields of each file are tree-shaken away). This table of loaders is a chunk of its
 * own too, fetched only when a map needs a projection.
 */
export const PREFIX = '/node_modules/epsg-index/s/';
export const definitions = import.meta.glob<string | null | undefined>('/node_modules/epsg-index/s/*.json', { import: 'proj4' });
