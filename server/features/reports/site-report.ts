import { wellK } from '@shared/hydraulics/well-k';
import { decadeDomain, decadeTicks, kColourScale, parseColour, unitLog10Offset, type DecadeDomain, type KColourScale } from '@shared/plot/k-colour';
import { FIT_STATUSES, FIT_STATUS_LABELS, type FitStatus } from '@shared/schemas/fits';
import type { CaptureSketch, CrossValidation, KSurface } from '@shared/schemas/ksurface';
import { PNG } from 'pngjs';
import type { AppContext } from '../../context';
import { decodeCells } from '../exports/exports.service';
import { FitEntity } from '../fits/fit.entity';
import { createKSurfaceService, type SurfaceQuery } from '../ksurface/ksurface.service';
import { gridCrsFor, type GridCrs } from '../ksurface/grid-crs';
import { OutlineEntity } from '../ksurface/outline.entity';
import { createSketchesService } from '../ksurface/sketches.service';
import { RecordEntity } from '../records/record.entity';
import type { Site } from '../sites/site.entity';
import { Well } from '../wells/well.entity';
import {
  COLOURS, MARGIN, cautionsBlock, concat, coordText, contentWidth, drawRich, heading, kRich, kUnitsFor, keyValues, lengthText, paragraph,
  plainNumber, richNumber, table, type Doc, type Units,
} from './pdf';

export interface SiteWellRow {
  id: string; name: string; hydroUnit: string | null; x: number; y: number; lon: number; lat: number;
  kMetersPerSecond: number | null; log10K: number | null; log10StdDev: number | null; checkedFits: number;
}

export interface SiteReportData {
  site: { name: string; description: string; epsgCode: number; crsName: string; units: Units };
  wells: SiteWellRow[];
  recordCount: number;
  testDates: { from: string | null; to: string | null };
  fitsByState: Record<FitStatus, number>;
  supersededCount: number;
  checkedFitIds: string[];
  crs: GridCrs;
  outlines: { name: string; rings: [number, number][][] }[];
  surface: { s: KSurface; cells: Float32Array; outlineName: string | null } | null;
  surfaceNote: string | null;
  crossValidation: CrossValidation | null;
  sketches: CaptureSketch[];
}

/** Everything the site report shows, read once. The K surface uses the default settings over the site's first outline. */
export async function createSiteReportData(ctx: AppContext, site: Site): Promise<SiteReportData> {
  const { ds } = ctx;
  const wells = await ds.getRepository(Well).find({ where: { siteId: site.id }, order: { name: 'ASC' } });
  const fits = await ds.getRepository(FitEntity).find({ where: { siteId: site.id }, select: { id: true, wellId: true, status: true, supersededAt: true, kMetersPerSecond: true, checkedAt: true }, order: { checkedAt: 'ASC' } });
  const records = await ds.getRepository(RecordEntity).find({ where: { siteId: site.id }, select: { id: true, testDate: true } });
  const fitsByState = Object.fromEntries(FIT_STATUSES.map((s) => [s, 0])) as Record<FitStatus, number>;
  for (const f of fits) fitsByState[f.status]++;
  const counting = fits.filter((f) => f.status === 'checked' && !f.supersededAt);
  const byWell = new Map<string, number[]>();
  for (const f of counting) if (f.kMetersPerSecond > 0) byWell.set(f.wellId, [...(byWell.get(f.wellId) ?? []), f.kMetersPerSecond]);
  const rows: SiteWellRow[] = wells.map((w) => {
    const ks = byWell.get(w.id);
    const k = ks ? wellK(ks) : null;
    return { id: w.id, name: w.name, hydroUnit: w.hydroUnit, x: w.siteX, y: w.siteY, lon: w.lon, lat: w.lat, kMetersPerSecond: k?.kMetersPerSecond ?? null, log10K: k?.log10Mean ?? null, log10StdDev: k?.log10StdDev ?? null, checkedFits: k?.count ?? 0 };
  });
  const dates = records.map((r) => r.testDate).filter((d): d is string => !!d).sort();
  const wellName = new Map(wells.map((w) => [w.id, w.name]));
  const checkedFitIds = counting.slice().sort((a, b) => (wellName.get(a.wellId) ?? '').localeCompare(wellName.get(b.wellId) ?? '')).map((f) => f.id);

  const outlineRows = await ds.getRepository(OutlineEntity).find({ where: { siteId: site.id }, order: { createdAt: 'ASC' } });
  const surfaces = createKSurfaceService(ctx);
  const q: SurfaceQuery = { power: 2, outlineId: outlineRows[0]?.id } as SurfaceQuery;
  let crs: GridCrs;
  let surface: SiteReportData['surface'] = null;
  let surfaceNote: string | null = null;
  let cv: CrossValidation | null = null;
  try {
    crs = (await surfaces.inputs(site.id, q)).crs;
    const s = await surfaces.surface(site.id, q);
    surface = { s, cells: decodeCells(s.log10K), outlineName: outlineRows[0]?.name ?? null };
    cv = await surfaces.crossValidation(site.id, q);
  } catch (e) {
    const n = wells.length ? { lon: wells.reduce((a, w) => a + w.lon, 0) / wells.length, lat: wells.reduce((a, w) => a + w.lat, 0) / wells.length } : null;
    crs = gridCrsFor(site, n);
    surfaceNote = `No K surface: ${(e as Error).message}`;
  }
  const outlines = outlineRows.map((o) => {
    const polys = o.geometry.type === 'Polygon' ? [o.geometry.coordinates] : o.geometry.coordinates;
    return { name: o.name, rings: polys.flatMap((p) => p.map((r) => r.map(([lon, lat]) => crs.wgs84ToGrid(lon, lat)))) };
  });
  const sketches = await createSketchesService(ctx).list(site.id);
  return {
    site: { name: site.name, description: site.description, epsgCode: site.epsgCode, crsName: site.crsName, units: site.displayUnits },
    wells: rows, recordCount: records.length, testDates: { from: dates[0] ?? null, to: dates[dates.length - 1] ?? null },
    fitsByState, supersededCount: fits.filter((f) => f.supersededAt).length, checkedFitIds,
    crs, outlines, surface, surfaceNote, crossValidation: cv, sketches,
  };
}

/** The site report's own pages: cover, wells table, K map, histogram, cross-validation, capture sketches. */
export function siteReportPages(doc: Doc, d: SiteReportData, now: Date): void {
  const u = d.site.units;
  const [k1, k2] = kUnitsFor(u);
  const withK = d.wells.filter((x) => x.log10K !== null);
  const domain = decadeDomain(withK.map((x) => x.log10K!), k1);
  const scale = kColourScale(domain);

  // Cover
  doc.addPage();
  const w = contentWidth(doc);
  doc.fillColor(COLOURS.accent).fontSize(22).text('Site report', MARGIN, MARGIN + 60, { width: w });
  doc.fillColor(COLOURS.text).fontSize(16).text(d.site.name, { width: w });
  if (d.site.description) doc.fontSize(9).fillColor(COLOURS.muted).text(d.site.description, { width: w });
  doc.moveDown(1.5);
  doc.fillColor(COLOURS.text);
  keyValues(doc, [
    ['Coordinate system', `EPSG:${d.site.epsgCode} (${d.site.crsName})`],
    ['Units', u === 'US' ? 'US customary (ft, ft/d), SI alongside' : 'SI (m, m/s)'],
    ['Tests', d.testDates.from ? `${d.testDates.from} to ${d.testDates.to}` : 'No test dates recorded'],
    ['Wells', `${d.wells.length} (${withK.length} with a Well K)`],
    ['Records', String(d.recordCount)],
    ...FIT_STATUSES.map((s) => [`Fits ${FIT_STATUS_LABELS[s]}`, String(d.fitsByState[s])] as [string, string]),
    ['Superseded fits', String(d.supersededCount)],
    ['Fits in the appendix', `${d.checkedFitIds.length} (every Checked fit that counts for Well K)`],
    ['Generated', `${now.toISOString().replace('T', ' ').slice(0, 16)} UTC`],
  ], { columns: 1, labelWidth: 130, size: 10 });
  doc.moveDown(1);
  paragraph(doc, 'Well K is the geometric mean of a well’s Checked fits that no later revision replaced (Freeze, 1975). Spread is the standard deviation of their log10 K. The K surface is inverse distance weighting of log10 Well K (Shepard, 1968).', 8, COLOURS.muted);
  cautionsBlock(doc);

  // Wells table
  doc.addPage();
  heading(doc, 'Wells and Well K', 13);
  table(doc, [
    { title: 'Well', width: 60 }, { title: 'Unit', width: 70 }, { title: `x (EPSG:${d.site.epsgCode})`, width: 70, align: 'right' }, { title: 'y', width: 70, align: 'right' },
    { title: `Well K (${k1})`, width: 78, align: 'right' }, { title: `Well K (${k2})`, width: 78, align: 'right' }, { title: 'Spread (log10)', width: 55, align: 'right' }, { title: 'Checked fits', width: 45, align: 'right' },
  ], d.wells.map((x) => [
    x.name, x.hydroUnit ?? '—', coordText(x.x), coordText(x.y),
    x.kMetersPerSecond === null ? 'not analysed' : kRich(x.kMetersPerSecond, k1),
    x.kMetersPerSecond === null ? '—' : kRich(x.kMetersPerSecond, k2),
    x.log10StdDev === null ? '—' : x.log10StdDev.toFixed(2), String(x.checkedFits),
  ]));

  // K map
  doc.addPage();
  heading(doc, 'K map', 13);
  const mapH = Math.min(w * 0.95, doc.page.height - doc.y - MARGIN - 130);
  drawKMap(doc, d, scale, domain, { x: MARGIN, y: doc.y, width: w, height: mapH });
  doc.y += mapH + 6;
  drawLegend(doc, domain, scale, { x: MARGIN, y: doc.y, width: Math.min(320, w) });
  doc.y += 34;
  doc.x = MARGIN;
  paragraph(doc, [
    `Wells coloured by Well K on a log scale (the K map’s scale); hollow grey: no Checked fit. Coordinates in EPSG:${d.site.epsgCode}.`,
    d.surface ? `K surface: IDW of log10 Well K, power ${d.surface.s.settings.power}, ${d.surface.s.wellsUsed} wells, cell ${plainNumber(d.surface.s.cellSizeM)} m${d.surface.outlineName ? `, clipped to the outline “${d.surface.outlineName}”` : ''}.` : d.surfaceNote ?? '',
    'No basemap is drawn in this figure (the report holds Kfield’s own data only).',
    ...(d.surface?.s.warnings ?? []),
  ].filter(Boolean).join(' '), 7.5, COLOURS.muted);

  // Histogram and cross-validation
  doc.addPage();
  heading(doc, `Histogram of log10 Well K (${k1})`, 13);
  drawHistogram(doc, withK.map((x) => x.log10K!), domain, scale, { x: MARGIN, y: doc.y, width: w, height: 170 });
  doc.y += 176;
  doc.x = MARGIN;
  heading(doc, 'Cross-validation of the K surface (leave one out)', 13);
  if (d.crossValidation) {
    const cv = d.crossValidation;
    const y0 = doc.y;
    drawCvScatter(doc, cv, { x: MARGIN, y: y0, width: w * 0.55, height: 210 });
    drawCvByPower(doc, cv, { x: MARGIN + w * 0.6, y: y0, width: w * 0.4, height: 210 });
    doc.y = y0 + 216;
    doc.x = MARGIN;
    paragraph(doc, `Power ${cv.power}: RMSE ${cv.rmseLog10.toFixed(3)} log10 units, mean error ${cv.meanErrorLog10.toFixed(3)}, n = ${cv.n}; the lowest RMSE is at power ${cv.suggestedPower}. Each well’s K predicted from the others against its own Well K (log10 m/s).`, 8, COLOURS.muted);
  } else paragraph(doc, d.surfaceNote ?? 'No cross-validation.', 8);

  // Capture sketches
  heading(doc, 'Capture sketches', 13);
  if (d.sketches.length === 0) paragraph(doc, 'No capture sketch on this site.', 8);
  for (const s of d.sketches) {
    heading(doc, s.name, 10);
    const gradient = s.inputs.gradient as { kind?: string; value?: number; directionDeg?: number };
    keyValues(doc, [
      ['Location', `${coordText(s.x)}, ${coordText(s.y)} (EPSG:${d.site.epsgCode})`],
      ['Pumping rate', `${s.inputs.rate.value} ${s.inputs.rate.unit}`],
      ['Saturated thickness', lengthText(s.inputs.thicknessM, u)],
      ['K', s.inputs.kMetersPerSecond ? concat(kRich(s.inputs.kMetersPerSecond, k1), ' (entered)') : concat(kRich(s.results.kMetersPerSecond, k1), ' (K surface)')],
      ['Gradient', `${plainNumber(s.results.gradient, 3)} towards ${plainNumber(s.results.flowDirectionDeg, 3)}°${gradient.kind ? ` (${gradient.kind})` : ''}`],
      ['Transmissivity', concat(richNumber(s.results.transmissivityM2PerS), ' m²/s')],
      ['Stagnation point', `${lengthText(s.results.stagnationPointM, u)} downgradient`],
      ['Capture width', `${lengthText(s.results.captureWidthAtWellM, u)} at the well, ${lengthText(s.results.captureWidthFarM, u)} far upgradient`],
      ['Cooper-Jacob drawdown', `${lengthText(s.results.cooperJacob.drawdownM, u)} at ${lengthText(s.inputs.drawdownRadiusM, u)} after ${plainNumber(s.inputs.drawdownTimeS / 3600, 3)} h${s.results.cooperJacob.valid ? '' : ' (outside the approximation)'}`],
      ['Made by', `${s.createdBy}, ${s.createdAt.slice(0, 10)}`],
    ]);
  }
  paragraph(doc, 'Capture sketches are screening estimates that assume a homogeneous, isotropic aquifer in uniform flow (Javandel & Tsang, 1986).', 7.5, COLOURS.muted);
}

// ─── figures ────────────────────────────────────────────────────────────────────────────────

interface Box { x: number; y: number; width: number; height: number }

function niceStep(span: number, target: number): number {
  const raw = span / target;
  const p = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 2.5, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? 10 * p;
}

/** Wells, outline, K surface raster, scale bar, north arrow and site-system coordinate ticks, in the grid's metres. */
function drawKMap(doc: Doc, d: SiteReportData, scale: KColourScale, _domain: DecadeDomain, box: Box): void {
  const pts = d.wells.map((x) => ({ ...x, g: d.crs.wgs84ToGrid(x.lon, x.lat) }));
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  const grow = (x: number, y: number) => { minX = Math.min(minX, x); maxX = Math.max(maxX, x); minY = Math.min(minY, y); maxY = Math.max(maxY, y); };
  for (const p of pts) grow(p.g[0], p.g[1]);
  for (const o of d.outlines) for (const r of o.rings) for (const [x, y] of r) grow(x, y);
  if (d.surface) { const s = d.surface.s; grow(s.minX, s.minY); grow(s.minX + s.cols * s.cellSizeM, s.minY + s.rows * s.cellSizeM); }
  if (!Number.isFinite(minX)) { minX = 0; minY = 0; maxX = 100; maxY = 100; }
  const padX = Math.max(20, (maxX - minX) * 0.06);
  const padY = Math.max(20, (maxY - minY) * 0.06);
  minX -= padX; maxX += padX; minY -= padY; maxY += padY;
  const inner = { x: box.x + 46, y: box.y + 4, width: box.width - 50, height: box.height - 20 };
  const k = Math.min(inner.width / (maxX - minX), inner.height / (maxY - minY)); // pt per metre, equal in x and y
  const ox = inner.x + (inner.width - (maxX - minX) * k) / 2;
  const oy = inner.y + (inner.height - (maxY - minY) * k) / 2;
  const px = (x: number) => ox + (x - minX) * k;
  const py = (y: number) => oy + (maxY - y) * k;
  const fw = (maxX - minX) * k;
  const fh = (maxY - minY) * k;

  doc.save();
  doc.rect(ox, oy, fw, fh).fill('#f8fafc');
  doc.rect(ox, oy, fw, fh).clip();
  if (d.surface) {
    const { s, cells } = d.surface;
    const png = new PNG({ width: s.cols, height: s.rows });
    const cache = new Map<number, [number, number, number]>();
    for (let i = 0; i < cells.length; i++) {
      const v = cells[i];
      const o = i * 4;
      if (!Number.isFinite(v)) { png.data[o + 3] = 0; continue; }
      const key = Math.round(v * 200);
      let c = cache.get(key);
      if (!c) { c = parseColour(scale(key / 200)); cache.set(key, c); }
      png.data[o] = c[0]; png.data[o + 1] = c[1]; png.data[o + 2] = c[2]; png.data[o + 3] = 200;
    }
    doc.image(PNG.sync.write(png), px(s.minX), py(s.minY + s.rows * s.cellSizeM), { width: s.cols * s.cellSizeM * k, height: s.rows * s.cellSizeM * k });
  }
  for (const o of d.outlines) {
    for (const r of o.rings) r.forEach(([x, y], i) => (i === 0 ? doc.moveTo(px(x), py(y)) : doc.lineTo(px(x), py(y))));
    doc.closePath().lineWidth(1.2).dash(4, { space: 2 }).strokeColor('#be123c').stroke().undash();
  }
  for (const s of d.sketches) {
    const ring = s.results.envelope.coordinates[0].map(([lon, lat]) => d.crs.wgs84ToGrid(lon, lat));
    ring.forEach(([x, y], i) => (i === 0 ? doc.moveTo(px(x), py(y)) : doc.lineTo(px(x), py(y))));
    doc.closePath().lineWidth(0.9).strokeColor('#1d4ed8').stroke();
  }
  const r = Math.max(2.5, Math.min(5, 220 / Math.max(1, pts.length)));
  for (const p of pts) {
    const x = px(p.g[0]);
    const y = py(p.g[1]);
    if (p.log10K === null) doc.circle(x, y, r).lineWidth(0.8).strokeColor('#64748b').stroke();
    else doc.circle(x, y, r).lineWidth(0.6).fillColor(scale(p.log10K)).strokeColor('#ffffff').fillAndStroke();
  }
  doc.fillColor(COLOURS.text).fontSize(5.5);
  for (const p of pts) doc.text(p.name, px(p.g[0]) + r + 1, py(p.g[1]) - 3, { lineBreak: false });
  doc.restore();
  doc.lineWidth(0.6).strokeColor(COLOURS.text).rect(ox, oy, fw, fh).stroke();

  // Coordinate ticks in the site's system along the bottom and left edges
  const step = niceStep(maxX - minX, 5);
  doc.fontSize(6).fillColor(COLOURS.muted);
  const siteAt = (x: number, y: number) => d.crs.gridToSite(x, y);
  for (let x = Math.ceil(minX / step) * step; x <= maxX; x += step) {
    doc.moveTo(px(x), oy + fh).lineTo(px(x), oy + fh + 3).stroke();
    doc.text(coordText(siteAt(x, minY)[0]), px(x) - 30, oy + fh + 4, { width: 60, align: 'center', lineBreak: false });
  }
  for (let y = Math.ceil(minY / step) * step; y <= maxY; y += step) {
    doc.moveTo(ox - 3, py(y)).lineTo(ox, py(y)).stroke();
    doc.text(coordText(siteAt(minX, y)[1]), ox - 48, py(y) - 3, { width: 44, align: 'right', lineBreak: false });
  }
  // Scale bar (metres, or feet on a US site) and north arrow (grid north)
  const unitM = d.site.units === 'US' ? 0.3048 : 1;
  const barUnits = niceStep(((maxX - minX) / unitM) * 0.9, 4);
  const barPt = barUnits * unitM * k;
  const bx = ox + 10;
  const by = oy + fh - 14;
  doc.rect(bx - 4, by - 10, barPt + 50, 20).fillOpacity(0.8).fill('#ffffff').fillOpacity(1);
  doc.rect(bx, by, barPt / 2, 3).fill(COLOURS.text);
  doc.rect(bx + barPt / 2, by, barPt / 2, 3).lineWidth(0.5).stroke(COLOURS.text);
  doc.fillColor(COLOURS.text).fontSize(6.5).text(`${plainNumber(barUnits)} ${d.site.units === 'US' ? 'ft' : 'm'}`, bx + barPt + 4, by - 2, { lineBreak: false });
  const nx = ox + fw - 18;
  const ny = oy + 12;
  doc.moveTo(nx, ny).lineTo(nx - 6, ny + 18).lineTo(nx, ny + 13).lineTo(nx + 6, ny + 18).closePath().fill(COLOURS.text);
  doc.fontSize(8).text('N', nx - 3, ny + 19, { lineBreak: false });
}

function drawLegend(doc: Doc, domain: DecadeDomain, scale: KColourScale, box: { x: number; y: number; width: number }): void {
  const [lo, hi] = scale.domain();
  const steps = 64;
  for (let i = 0; i < steps; i++) doc.rect(box.x + (box.width * i) / steps, box.y, box.width / steps + 0.3, 9).fill(scale(lo + ((hi - lo) * (i + 0.5)) / steps));
  doc.fillColor(COLOURS.text);
  for (const t of decadeTicks(domain)) {
    const x = box.x + box.width * t.fraction;
    doc.moveTo(x, box.y + 9).lineTo(x, box.y + 12).lineWidth(0.5).stroke(COLOURS.text);
    drawRich(doc, [{ text: '10' }, { text: String(t.decade).replace('-', '−'), sup: true }], x - 6, box.y + 14, 7);
  }
  doc.fontSize(7).text(`Well K (${domain.unit})`, box.x + box.width + 8, box.y + 1, { lineBreak: false });
}

function drawHistogram(doc: Doc, log10KsSi: number[], domain: DecadeDomain, scale: KColourScale, box: Box): void {
  const offset = unitLog10Offset(domain.unit);
  const binW = 0.25;
  const lo = domain.fromDecade;
  const hi = domain.toDecade;
  const n = Math.round((hi - lo) / binW);
  const counts = Array.from({ length: n }, () => 0);
  for (const v of log10KsSi) counts[Math.min(n - 1, Math.max(0, Math.floor((v + offset - lo) / binW)))]++;
  const maxC = Math.max(1, ...counts);
  const left = box.x + 30;
  const bottom = box.y + box.height - 22;
  const width = box.width - 40;
  const height = box.height - 30;
  for (let i = 0; i < n; i++) {
    const h = (counts[i] / maxC) * height;
    if (h > 0) doc.rect(left + (width * i) / n + 0.5, bottom - h, width / n - 1, h).fill(scale(lo + (i + 0.5) * binW - offset));
  }
  doc.lineWidth(0.6).strokeColor(COLOURS.text).moveTo(left, bottom).lineTo(left + width, bottom).moveTo(left, bottom).lineTo(left, bottom - height).stroke();
  doc.fillColor(COLOURS.text);
  for (let dcd = lo; dcd <= hi; dcd++) drawRich(doc, [{ text: '10' }, { text: String(dcd).replace('-', '−'), sup: true }], left + (width * (dcd - lo)) / (hi - lo) - 6, bottom + 4, 7);
  for (let c = 0; c <= maxC; c += Math.max(1, Math.ceil(maxC / 5))) doc.fontSize(6.5).text(String(c), left - 18, bottom - (c / maxC) * height - 3, { width: 14, align: 'right', lineBreak: false });
  doc.fontSize(7).text(`wells per ${binW} log10 bin; n = ${log10KsSi.length}`, left + width - 160, box.y, { width: 160, align: 'right', lineBreak: false });
}

function axes(doc: Doc, box: Box, xDomain: [number, number], yDomain: [number, number], xLabel: string, yLabel: string) {
  const left = box.x + 30;
  const right = box.x + box.width - 6;
  const top = box.y + 6;
  const bottom = box.y + box.height - 24;
  const sx = (v: number) => left + ((v - xDomain[0]) / (xDomain[1] - xDomain[0])) * (right - left);
  const sy = (v: number) => bottom - ((v - yDomain[0]) / (yDomain[1] - yDomain[0])) * (bottom - top);
  doc.lineWidth(0.6).strokeColor(COLOURS.text).rect(left, top, right - left, bottom - top).stroke();
  doc.fontSize(6.5).fillColor(COLOURS.text);
  const xs = niceStep(xDomain[1] - xDomain[0], 5);
  for (let v = Math.ceil(xDomain[0] / xs) * xs; v <= xDomain[1] + 1e-9; v += xs) doc.text(plainNumber(v, 3), sx(v) - 15, bottom + 3, { width: 30, align: 'center', lineBreak: false });
  const ys = niceStep(yDomain[1] - yDomain[0], 5);
  for (let v = Math.ceil(yDomain[0] / ys) * ys; v <= yDomain[1] + 1e-9; v += ys) doc.text(plainNumber(v, 3), left - 28, sy(v) - 3, { width: 25, align: 'right', lineBreak: false });
  doc.fontSize(7).text(xLabel, left, bottom + 13, { width: right - left, align: 'center', lineBreak: false });
  doc.text(yLabel, left, box.y - 4, { lineBreak: false });
  return { sx, sy, left, right, top, bottom };
}

function drawCvScatter(doc: Doc, cv: CrossValidation, box: Box): void {
  const vals = cv.wells.flatMap((w) => [w.observedLog10K, w.predictedLog10K]);
  const lo = Math.floor(Math.min(...vals) * 2) / 2;
  const hi = Math.ceil(Math.max(...vals) * 2) / 2;
  const a = axes(doc, box, [lo, hi], [lo, hi], 'observed log10 Well K (m/s)', 'predicted log10 K (m/s)');
  doc.lineWidth(0.6).dash(3, { space: 2 }).strokeColor(COLOURS.muted).moveTo(a.sx(lo), a.sy(lo)).lineTo(a.sx(hi), a.sy(hi)).stroke().undash();
  for (const w of cv.wells) doc.circle(a.sx(w.observedLog10K), a.sy(w.predictedLog10K), 2.2).fill(COLOURS.accent);
}

function drawCvByPower(doc: Doc, cv: CrossValidation, box: Box): void {
  const ps = cv.byPower.map((p) => p.power);
  const rs = cv.byPower.map((p) => p.rmseLog10);
  const a = axes(doc, box, [Math.min(...ps), Math.max(...ps)], [0, Math.max(...rs) * 1.15], 'IDW power', 'RMSE (log10)');
  cv.byPower.forEach((p, i) => (i === 0 ? doc.moveTo(a.sx(p.power), a.sy(p.rmseLog10)) : doc.lineTo(a.sx(p.power), a.sy(p.rmseLog10))));
  doc.lineWidth(1).strokeColor(COLOURS.accent).stroke();
  for (const p of cv.byPower) doc.circle(a.sx(p.power), a.sy(p.rmseLog10), p.power === cv.suggestedPower ? 3 : 1.6).fill(p.power === cv.suggestedPower ? '#9a3412' : COLOURS.accent);
}

