import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { PbfWriter } from 'pbf';
import { FONT_REGULAR, FONT_STACKS } from '@shared/geo/basemap';
import type { Config } from '../../config';
import { badRequest } from '../../lib/errors';

export interface GlyphAnswer {
  body: Buffer;
  etag: string;
}

/** An empty fontstack: maplibre gets an answer (no glyphs) for a range the font does not cover. */
function emptyRange(stack: string, range: string): Buffer {
  const pbf = new PbfWriter();
  pbf.writeMessage(1, (_: unknown, w: PbfWriter) => {
    w.writeStringField(1, stack);
    w.writeStringField(2, range);
  }, null);
  return Buffer.from(pbf.finish());
}

/**
 * The glyph PBFs written by npm run tiles ({TILES_DIST}/glyphs/{fontstack}/{range}.pbf), read
 * once and kept in memory (about 2 MB for both weights). A stack list "A,B" is answered with the
 * first stack Kfield has; an unknown stack falls back to Roboto Flex Regular.
 */
export function createGlyphStore(config: Config) {
  const dir = path.resolve(config.TILES_DIST, 'glyphs');
  const cache = new Map<string, GlyphAnswer>();
  let version: string | null = null;

  /** Changes when the tiles are rebuilt; part of the glyph URLs in the styles. */
  function glyphVersion(): string {
    if (version) return version;
    try {
      const stamp = JSON.parse(fs.readFileSync(path.resolve(config.TILES_DIST, 'build-stamp.json'), 'utf8')) as { inputs?: string };
      version = String(stamp.inputs ?? 'unbuilt').slice(0, 16);
    } catch {
      version = 'unbuilt';
    }
    return version;
  }

  function get(fontstack: string, range: string): GlyphAnswer | null {
    const m = /^(\d{1,5})-(\d{1,5})$/.exec(range);
    const start = m ? Number(m[1]) : NaN;
    if (!m || start % 256 !== 0 || Number(m[2]) !== start + 255 || start > 65280) {
      throw badRequest(`Glyph range ${range} is not one of 0-255, 256-511, … 65280-65535`, { range: 'A range of 256 code points starting at a multiple of 256' });
    }
    const wanted = fontstack.split(',').map((s) => s.trim());
    const stack = wanted.find((s) => (FONT_STACKS as readonly string[]).includes(s)) ?? FONT_REGULAR;
    const key = `${stack}/${range}`;
    const hit = cache.get(key);
    if (hit) return hit;
    if (!fs.existsSync(path.join(dir, stack))) return null;
    const file = path.join(dir, stack, `${range}.pbf`);
    const body = fs.existsSync(file) ? fs.readFileSync(file) : emptyRange(stack, range);
    const answer = { body, etag: `"${createHash('sha1').update(body).digest('base64url').slice(0, 20)}"` };
    cache.set(key, answer);
    return answer;
  }

  return { get, glyphVersion };
}
