import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import TinySDF from '@mapbox/tiny-sdf';
import { createCanvas, GlobalFonts } from '@napi-rs/canvas';
import { PbfWriter } from 'pbf';
import { FONT_BOLD, FONT_REGULAR } from '@shared/geo/basemap';

const require = createRequire(import.meta.url);
const FAMILY = 'Roboto Flex';

/*
 * Signed-distance-field glyphs in the layout maplibre reads (the "glyphs" PBF: one fontstack with
 * 24 px glyphs, a 3 px buffer, SDF radius 8 and cutoff 0.25), rasterised with tiny-sdf on a
 * @napi-rs/canvas from the Roboto Flex woff2 files of @fontsource/roboto-flex (OFL-1.1).
 * fontsource ships the regular weight only; the bold stack is Skia's emboldened regular.
 */
const FONT_SIZE = 24;
const BUFFER = 3;
/** maplibre places a glyph's top this many pixels (at 24 px) above its own baseline origin. */
const TOP_OFFSET = 27;

export const GLYPH_FONTS = [
  { stack: FONT_REGULAR, weight: 'normal' },
  { stack: FONT_BOLD, weight: 'bold' },
] as const;

let registered = false;

/** Register every subset file of Roboto Flex under one family name. */
function registerFonts(): void {
  if (registered) return;
  const dir = path.join(path.dirname(require.resolve('@fontsource/roboto-flex/package.json')), 'files');
  for (const file of fs.readdirSync(dir).filter((f) => f.endsWith('-400-normal.woff2')).sort()) {
    if (!GlobalFonts.register(fs.readFileSync(path.join(dir, file)), FAMILY)) throw new Error(`could not register ${file}`);
  }
  registered = true;
}

/** The code points the font files cover, from fontsource's unicode.json (control characters left out). */
export function coveredCodePoints(): number[] {
  const ranges = require('@fontsource/roboto-flex/unicode.json') as Record<string, string>;
  const set = new Set<number>();
  for (const list of Object.values(ranges)) {
    for (const part of list.split(',')) {
      const [a, b] = part.replace(/U\+/g, '').split('-').map((h) => parseInt(h, 16));
      for (let cp = a; cp <= (b ?? a); cp++) {
        const control = cp < 0x20 || (cp >= 0x7f && cp < 0xa0) || cp === 0xfeff;
        if (!control) set.add(cp);
      }
    }
  }
  return [...set].sort((x, y) => x - y);
}

class NodeSDF extends TinySDF {
  _createCanvas(size: number) {
    return createCanvas(size, size) as unknown as HTMLCanvasElement;
  }
}

interface Glyph {
  id: number;
  bitmap: Uint8Array;
  width: number;
  height: number;
  left: number;
  top: number;
  advance: number;
}

function encodeRange(stack: string, range: string, glyphs: Glyph[]): Uint8Array {
  const pbf = new PbfWriter();
  pbf.writeMessage(1, (_: unknown, w: PbfWriter) => {
    w.writeStringField(1, stack);
    w.writeStringField(2, range);
    for (const g of glyphs) {
      w.writeMessage(3, (_g: unknown, gw: PbfWriter) => {
        gw.writeVarintField(1, g.id);
        if (g.bitmap.length > 0) gw.writeBytesField(2, g.bitmap);
        gw.writeVarintField(3, g.width);
        gw.writeVarintField(4, g.height);
        gw.writeSVarintField(5, g.left);
        gw.writeSVarintField(6, g.top);
        gw.writeVarintField(7, g.advance);
      }, null);
    }
  }, null);
  return pbf.finish();
}

/** An empty fontstack for a range the font does not cover, so maplibre gets an answer rather than an error. */
export function emptyGlyphRange(stack: string, range: string): Uint8Array {
  return encodeRange(stack, range, []);
}

/** Write {outDir}/{fontstack}/{start}-{end}.pbf for every 256-code-point range the font covers. */
export function buildGlyphs(outDir: string): { files: number; glyphs: number; bytes: number } {
  registerFonts();
  const byRange = new Map<number, number[]>();
  for (const cp of coveredCodePoints()) {
    const start = Math.floor(cp / 256) * 256;
    byRange.set(start, [...(byRange.get(start) ?? []), cp]);
  }
  let files = 0;
  let count = 0;
  let bytes = 0;
  for (const font of GLYPH_FONTS) {
    const sdf = new NodeSDF({ fontSize: FONT_SIZE, buffer: BUFFER, radius: 8, cutoff: 0.25, fontFamily: `"${FAMILY}"`, fontWeight: font.weight });
    const dir = path.join(outDir, font.stack);
    fs.mkdirSync(dir, { recursive: true });
    for (const [start, cps] of [...byRange].sort((a, b) => a[0] - b[0])) {
      const glyphs: Glyph[] = cps.map((id) => {
        const g = sdf.draw(String.fromCodePoint(id));
        return {
          id,
          bitmap: g.glyphWidth > 0 && g.glyphHeight > 0 ? Uint8Array.from(g.data) : new Uint8Array(0),
          width: g.glyphWidth,
          height: g.glyphHeight,
          left: Math.round(g.glyphLeft + 0.5),
          top: g.glyphTop - TOP_OFFSET,
          // Emboldening thickens the strokes without widening the advance; give bold text room.
          advance: Math.round(g.glyphAdvance + (font.weight === 'bold' && g.glyphWidth > 0 ? 1 : 0)),
        };
      });
      const range = `${start}-${start + 255}`;
      const buf = encodeRange(font.stack, range, glyphs);
      // Written aside and renamed, so a server reading the glyphs never sees half a file.
      const file = path.join(dir, `${range}.pbf`);
      fs.writeFileSync(`${file}.${process.pid}.partial`, buf);
      fs.renameSync(`${file}.${process.pid}.partial`, file);
      files++;
      count += glyphs.length;
      bytes += buf.length;
    }
  }
  return { files, glyphs: count, bytes };
}
