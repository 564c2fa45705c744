import { FIT_STATUS_LABELS, type Fit } from '@shared/schemas/fits';
import {
  COLOURS, MARGIN, cautionsBlock, concat, coordText, contentWidth, dateTime, drawRich, ensureSpace, heading, kRich, kUnitsFor, keyValues, lengthText,
  paragraph, plainNumber, radiusText, richNumber, secondsText, watermark, type Doc, type Rich, type Units,
} from './pdf';
import { drawSemilog } from './semilog-figure';

export interface FitPageData {
  site: { name: string; epsgCode: number; crsName: string; units: Units };
  fit: Fit;
  well: {
    name: string; siteX: number; siteY: number; hydroUnit: string | null; aquiferCondition: string;
    groundElevationM: number; measuringPointElevationM: number; screenTopDepthM: number; screenBottomDepthM: number;
    screenTopElevationM: number; screenBottomElevationM: number; casingRadiusM: number; screenRadiusM: number; boreholeRadiusM: number;
    intakeRadius: string; filterPackPorosity: number | null; staticWaterDepthM: number | null;
  };
  record: {
    source: string; reference: string; testType: string; testDate: string | null; fieldCrew: string; notes: string;
    staticLevelM: number; h0M: number; sampleCount: number; durationSeconds: number; slugVolumeM3: number | null;
    rawFile: { name: string; sha256: string; sizeBytes: number } | null;
    barometricFile: { name: string; sha256: string } | null;
  };
  series: { elapsedSeconds: ArrayLike<number>; normalizedHead: ArrayLike<number> };
}

const METHOD_LABEL: Record<Fit['method'], string> = { hvorslev: 'Hvorslev (1951)', 'bouwer-rice': 'Bouwer & Rice (1976)' };
const SOURCE_LABEL: Record<string, string> = { tape: 'Tape readings', logger: 'Logger file' };
const REFERENCE_LABEL: Record<string, string> = {
  depth: 'Depth below the measuring point',
  vented: 'Head above a vented sensor',
  absolute: 'Absolute pressure with a barometric record',
};

/** Whether a fit's page carries the "not checked" watermark: every state but Checked. */
export const needsWatermark = (fit: Pick<Fit, 'status'>) => fit.status !== 'checked';

/** One fit on one or two pages, in the site's units with SI alongside. */
export function fitPage(doc: Doc, d: FitPageData): void {
  const { fit, well, record, site } = d;
  const u = site.units;
  const r = fit.result;
  doc.addPage();
  if (needsWatermark(fit)) watermark(doc);
  const w = contentWidth(doc);

  // Title block
  doc.fillColor(COLOURS.accent).fontSize(15).text(`Fit report — well ${well.name}`, MARGIN, MARGIN, { width: w - 120 });
  doc.fillColor(COLOURS.muted).fontSize(8.5).text(`${site.name} · EPSG:${site.epsgCode} (${site.crsName}) · ${u === 'US' ? 'US customary units, SI alongside' : 'SI units'}`, MARGIN, doc.y, { width: w - 120 });
  const status = `${FIT_STATUS_LABELS[fit.status]}${fit.supersededAt ? ' · superseded' : ''}`;
  doc.fontSize(10).fillColor(fit.status === 'checked' ? COLOURS.accent : COLOURS.error).text(status, MARGIN + w - 150, MARGIN + 3, { width: 150, align: 'right' });
  doc.fillColor(COLOURS.text).x = MARGIN;
  doc.y = Math.max(doc.y, MARGIN + 36);

  // Results in large type
  const [k1, k2] = kUnitsFor(u);
  const ky = doc.y + 4;
  doc.rect(MARGIN, ky, w, 34).fill('#f1f5f9');
  doc.fillColor(COLOURS.text);
  const cell = (label: string, value: Rich, x: number) => {
    doc.fontSize(7).fillColor(COLOURS.muted).text(label, x, ky + 4, { lineBreak: false });
    doc.fillColor(COLOURS.text);
    drawRich(doc, value, x, ky + 15, 11);
  };
  cell('Hydraulic conductivity K', concat(kRich(r.kMetersPerSecond, k1), ' (', kRich(r.kMetersPerSecond, k2), ')'), MARGIN + 8);
  cell('Basic time lag T0', concat(richNumber(r.t0Seconds), ' s'), MARGIN + w * 0.54);
  cell('r²', [{ text: r.rSquared.toFixed(4) }], MARGIN + w * 0.72);
  cell('n', [{ text: String(r.count) }], MARGIN + w * 0.86);
  doc.y = ky + 40;
  doc.x = MARGIN;

  // Record
  heading(doc, 'Record', 10);
  keyValues(doc, [
    ['Source', SOURCE_LABEL[record.source] ?? record.source],
    ['Reference', REFERENCE_LABEL[record.reference] ?? record.reference],
    ['Test', `${record.testType}${record.slugVolumeM3 ? `, slug ${plainNumber(record.slugVolumeM3 * 1000)} L` : ''}`],
    ['Test date', record.testDate ?? '—'],
    ['Field crew', record.fieldCrew || '—'],
    ['Readings', `${record.sampleCount} over ${secondsText(record.durationSeconds)}`],
    ['Static level', lengthText(record.staticLevelM, u)],
    ['H0 (measured)', lengthText(record.h0M, u)],
    ['Raw file', record.rawFile ? `${record.rawFile.name} (${record.rawFile.sizeBytes} bytes)` : 'Typed tape readings (no file)'],
    ['Barometric file', record.barometricFile ? record.barometricFile.name : '—'],
  ]);
  if (record.rawFile) keyValues(doc, [['Raw file SHA-256', record.rawFile.sha256]], { columns: 1, labelWidth: 95 });
  if (record.barometricFile) keyValues(doc, [['Barometric SHA-256', record.barometricFile.sha256]], { columns: 1, labelWidth: 95 });

  // Construction table and schematic side by side
  heading(doc, 'Well construction', 10);
  const top = doc.y;
  const tableW = w * 0.68;
  const elev = (m: number) => lengthText(m, u);
  const depth = (m: number) => lengthText(m, u);
  keyValues(doc, [
    ['Location', `${coordText(well.siteX)}, ${coordText(well.siteY)} (EPSG:${site.epsgCode})`],
    ['Unit / condition', `${well.hydroUnit ?? '—'} · ${well.aquiferCondition}`],
    ['Ground elevation', elev(well.groundElevationM)],
    ['Measuring point', elev(well.measuringPointElevationM)],
    ['Screen top depth', depth(well.screenTopDepthM)],
    ['Screen bottom depth', depth(well.screenBottomDepthM)],
    ['Screen top elevation', elev(well.screenTopElevationM)],
    ['Screen bottom elevation', elev(well.screenBottomElevationM)],
    ['Casing radius', radiusText(well.casingRadiusM, u)],
    ['Screen radius', radiusText(well.screenRadiusM, u)],
    ['Borehole radius', radiusText(well.boreholeRadiusM, u)],
    ['Filter-pack porosity', well.filterPackPorosity === null ? '—' : String(well.filterPackPorosity)],
  ], { width: tableW, labelWidth: 88, size: 7.5 });
  const tableBottom = doc.y;
  drawSchematic(doc, d, { x: MARGIN + tableW + 10, y: top, width: w - tableW - 10, height: Math.max(120, tableBottom - top) });
  doc.y = Math.max(tableBottom, top + 120) + 4;
  doc.x = MARGIN;

  // Plot
  heading(doc, fit.model === 'high-k' ? 'Normalized head H/H0 against time (linear: the high-K model uses every reading)' : 'Normalized head H/H0 against time (semi-log)', 10);
  ensureSpace(doc, 190);
  const plotY = doc.y;
  drawSemilog(doc, {
    elapsedSeconds: d.series.elapsedSeconds,
    normalizedHead: d.series.normalizedHead,
    method: fit.method,
    highK: fit.model === 'high-k',
    window: r.window.source === 'all-readings' ? null : r.window,
    line: { intercept: r.intercept, slopePerSecond: r.slopePerSecond, lineCrossingSeconds: r.lineCrossingSeconds, t0Seconds: r.t0Seconds },
  }, { x: MARGIN, y: plotY, width: w, height: 185 });
  doc.y = plotY + 188;
  doc.x = MARGIN;
  paragraph(doc, `Every reading of the record from the test start (${d.series.elapsedSeconds.length}); teal: inside the fitting window (shaded), grey: outside; amber band: the recommended head range for the method; rust line: the fitted line; dashed: H/H0 = 1/e and the line's crossing, T0.`, 6.5, COLOURS.muted);

  // Method, parameters
  heading(doc, 'Method and parameters', 10);
  keyValues(doc, [
    ['Method', `${fit.model === 'high-k' ? 'High-K model, ' : ''}${METHOD_LABEL[fit.method]}`],
    ['Line', fit.line === 'anchored' ? 'Through H/H0 = 1 at t = 0' : 'Free intercept'],
  ]);
  keyValues(doc, [
    ['Formula', r.kReference],
    ['Line model', r.lineReference],
  ], { columns: 1, labelWidth: 95 });
  const g = fit.geometry;
  const hk = r.highK;
  keyValues(doc, [
    ['Window', r.window.source === 'all-readings' ? 'Every reading' : `${secondsText(r.window.fromSeconds)} – ${secondsText(r.window.toSeconds)}`],
    ['Window H/H0', `${plainNumber(r.window.headMax)} – ${plainNumber(r.window.headMin)} (${r.window.source})`],
    ['Slope', concat(richNumber(r.slopePerSecond), ' 1/s')],
    ['Intercept ln(H/H0)', plainNumber(r.intercept, 4)],
    ['H0 used', lengthText(r.h0M, u)],
    ['Effective H0', lengthText(r.effectiveH0M, u)],
    ['Expected H0 (slug)', lengthText(r.expectedH0M, u)],
    ['1/e crossing (record)', secondsText(r.recordCrossingSeconds)],
    ['Casing radius used', `${radiusText(r.casingRadiusUsedM, u)}${r.casingRadiusIsEffective ? ' (effective, filter pack)' : ''}`],
    ['Intake radius', `${radiusText(g.intake === 'borehole' ? g.boreholeRadiusM : g.screenRadiusM, u)} (${g.intake})`],
    ['Screen length L', lengthText(g.screenLengthM, u)],
    ['Anisotropy Kh/Kv', String(g.anisotropyRatio)],
    ['Static to screen bottom', lengthText(g.staticToScreenBottomM, u)],
    ['Saturated thickness', lengthText(g.saturatedThicknessM, u)],
    ['K (simplified formula)', r.kSimplifiedMetersPerSecond === null ? '—' : concat(kRich(r.kSimplifiedMetersPerSecond, k1), ' (', kRich(r.kSimplifiedMetersPerSecond, k2), ')')],
    ['Filter-pack porosity', g.filterPackPorosity === undefined ? '—' : String(g.filterPackPorosity)],
    ...(hk
      ? ([
          ['Damping C_D', `${plainNumber(hk.dampingParameter, 4)} (${hk.regime})`],
          ['Effective length L_e', `${lengthText(hk.effectiveLengthM, u)} (${hk.effectiveLengthFitted ? 'fitted' : 'held'})`],
          ['Residual RMS', plainNumber(hk.residualRms, 3)],
          ['Damped period', secondsText(hk.dampedPeriodSeconds)],
        ] as [string, string][])
      : []),
  ]);
  keyValues(doc, [
    ['K', concat(kRich(r.kMetersPerSecond, k1), '  ·  ', kRich(r.kMetersPerSecond, k2), u === 'US' ? '' : concat('  ·  ', kRich(r.kMetersPerSecond, 'cm/s')))],
    ['T0', concat(richNumber(r.t0Seconds), ' s')],
    ['r², n', `${r.rSquared.toFixed(4)}, ${r.count} readings in the window`],
  ], { columns: 1, labelWidth: 95, size: 8.5 });
  if (fit.note) keyValues(doc, [['Note', fit.note]], { columns: 1, labelWidth: 95 });

  // QC flags
  heading(doc, 'QC flags', 10);
  if (fit.flags.length === 0 && fit.resolvedFlags.length === 0) paragraph(doc, 'No QC flag is raised.', 8);
  for (const f of fit.flags) {
    const reason = fit.flagReasons[f.code];
    paragraph(doc, `${f.severity.toUpperCase()} · ${f.code}: ${f.message}`, 7.5, f.severity === 'error' ? COLOURS.error : f.severity === 'warning' ? COLOURS.warn : COLOURS.text);
    if (reason) paragraph(doc, `    Reason given: ${reason}`, 7.5);
    if (f.reference) paragraph(doc, `    Reference: ${f.reference}`, 6.5, COLOURS.muted);
  }
  for (const f of fit.resolvedFlags) paragraph(doc, `RESOLVED · ${f.code}: ${f.message} — ${f.action} by ${f.by.name}, ${dateTime(f.at)}`, 7.5, COLOURS.muted);

  // Lifecycle
  heading(doc, 'Lifecycle', 10);
  keyValues(doc, [
    ['State', status],
    ['Revision', `${fit.revision}${fit.supersededAt ? ` (superseded ${dateTime(fit.supersededAt)})` : ' (not superseded)'}`],
    ['Prepared by', `${fit.preparedBy.name}, ${dateTime(fit.createdAt)}`],
    ['Submitted', dateTime(fit.submittedAt)],
    ['Checked by', fit.checkedBy ? `${fit.checkedBy.name}, ${dateTime(fit.checkedAt)}` : '—'],
    ['Check comment', fit.checkComment || '—'],
  ]);

  cautionsBlock(doc);
}

/** The well to scale in depth (radii exaggerated, said in the caption): casing, screen, borehole, ground, static level. */
function drawSchematic(doc: Doc, d: FitPageData, box: { x: number; y: number; width: number; height: number }): void {
  const wl = d.well;
  const u = d.site.units;
  const stickUp = Math.max(0, wl.measuringPointElevationM - wl.groundElevationM);
  const totalM = stickUp + Math.max(wl.screenBottomDepthM, 0.5) * 1.06;
  const captionH = 18;
  const h = box.height - captionH - 4;
  const scale = h / totalM; // pt per metre of depth
  const yOf = (depthBelowGround: number) => box.y + 4 + (stickUp + depthBelowGround) * scale;
  const cx = box.x + box.width * 0.45;
  const rMax = Math.max(wl.boreholeRadiusM, wl.screenRadiusM, wl.casingRadiusM);
  const rs = (box.width * 0.28) / rMax; // radii exaggerated
  doc.save();
  // ground
  doc.lineWidth(0.8).strokeColor('#78716c').moveTo(box.x, yOf(0)).lineTo(box.x + box.width, yOf(0)).stroke();
  // borehole (filter pack) along the screen
  const bTop = Math.max(0, wl.screenTopDepthM - 0.3);
  doc.rect(cx - wl.boreholeRadiusM * rs, yOf(bTop), 2 * wl.boreholeRadiusM * rs, yOf(wl.screenBottomDepthM) - yOf(bTop)).fill('#fde68a');
  // casing
  doc.lineWidth(0.9).strokeColor(COLOURS.text);
  for (const s of [-1, 1]) doc.moveTo(cx + s * wl.casingRadiusM * rs, yOf(-stickUp)).lineTo(cx + s * wl.casingRadiusM * rs, yOf(wl.screenTopDepthM)).stroke();
  // screen, hatched
  const sTop = yOf(wl.screenTopDepthM);
  const sBot = yOf(wl.screenBottomDepthM);
  for (const s of [-1, 1]) {
    const x = cx + s * wl.screenRadiusM * rs;
    doc.lineWidth(0.9).dash(1.5, { space: 1.5 }).moveTo(x, sTop).lineTo(x, sBot).stroke().undash();
  }
  doc.moveTo(cx - wl.screenRadiusM * rs, sBot).lineTo(cx + wl.screenRadiusM * rs, sBot).stroke();
  // static water level
  const staticDepth = d.record.staticLevelM > 0 ? d.record.staticLevelM - stickUp : wl.staticWaterDepthM;
  if (staticDepth !== null && staticDepth >= 0 && staticDepth < totalM) {
    const y = yOf(staticDepth);
    doc.lineWidth(0.8).strokeColor('#2563eb').moveTo(cx - rMax * rs - 6, y).lineTo(cx + rMax * rs + 6, y).stroke();
  }
  doc.restore();
  // scale bar: a round length in the site's unit
  const unitM = u === 'US' ? 0.3048 : 1;
  const unitName = u === 'US' ? 'ft' : 'm';
  const spanUnits = totalM / unitM;
  const step = [1, 2, 5, 10, 20, 50, 100].find((s) => s >= spanUnits / 4) ?? 100;
  const barH = step * unitM * scale;
  const bx = box.x + box.width - 6;
  doc.lineWidth(0.8).strokeColor(COLOURS.text).moveTo(bx, yOf(0)).lineTo(bx, yOf(0) + barH).stroke();
  doc.fontSize(6).fillColor(COLOURS.muted).text(`${step} ${unitName}`, bx - 30, yOf(0) + barH + 1, { width: 30, align: 'right', lineBreak: false });
  doc.fontSize(6).text(`To scale in depth (radii × ${Math.round(rs / scale)}); blue: static level, yellow: filter pack, dashed: screen.`, box.x, box.y + box.height - captionH, { width: box.width });
  doc.fillColor(COLOURS.text);
}

