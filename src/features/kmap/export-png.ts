import type { KUnit } from '@shared/units/conductivity';
import { decadeTicks, type DecadeDomain, type KColourScale } from './colour';
import { MAP_COLOURS } from './layers';

export interface LegendImage {
  title: string;
  domain: DecadeDomain;
  scale: KColourScale;
  unit: KUnit;
  unanalysedCount: number;
  /** Lines under the legend: the filters in force, the basemap's attribution, the caution. */
  notes: string[];
}

const FONT = '"Roboto Flex", system-ui, sans-serif';
const SUP: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };
const power = (d: number) => `10${String(d).split('').map((c) => SUP[c] ?? c).join('')}`;

/** The legend drawn under the map's image: title, colour bar with decade ticks, the grey ring, notes. */
export function drawLegend(ctx: CanvasRenderingContext2D, x: number, y: number, width: number, ratio: number, legend: LegendImage): number {
  const px = (n: number) => n * ratio;
  const pad = px(16);
  let cy = y + pad;
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(x, y, width, px(1000));
  ctx.fillStyle = '#0f172a';
  ctx.textBaseline = 'top';
  ctx.font = `600 ${px(15)}px ${FONT}`;
  ctx.fillText(legend.title, x + pad, cy);
  cy += px(24);
  ctx.font = `${px(12)}px ${FONT}`;
  ctx.fillStyle = '#334155';
  ctx.fillText(`Well K (${legend.unit}), log scale: a factor of 10 per tick`, x + pad, cy);
  cy += px(20);

  const barX = x + pad + px(12);
  const barW = Math.min(width - 2 * pad - px(24), px(520));
  const barH = px(14);
  const [lo, hi] = legend.scale.domain();
  for (let i = 0; i < Math.round(barW); i++) {
    ctx.fillStyle = legend.scale(lo + ((hi - lo) * (i + 0.5)) / barW);
    ctx.fillRect(barX + i, cy, 1, barH);
  }
  ctx.strokeStyle = '#94a3b8';
  ctx.lineWidth = px(1);
  ctx.strokeRect(barX, cy, barW, barH);
  cy += barH;
  ctx.fillStyle = '#0f172a';
  ctx.textAlign = 'center';
  for (const t of decadeTicks(legend.domain)) {
    const tx = barX + t.fraction * barW;
    ctx.fillRect(tx - px(0.5), cy, px(1), px(4));
    ctx.fillText(power(t.decade), tx, cy + px(6));
  }
  ctx.textAlign = 'left';
  cy += px(26);

  ctx.beginPath();
  ctx.arc(barX + px(6), cy + px(7), px(5), 0, 2 * Math.PI);
  ctx.strokeStyle = MAP_COLOURS.unanalysed;
  ctx.lineWidth = px(2);
  ctx.stroke();
  ctx.fillStyle = '#334155';
  ctx.fillText(`${legend.unanalysedCount.toLocaleString('en')} ${legend.unanalysedCount === 1 ? 'well' : 'wells'} without a Checked fit`, barX + px(18), cy + px(1));
  cy += px(22);

  ctx.font = `${px(11)}px ${FONT}`;
  ctx.fillStyle = '#475569';
  for (const note of legend.notes) {
    for (const line of wrap(ctx, note, width - 2 * pad)) {
      ctx.fillText(line, x + pad, cy);
      cy += px(15);
    }
  }
  return cy + pad - y;
}

function wrap(ctx: CanvasRenderingContext2D, text: string, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/)) {
    const next = line ? `${line} ${word}` : word;
    if (ctx.measureText(next).width > width && line) {
      lines.push(line);
      line = word;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

/** The map's current view with the legend under it, as a PNG. Needs the map drawn with preserveDrawingBuffer. */
export async function renderViewPng(mapCanvas: HTMLCanvasElement, legend: LegendImage): Promise<Blob> {
  const ratio = mapCanvas.width / Math.max(1, mapCanvas.clientWidth);
  const measure = document.createElement('canvas').getContext('2d');
  if (!measure) throw new Error('This browser cannot draw the image.');
  const legendHeight = drawLegend(measure, 0, 0, mapCanvas.width, ratio, legend);
  const out = document.createElement('canvas');
  out.width = mapCanvas.width;
  out.height = mapCanvas.height + Math.ceil(legendHeight);
  const ctx = out.getContext('2d');
  if (!ctx) throw new Error('This browser cannot draw the image.');
  ctx.drawImage(mapCanvas, 0, 0);
  drawLegend(ctx, 0, mapCanvas.height, out.width, ratio, legend);
  return new Promise((resolve, reject) => out.toBlob((b) => (b ? resolve(b) : reject(new Error('The image could not be made.'))), 'image/png'));
}

export function downloadBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
