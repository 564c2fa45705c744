import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { CAUTIONS } from '@shared/cautions';
import { kFromSi, type KUnit } from '@shared/units/conductivity';
import { lengthFromSi } from '@shared/units/length';

/*
 * What every Kfield PDF shares: the bundled Roboto Flex (embedded; nothing is fetched), the page
 * size, numbers in the site's units with SI alongside, the watermark and the footer.
 */

const require = createRequire(import.meta.url);
const FONT_FILE = require.resolve('@fontsource/roboto-flex/files/roboto-flex-latin-400-normal.woff');
/** Read once: pdfkit (fontkit) takes WOFF as it is and embeds the glyphs used. */
const FONT = readFileSync(FONT_FILE);
export const KFIELD_VERSION: string = (require('../../../package.json') as { version: string }).version;

export type Doc = PDFKit.PDFDocument;
export type PageSize = 'A4' | 'Letter';

export const COLOURS = {
  text: '#1e293b',
  muted: '#64748b',
  rule: '#cbd5e1',
  accent: '#135c56',
  warn: '#b45309',
  error: '#b91c1c',
  watermark: '#dc2626',
} as const;

export const MARGIN = 42;
const FOOTER_SPACE = 26;

/** Characters Kfield's texts use that the bundled Roboto Flex (latin) has no glyph for, in plain letters. */
const NO_GLYPH: Record<string, string> = {
  '√': 'sqrt', '→': '->', 'π': 'pi', 'σ': 'sigma', '≤': '<=', '≥': '>=', '≈': '~',
  '⁻': '-', '⁰': '0', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9',
  '₀': '0', '₁': '1', '₂': '2', '₃': '3', '₄': '4', '₅': '5', '₆': '6', '₇': '7', '₈': '8', '₉': '9',
};
const NO_GLYPH_RE = new RegExp(`[${Object.keys(NO_GLYPH).join('')}]`, 'g');

/** The text as the PDF writes it: characters without a glyph in the bundled font spelled out. */
export function pdfSafe(text: string): string {
  return text.replace(NO_GLYPH_RE, (c) => NO_GLYPH[c]);
}

export function createDoc(pageSize: PageSize, info: { title: string; subject: string }): Doc {
  const doc = new PDFDocument({
    size: pageSize === 'Letter' ? 'LETTER' : 'A4',
    margins: { top: MARGIN, left: MARGIN, right: MARGIN, bottom: MARGIN + FOOTER_SPACE },
    bufferPages: true,
    autoFirstPage: false,
    info: { Title: info.title, Subject: info.subject, Creator: `Kfield ${KFIELD_VERSION}`, Producer: `Kfield ${KFIELD_VERSION}` },
  });
  doc.registerFont('Roboto Flex', FONT);
  doc.font('Roboto Flex');
  // Every string goes through pdfSafe, so no text is drawn as missing-glyph boxes.
  const text = doc.text.bind(doc);
  const widthOf = doc.widthOfString.bind(doc);
  const heightOf = doc.heightOfString.bind(doc);
  doc.text = ((t: unknown, ...rest: unknown[]) => (text as (...a: unknown[]) => Doc)(typeof t === 'string' ? pdfSafe(t) : t, ...rest)) as Doc['text'];
  doc.widthOfString = ((t: string, o?: PDFKit.Mixins.TextOptions) => widthOf(pdfSafe(t), o)) as Doc['widthOfString'];
  doc.heightOfString = ((t: string, o?: PDFKit.Mixins.TextOptions) => heightOf(pdfSafe(t), o)) as Doc['heightOfString'];
  return doc;
}

export function toBuffer(doc: Doc): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

export const contentWidth = (doc: Doc) => doc.page.width - doc.page.margins.left - doc.page.margins.right;
export const bottomLimit = (doc: Doc) => doc.page.height - doc.page.margins.bottom;

/** A new page when fewer than `height` points are left. */
export function ensureSpace(doc: Doc, height: number): void {
  if (doc.y + height > bottomLimit(doc)) doc.addPage();
}

/** The footer on every buffered page: Kfield's version, what the document is, when it was made, page n of m. */
export function writeFooters(doc: Doc, footer: (pageIndex: number) => string, generatedAt: Date): void {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const y = doc.page.height - MARGIN - 10;
    const w = contentWidth(doc);
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0; // writing inside the bottom margin must not start a page
    doc.save().moveTo(MARGIN, y - 4).lineTo(MARGIN + w, y - 4).lineWidth(0.5).strokeColor(COLOURS.rule).stroke().restore();
    doc.font('Roboto Flex').fontSize(7).fillColor(COLOURS.muted);
    doc.text(`Kfield ${KFIELD_VERSION} · ${footer(i)} · generated ${generatedAt.toISOString().replace('T', ' ').slice(0, 19)} UTC`, MARGIN, y, { width: w - 60, lineBreak: false });
    doc.text(`page ${i - range.start + 1} of ${range.count}`, MARGIN + w - 60, y, { width: 60, align: 'right', lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
}

/** A diagonal "NOT CHECKED" across the current page, light enough to read through. */
export function watermark(doc: Doc): void {
  const { width, height } = doc.page;
  const bottom = doc.page.margins.bottom;
  doc.page.margins.bottom = 0;
  doc.save();
  doc.rotate(-38, { origin: [width / 2, height / 2] });
  doc.fillColor(COLOURS.watermark).fillOpacity(0.13).fontSize(86);
  const text = 'NOT CHECKED';
  const w = doc.widthOfString(text);
  doc.text(text, width / 2 - w / 2, height / 2 - 43, { lineBreak: false });
  doc.restore();
  doc.fillOpacity(1);
  doc.page.margins.bottom = bottom;
}

// ─── numbers ─────────────────────────────────────────────────────────────────────────────────

/** A run of text with an optional raised exponent (the bundled font has no superscript digits). */
export type Rich = { text: string; sup?: boolean }[];

/** `x` with `digits` significant digits: plain between 0.01 and 10 000, else mantissa × 10^exponent. */
export function richNumber(x: number, digits = 3): Rich {
  if (!Number.isFinite(x)) return [{ text: '—' }];
  if (x === 0) return [{ text: '0' }];
  const abs = Math.abs(x);
  if (abs >= 0.01 && abs < 10000) return [{ text: plain(x, digits) }];
  const [mantissa, exponent] = x.toExponential(digits - 1).split('e');
  return [{ text: `${mantissa.replace('-', '−')} × 10` }, { text: String(Number(exponent)).replace('-', '−'), sup: true }];
}

/** The same number as one line of plain text (1.23 × 10^−5 written 1.23 × 10−5 would mislead, so "e"). */
export function plainNumber(x: number, digits = 3): string {
  return richNumber(x, digits)
    .map((r) => (r.sup ? `^${r.text}` : r.text))
    .join('');
}

function plain(x: number, digits: number): string {
  const s = Number(x.toPrecision(digits));
  return String(s).replace('-', '−');
}

export function drawRich(doc: Doc, rich: Rich, x: number, y: number, size: number): number {
  let cx = x;
  for (const r of rich) {
    const s = r.sup ? size * 0.68 : size;
    doc.fontSize(s);
    doc.text(r.text, cx, r.sup ? y - size * 0.18 : y, { lineBreak: false });
    cx += doc.widthOfString(r.text);
  }
  doc.fontSize(size);
  return cx - x;
}

export function richWidth(doc: Doc, rich: Rich, size: number): number {
  let w = 0;
  for (const r of rich) {
    doc.fontSize(r.sup ? size * 0.68 : size);
    w += doc.widthOfString(r.text);
  }
  doc.fontSize(size);
  return w;
}

export const concat = (...parts: (Rich | string)[]): Rich => parts.flatMap((p) => (typeof p === 'string' ? [{ text: p }] : p));

export type Units = 'SI' | 'US';

/** K in the site's unit first, then the other: m/s and m/d on an SI site, ft/d and m/s on a US one. */
export function kUnitsFor(units: Units): [KUnit, KUnit] {
  return units === 'US' ? ['ft/d', 'm/s'] : ['m/s', 'm/d'];
}

export function kRich(kMetersPerSecond: number, unit: KUnit): Rich {
  return concat(richNumber(kFromSi(kMetersPerSecond, unit)), ` ${unit}`);
}

/** A length (m) in the site's unit, with metres alongside on a US site. */
export function lengthText(m: number | null | undefined, units: Units, digits = 3): string {
  if (m === null || m === undefined || !Number.isFinite(m)) return '—';
  if (units === 'US') return `${plainNumber(lengthFromSi(m, 'ft'), digits)} ft (${plainNumber(m, digits)} m)`;
  return `${plainNumber(m, digits)} m`;
}

/** A radius (m) in cm, or inches with centimetres alongside on a US site. */
export function radiusText(m: number | null | undefined, units: Units): string {
  if (m === null || m === undefined || !Number.isFinite(m)) return '—';
  if (units === 'US') return `${plainNumber(lengthFromSi(m, 'in'), 3)} in (${plainNumber(m * 100, 3)} cm)`;
  return `${plainNumber(m * 100, 3)} cm`;
}

export function secondsText(s: number | null | undefined): string {
  if (s === null || s === undefined || !Number.isFinite(s)) return '—';
  if (s >= 600) return `${plainNumber(s, 4)} s (${plainNumber(s / 60, 3)} min)`;
  return `${plainNumber(s, 4)} s`;
}

/** A coordinate in the site's system: whole units for a projected system, 6 decimals for degrees. */
export function coordText(v: number): string {
  return Math.abs(v) <= 360 ? v.toFixed(6) : v.toFixed(1);
}

export const dateTime = (iso: string | null | undefined) => (iso ? `${iso.replace('T', ' ').slice(0, 16)} UTC` : '—');

// ─── blocks ──────────────────────────────────────────────────────────────────────────────────

export function heading(doc: Doc, text: string, size = 11): void {
  ensureSpace(doc, size * 3);
  doc.moveDown(0.4);
  doc.font('Roboto Flex').fontSize(size).fillColor(COLOURS.accent).text(text, MARGIN, doc.y, { width: contentWidth(doc) });
  doc.fillColor(COLOURS.text);
  doc.moveDown(0.15);
}

/** Label–value rows in `columns` side by side; a value may be rich (raised exponents). */
export function keyValues(doc: Doc, rows: [string, string | Rich][], opts: { columns?: number; x?: number; width?: number; labelWidth?: number; size?: number } = {}): void {
  const size = opts.size ?? 8;
  const columns = opts.columns ?? 2;
  const x0 = opts.x ?? MARGIN;
  const width = opts.width ?? contentWidth(doc);
  const colW = width / columns;
  const labelW = opts.labelWidth ?? Math.min(95, colW * 0.42);
  const lineH = size * 1.45;
  for (let i = 0; i < rows.length; i += columns) {
    // Each row is as tall as its tallest value.
    let h = lineH;
    doc.fontSize(size);
    for (let c = 0; c < columns && i + c < rows.length; c++) {
      const v = rows[i + c][1];
      if (typeof v === 'string') h = Math.max(h, doc.heightOfString(v, { width: colW - labelW - 6 }) + size * 0.45);
    }
    ensureSpace(doc, h);
    const y = doc.y;
    for (let c = 0; c < columns && i + c < rows.length; c++) {
      const [label, value] = rows[i + c];
      const x = x0 + c * colW;
      doc.fontSize(size).fillColor(COLOURS.muted).text(label, x, y, { width: labelW - 4, lineBreak: false, ellipsis: true });
      doc.fillColor(COLOURS.text);
      if (typeof value === 'string') doc.fontSize(size).text(value, x + labelW, y, { width: colW - labelW - 6 });
      else drawRich(doc, value, x + labelW, y, size);
    }
    doc.x = x0;
    doc.y = y + h;
  }
}

export interface Column {
  title: string;
  width: number;
  align?: 'left' | 'right';
}

/** A plain table with a header row, repeated on a new page. */
export function table(doc: Doc, columns: Column[], rows: (string | Rich)[][], size = 7.5): void {
  const rowH = size * 1.7;
  const total = columns.reduce((a, c) => a + c.width, 0);
  const scale = contentWidth(doc) / total;
  const header = () => {
    const y = doc.y;
    let x = MARGIN;
    doc.fontSize(size).fillColor(COLOURS.muted);
    for (const c of columns) {
      doc.text(c.title, x + 2, y, { width: c.width * scale - 4, align: c.align ?? 'left', lineBreak: false, ellipsis: true });
      x += c.width * scale;
    }
    doc.moveTo(MARGIN, y + rowH - 3).lineTo(MARGIN + total * scale, y + rowH - 3).lineWidth(0.5).strokeColor(COLOURS.rule).stroke();
    doc.y = y + rowH;
    doc.fillColor(COLOURS.text);
  };
  ensureSpace(doc, rowH * 3);
  header();
  for (const row of rows) {
    if (doc.y + rowH > bottomLimit(doc)) {
      doc.addPage();
      header();
    }
    const y = doc.y;
    let x = MARGIN;
    row.forEach((cell, i) => {
      const c = columns[i];
      const w = c.width * scale - 4;
      doc.fontSize(size).fillColor(COLOURS.text);
      if (typeof cell === 'string') doc.text(cell, x + 2, y, { width: w, align: c.align ?? 'left', lineBreak: false, ellipsis: true });
      else {
        const rw = richWidth(doc, cell, size);
        drawRich(doc, cell, c.align === 'right' ? x + 2 + w - rw : x + 2, y, size);
      }
      x += c.width * scale;
    });
    doc.y = y + rowH;
  }
  doc.x = MARGIN;
}

export function paragraph(doc: Doc, text: string, size = 8, colour: string = COLOURS.text): void {
  doc.fontSize(size);
  ensureSpace(doc, doc.heightOfString(text, { width: contentWidth(doc) }) + 2);
  doc.fillColor(colour).text(text, MARGIN, doc.y, { width: contentWidth(doc) });
  doc.fillColor(COLOURS.text);
}

export function cautionsBlock(doc: Doc): void {
  heading(doc, 'Cautions', 9.5);
  for (const c of CAUTIONS) paragraph(doc, c, 7.5, COLOURS.muted);
}
