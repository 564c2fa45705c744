import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/*
 * What the built basemap depends on. tiles/build.ts writes the hash of these files into
 * tiles/dist/build-stamp.json; tiles/ensure.mjs rebuilds when the stamp is missing or differs.
 */
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export const DIST_DIR = path.join(root, 'tiles', 'dist');
export const MBTILES_PATH = path.join(DIST_DIR, 'basemap.mbtiles');
export const STAMP_PATH = path.join(DIST_DIR, 'build-stamp.json');

const INPUTS = [
  'tiles/build.ts',
  'tiles/glyphs.ts',
  'tiles/mbtiles-writer.ts',
  'tiles/sources/demo-area.geojson',
  'shared/geo/basemap.ts',
  'shared/geo/tiles.ts',
  'node_modules/world-atlas/package.json',
  'node_modules/@fontsource/roboto-flex/package.json',
];

export function inputsHash() {
  const h = createHash('sha256');
  for (const rel of INPUTS) {
    h.update(rel);
    h.update(fs.readFileSync(path.join(root, rel)));
  }
  return h.digest('hex').slice(0, 16);
}

/** Null when the built files are present and current; otherwise why they need building. */
export function staleReason() {
  if (!fs.existsSync(MBTILES_PATH)) return 'tiles/dist/basemap.mbtiles is missing';
  if (!fs.existsSync(STAMP_PATH)) return 'tiles/dist/build-stamp.json is missing';
  let stamp;
  try {
    stamp = JSON.parse(fs.readFileSync(STAMP_PATH, 'utf8'));
  } catch {
    return 'tiles/dist/build-stamp.json is unreadable';
  }
  if (stamp.inputs !== inputsHash()) return 'the tile sources or the build script changed';
  for (const f of stamp.glyphFiles ?? ['x']) {
    if (!fs.existsSync(path.join(DIST_DIR, 'glyphs', f))) return `glyph file ${f} is missing`;
  }
  return null;
}
