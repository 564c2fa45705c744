import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { PbfReader } from 'pbf';
import { beforeAll, describe, expect, it } from 'vitest';
import { FONT_BOLD, FONT_REGULAR } from '@shared/geo/basemap';

interface Glyph { id: number; bitmap: Uint8Array; width: number; height: number; left: number; top: number; advance: number }

/** Read a glyphs PBF (maplibre's layout: fontstack = 1 { name = 1, range = 2, glyph = 3 }). */
function readGlyphs(buf: Uint8Array) {
  const out = { name: '', range: '', glyphs: [] as Glyph[] };
  new PbfReader(buf).readFields((tag, _r, p) => {
    if (tag !== 1) return;
    p!.readMessage((t, _s, sp) => {
      if (t === 1) out.name = sp!.readString();
      else if (t === 2) out.range = sp!.readString();
      else if (t === 3) {
        const g: Glyph = { id: 0, bitmap: new Uint8Array(0), width: 0, height: 0, left: 0, top: 0, advance: 0 };
        sp!.readMessage((f, _g, gp) => {
          if (f === 1) g.id = gp!.readVarint();
          else if (f === 2) g.bitmap = gp!.readBytes();
          else if (f === 3) g.width = gp!.readVarint();
          else if (f === 4) g.height = gp!.readVarint();
          else if (f === 5) g.left = gp!.readSVarint();
          else if (f === 6) g.top = gp!.readSVarint();
          else if (f === 7) g.advance = gp!.readVarint();
        }, null);
        out.glyphs.push(g);
      }
    }, null);
  }, null);
  return out;
}

const file = (stack: string, range: string) => fs.readFileSync(path.resolve('tiles/dist/glyphs', stack, `${range}.pbf`));

beforeAll(() => {
  const r = spawnSync(process.execPath, ['tiles/ensure.mjs'], { stdio: 'inherit' });
  expect(r.status).toBe(0);
}, 180_000);

describe('the glyph PBFs', () => {
  it('hold the Latin-1 glyphs of Roboto Flex Regular as 24 px SDF bitmaps with a 3 px border', () => {
    const g = readGlyphs(file(FONT_REGULAR, '0-255'));
    expect(g.name).toBe(FONT_REGULAR);
    expect(g.range).toBe('0-255');
    const ids = g.glyphs.map((x) => x.id);
    for (const ch of ' AZaz09é&(') expect(ids).toContain(ch.codePointAt(0));
    expect(ids).not.toContain(0x07); // a control character has no glyph
    const A = g.glyphs.find((x) => x.id === 65)!;
    expect(A.bitmap.length).toBe((A.width + 6) * (A.height + 6));
    expect(A.height).toBeGreaterThan(14);
    expect(A.height).toBeLessThan(22);
    expect(A.advance).toBeGreaterThan(10);
    const space = g.glyphs.find((x) => x.id === 32)!;
    expect(space.bitmap.length).toBe(0);
    expect(space.advance).toBeGreaterThan(3);
  });

  it('cover Latin Extended-A in the 256-511 range, in both weights', () => {
    for (const stack of [FONT_REGULAR, FONT_BOLD]) {
      const g = readGlyphs(file(stack, '256-511'));
      expect(g.name).toBe(stack);
      expect(g.glyphs.map((x) => x.id)).toEqual(expect.arrayContaining([0x100, 0x141, 0x17e]));
    }
  });

  it('draws the bold stack heavier than the regular one', () => {
    const ink = (stack: string) => {
      const o = readGlyphs(file(stack, '0-255')).glyphs.find((x) => x.id === 'o'.codePointAt(0))!;
      return o.bitmap.filter((v) => v > 192).length;
    };
    expect(ink(FONT_BOLD)).toBeGreaterThan(ink(FONT_REGULAR) * 1.1);
  });
});
