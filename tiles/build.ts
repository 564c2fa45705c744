import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import zlib from 'node:zlib';
import { GeoJSONVT } from '@maplibre/geojson-vt';
import { fromGeojsonVt } from '@maplibre/vt-pbf';
import { area, centerOfMass, booleanPointInPolygon, pointOnFeature } from '@turf/turf';
import type { Feature, FeatureCollection, GeoJsonProperties, Geometry, MultiPolygon, Polygon } from 'geojson';
import { feature, mesh } from 'topojson-client';
import type { GeometryCollection, Topology } from 'topojson-specification';
import { LOCAL_LAYERS, LOCAL_ZOOMS, WORLD_LAYERS, WORLD_ZOOMS } from '@shared/geo/basemap';
import { tileRange } from '@shared/geo/tiles';
import { buildGlyphs } from './glyphs';
import { DIST_DIR, inputsHash, MBTILES_PATH, STAMP_PATH } from './inputs.mjs';
import { MbtilesWriter } from './mbtiles-writer';

/*
 * Builds tiles/dist: basemap.mbtiles (gzipped Mapbox Vector Tiles 2.1, de-duplicated) and the
 * glyph PBFs. World layers (Natural Earth via world-atlas, public domain) cover z0–8 everywhere;
 * the invented demo area (tiles/sources/demo-area.geojson) covers z10–16 over its own bounds.
 * Every feature's `minzoom` property decides from which zoom it is written; it is not kept.
 */
const require = createRequire(import.meta.url);
const here = path.dirname(new URL(import.meta.url).pathname);
const EXTENT = 4096;
const started = performance.now();
const ms = () => `${((performance.now() - started) / 1000).toFixed(1)} s`;

type Props = Record<string, string | number | boolean>;
type Layers = Record<string, FeatureCollection>;

function worldLayers(): Layers {
  const topo = require('world-atlas/countries-50m.json') as Topology<{ countries: GeometryCollection<{ name: string }>; land: GeometryCollection }>;
  const land = feature(topo, topo.objects.land) as unknown as FeatureCollection | Feature;
  const earth: FeatureCollection = land.type === 'FeatureCollection' ? land : { type: 'FeatureCollection', features: [land] };
  earth.features = earth.features.map((f) => ({ ...f, properties: { class: 'land', minzoom: 0 } }));
  const borders = mesh(topo, topo.objects.countries, (a, b) => a !== b);
  const countries = feature(topo, topo.objects.countries) as unknown as FeatureCollection<Polygon | MultiPolygon, { name: string }>;
  const labels: Feature[] = [];
  for (const c of countries.features) {
    if (!c.geometry || !c.properties?.name) continue;
    // Label the largest part (mainland rather than islands), at its centre of mass when that lies inside.
    const parts = c.geometry.type === 'Polygon' ? [c.geometry.coordinates] : c.geometry.coordinates;
    const largest = parts
      .map((coordinates) => ({ type: 'Feature' as const, properties: {}, geometry: { type: 'Polygon' as const, coordinates } }))
      .map((f) => ({ f, a: area(f) }))
      .sort((x, y) => y.a - x.a)[0];
    if (!largest) continue;
    const com = centerOfMass(largest.f);
    const at = booleanPointInPolygon(com, largest.f) ? com : pointOnFeature(largest.f);
    const km2 = area(c) / 1e6;
    const minzoom = km2 > 2e6 ? 2 : km2 > 3e5 ? 3 : km2 > 5e4 ? 4 : km2 > 5e3 ? 5 : 6;
    labels.push({ type: 'Feature', properties: { name: c.properties.name, rank: Math.round(Math.log10(Math.max(km2, 1)) * 10), minzoom }, geometry: at.geometry });
  }
  return {
    earth,
    boundary: { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { class: 'country', minzoom: 1 }, geometry: borders }] },
    country_label: { type: 'FeatureCollection', features: labels },
  };
}

function localLayers(): { layers: Layers; bounds: [number, number, number, number] } {
  const fc = JSON.parse(fs.readFileSync(path.join(here, 'sources', 'demo-area.geojson'), 'utf8')) as FeatureCollection<Geometry, Props>;
  const layers: Layers = Object.fromEntries(LOCAL_LAYERS.map((l) => [l, { type: 'FeatureCollection', features: [] } as FeatureCollection]));
  let [w, s, e, n] = [Infinity, Infinity, -Infinity, -Infinity];
  const grow = (c: unknown): void => {
    if (typeof (c as number[])[0] === 'number') {
      const [x, y] = c as number[];
      [w, s, e, n] = [Math.min(w, x), Math.min(s, y), Math.max(e, x), Math.max(n, y)];
    } else for (const d of c as unknown[]) grow(d);
  };
  for (const f of fc.features) {
    const { layer, ...props } = f.properties;
    if (!layers[String(layer)]) throw new Error(`demo-area.geojson: unknown layer ${String(layer)}`);
    layers[String(layer)].features.push({ ...f, properties: props });
    if ('coordinates' in f.geometry) grow(f.geometry.coordinates);
  }
  return { layers, bounds: [w, s, e, n].map((v) => Math.round(v * 1e5) / 1e5) as [number, number, number, number] };
}

/** Field types per layer for the TileJSON vector_layers list. */
function fieldsOf(fc: FeatureCollection): Record<string, string> {
  const out: Record<string, string> = {};
  for (const f of fc.features) {
    for (const [k, v] of Object.entries(f.properties ?? {})) {
      if (k !== 'minzoom') out[k] = typeof v === 'number' ? 'Number' : typeof v === 'boolean' ? 'Boolean' : 'String';
    }
  }
  return out;
}

type Index = { name: string; vt: GeoJSONVT };
const makeIndexes = (layers: Layers, maxZoom: number): Index[] =>
  Object.entries(layers).map(([name, fc]) => ({ name, vt: new GeoJSONVT(fc, { maxZoom, indexMaxZoom: Math.min(maxZoom, 6), extent: EXTENT, buffer: 64, tolerance: 3 }) }));

/** The layers of one tile with the features drawn from this zoom on, without the build-only `minzoom` tag. */
function tileLayers(indexes: Index[], z: number, x: number, y: number) {
  const layers: Record<string, ReturnType<GeoJSONVT['getTile']> & object> = {};
  let touched = false;
  for (const { name, vt } of indexes) {
    const t = vt.getTile(z, x, y);
    if (!t) continue;
    touched = true;
    const features = t.features
      .filter((f) => Number((f.tags as GeoJsonProperties)?.minzoom ?? 0) <= z)
      .map((f) => {
        const { minzoom: _m, ...tags } = (f.tags ?? {}) as Props;
        return { ...f, tags };
      });
    if (features.length > 0) layers[name] = { ...t, features } as typeof t;
  }
  return { layers, touched };
}

const encode = (layers: Parameters<typeof fromGeojsonVt>[0]) => zlib.gzipSync(fromGeojsonVt(layers, { version: 2, extent: EXTENT }), { level: 9 });

function main() {
  fs.mkdirSync(DIST_DIR, { recursive: true });
  const world = worldLayers();
  const local = localLayers();
  console.log(`Kfield tiles: sources read (${ms()})`);

  const writer = new MbtilesWriter(MBTILES_PATH);
  try {
    const worldIndexes = makeIndexes(world, WORLD_ZOOMS.maxzoom);
    let bytes = 0;
    const visit = (z: number, x: number, y: number) => {
      const { layers, touched } = tileLayers(worldIndexes, z, x, y);
      if (!touched) return;
      if (Object.keys(layers).length > 0) {
        const gz = encode(layers);
        bytes += gz.length;
        writer.put(z, x, y, gz);
      }
      if (z < WORLD_ZOOMS.maxzoom) for (const [dx, dy] of [[0, 0], [1, 0], [0, 1], [1, 1]]) visit(z + 1, 2 * x + dx, 2 * y + dy);
    };
    visit(0, 0, 0);
    console.log(`Kfield tiles: world z${WORLD_ZOOMS.minzoom}–${WORLD_ZOOMS.maxzoom}, ${writer.tiles} tiles (${ms()})`);

    const localIndexes = makeIndexes(local.layers, LOCAL_ZOOMS.maxzoom);
    const before = writer.tiles;
    for (let z = LOCAL_ZOOMS.minzoom; z <= LOCAL_ZOOMS.maxzoom; z++) {
      const r = tileRange(local.bounds, z);
      for (let x = r.minX; x <= r.maxX; x++) {
        for (let y = r.minY; y <= r.maxY; y++) {
          const { layers } = tileLayers(localIndexes, z, x, y);
          if (Object.keys(layers).length === 0) continue;
          const gz = encode(layers);
          bytes += gz.length;
          writer.put(z, x, y, gz);
        }
      }
    }
    console.log(`Kfield tiles: demo area z${LOCAL_ZOOMS.minzoom}–${LOCAL_ZOOMS.maxzoom}, ${writer.tiles - before} tiles (${ms()})`);

    const vectorLayers = [
      ...WORLD_LAYERS.map((id) => ({ id, ...WORLD_ZOOMS, fields: fieldsOf(world[id]), description: worldDescriptions[id] })),
      ...LOCAL_LAYERS.map((id) => ({ id, ...LOCAL_ZOOMS, fields: fieldsOf(local.layers[id]), description: `Invented demo area: ${localDescriptions[id]}` })),
    ];
    const [cw, cs, ce, cn] = local.bounds;
    writer.finish({
      name: 'Kfield built-in basemap',
      description:
        'Natural Earth land, country boundaries and names (z0–8) and Kfield’s invented demo area (z10–16). The demo area is fictional: Hollinford, Larkmoor, Copse End, the River Tamsel and the Willow Bend former fuel depot do not exist.',
      attribution: 'Natural Earth (public domain) · demo area invented by Kfield, not a real place',
      version: '1',
      type: 'baselayer',
      format: 'pbf',
      bounds: '-180,-85.05113,180,85.05113',
      center: `${((cw + ce) / 2).toFixed(5)},${((cs + cn) / 2).toFixed(5)},13`,
      minzoom: String(WORLD_ZOOMS.minzoom),
      maxzoom: String(LOCAL_ZOOMS.maxzoom),
      json: JSON.stringify({ vector_layers: vectorLayers, kfield: { localBounds: local.bounds } }),
    });
    const size = fs.statSync(MBTILES_PATH).size;
    console.log(
      `Kfield tiles: wrote tiles/dist/basemap.mbtiles, ${writer.tiles} tiles (${writer.images} distinct), ${(size / 1024 / 1024).toFixed(1)} MB (${(bytes / 1024 / 1024).toFixed(1)} MB before de-duplication) (${ms()})`,
    );
  } catch (e) {
    writer.abort();
    throw e;
  }

  const glyphs = buildGlyphs(path.join(DIST_DIR, 'glyphs'));
  console.log(`Kfield tiles: wrote ${glyphs.files} glyph files, ${glyphs.glyphs} glyphs, ${(glyphs.bytes / 1024).toFixed(0)} KB (${ms()})`);
  const glyphFiles = fs
    .readdirSync(path.join(DIST_DIR, 'glyphs'), { recursive: true, withFileTypes: true })
    .filter((d) => d.isFile() && d.name.endsWith('.pbf'))
    .map((d) => path.relative(path.join(DIST_DIR, 'glyphs'), path.join(d.parentPath, d.name)))
    .sort();
  fs.writeFileSync(`${STAMP_PATH}.${process.pid}.partial`, `${JSON.stringify({ inputs: inputsHash(), glyphFiles }, null, 2)}\n`);
  fs.renameSync(`${STAMP_PATH}.${process.pid}.partial`, STAMP_PATH);
  console.log(`Kfield tiles: done in ${ms()}`);
}

const worldDescriptions: Record<(typeof WORLD_LAYERS)[number], string> = {
  earth: 'Land (Natural Earth 1:50m)',
  boundary: 'Country boundaries (Natural Earth 1:50m)',
  country_label: 'Country names at a point inside the largest part of each country',
};
const localDescriptions: Record<(typeof LOCAL_LAYERS)[number], string> = {
  landuse: 'land use areas (class: residential, industrial, commercial, grass, wood, farmland, parking, hardstanding)',
  water: 'river, pond and lake areas',
  waterway: 'river and stream centre lines, with names',
  road: 'roads, paths and rail (class: primary, secondary, street, service, track, path, rail), with names',
  building: 'building footprints (class: house, commercial, industrial, tank)',
  site: 'the boundary of the demo site, the Willow Bend former fuel depot',
  place: 'town, village, hamlet and locality names',
  area_label: 'names of woods, meadows, the industrial estate and the station',
};

main();
