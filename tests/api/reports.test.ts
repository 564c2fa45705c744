import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PDFParse } from 'pdf-parse';
import { PNG } from 'pngjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTIONS } from '../../shared/cautions';
import type { Fit } from '../../shared/schemas/fits';
import { kFromSi } from '../../shared/units/conductivity';
import { FitEntity } from '../../server/features/fits/fit.entity';
import { pdfSafe } from '../../server/features/reports/pdf';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let viewer: ApiClient;
let lead: ApiClient;

beforeAll(async () => {
  ts = await startTestServer();
  viewer = await ts.as(demoEmail('Viewer'));
  lead = await ts.as(demoEmail('Lead'));
});
afterAll(async () => ts.close());

const today = () => new Date().toISOString().slice(0, 10);
const binary = (req: ReturnType<ApiClient['get']>) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

async function pdfText(body: Buffer): Promise<{ text: string; pages: number }> {
  const parser = new PDFParse({ data: new Uint8Array(body) });
  const r = await parser.getText();
  await parser.destroy();
  return { text: r.text, pages: r.total };
}
/** The page's text with runs of white space as one space (a raised exponent is its own text run). */
const flat = (s: string) => s.replace(/\s+/g, ' ');
/** How the report writes a number: 3 significant digits, mantissa × 10 then the raised exponent. */
function sci(x: number, digits = 3): string {
  const abs = Math.abs(x);
  if (abs >= 0.01 && abs < 10000) return String(Number(x.toPrecision(digits)));
  const [m, e] = x.toExponential(digits - 1).split('e');
  return `${m} × 10 ?${String(Number(e)).replace('-', '−')}`;
}

const HAS_PDFTOPPM = spawnSync('pdftoppm', ['-v']).status === 0;
/** The first page as PNG (pdftoppm, 50 dpi): the share of pixels that are not white. */
function firstPageInk(body: Buffer, keepAs?: string): number {
  const dir = mkdtempSync(join(tmpdir(), 'kfield-pdf-'));
  writeFileSync(join(dir, 'r.pdf'), body);
  execFileSync('pdftoppm', ['-png', '-r', '50', '-f', '1', '-l', '1', join(dir, 'r.pdf'), join(dir, 'p')]);
  const file = readdirSync(dir).find((f) => f.endsWith('.png'))!;
  const bytes = readFileSync(join(dir, file));
  if (keepAs) writeFileSync(keepAs, bytes);
  const png = PNG.sync.read(bytes);
  let ink = 0;
  for (let i = 0; i < png.data.length; i += 4) if (png.data[i] < 240 || png.data[i + 1] < 240 || png.data[i + 2] < 240) ink++;
  return ink / (png.width * png.height);
}

async function demoFits(status: Fit['status']): Promise<FitEntity[]> {
  return ts.ds.getRepository(FitEntity).find({ where: { siteId: ts.demoSiteId, status }, order: { createdAt: 'ASC' } });
}

describe('fit report', () => {
  it('prints a Checked fit’s stored numbers in the site’s units (K in m/s and m/d, T0, r², n), its well, method, flags, lifecycle and cautions, on 1–2 pages without the watermark', async () => {
    const [entity] = await demoFits('checked');
    const fit = (await viewer.get(`/api/fits/${entity.id}`).expect(200)).body as Fit;
    const r = await binary(viewer.get(`/api/fits/${fit.id}/report.pdf`)).expect(200);
    expect(r.headers['content-type']).toBe('application/pdf');
    expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-fit-${fit.wellName.toLowerCase()}-r${fit.revision}-${today()}\\.pdf"$`));
    const { text, pages } = await pdfText(r.body);
    const t = flat(text);
    expect(pages).toBeGreaterThanOrEqual(1);
    expect(pages).toBeLessThanOrEqual(2);
    expect(t).toContain(`well ${fit.wellName}`);
    // The demo site is SI: K in m/s, then m/d.
    expect(t).toMatch(new RegExp(`${sci(fit.result.kMetersPerSecond)} m/s`));
    expect(t).toMatch(new RegExp(`${sci(kFromSi(fit.result.kMetersPerSecond, 'm/d'))} m/d`));
    expect(t).toMatch(new RegExp(`${sci(fit.result.t0Seconds)} s`));
    expect(t).toContain(fit.result.rSquared.toFixed(4));
    expect(t).toContain(`${fit.result.count} readings in the window`);
    expect(t).toContain(fit.method === 'hvorslev' ? 'Hvorslev (1951)' : 'Bouwer & Rice (1976)');
    expect(t).toContain(flat(pdfSafe(fit.result.kReference)));
    for (const f of fit.flags) expect(t).toContain(flat(pdfSafe(`${f.code}: ${f.message}`)));
    for (const [, reason] of Object.entries(fit.flagReasons)) expect(t).toContain(flat(pdfSafe(`Reason given: ${reason}`)));
    expect(t).toContain(`Prepared by ${fit.preparedBy.name}`);
    expect(t).toContain(`Checked by ${fit.checkedBy!.name}`);
    expect(t).toContain(`Revision ${fit.revision} (not superseded)`);
    for (const c of CAUTIONS) expect(t).toContain(flat(c));
    expect(t).toContain(`fit ${fit.id}`);
    expect(t).not.toContain('NOT CHECKED');
  });

  it('marks a Draft and an Awaiting-check fit NOT CHECKED', async () => {
    for (const status of ['draft', 'awaiting-check'] as const) {
      const [entity] = await demoFits(status);
      const r = await binary(lead.get(`/api/fits/${entity.id}/report.pdf`)).expect(200);
      expect(flat((await pdfText(r.body)).text), status).toContain('NOT CHECKED');
    }
  });

  it('names a record’s raw file and its SHA-256', async () => {
    const fits = await demoFits('checked');
    for (const f of fits) {
      const file = (await ts.ds.query('SELECT name, sha256 FROM record_files WHERE recordId = ? AND role = ?', [f.recordId, 'raw'])) as { name: string; sha256: string }[];
      if (!file.length) continue;
      const r = await binary(viewer.get(`/api/fits/${f.id}/report.pdf`)).expect(200);
      const t = flat((await pdfText(r.body)).text);
      expect(t).toContain(file[0].name);
      expect(t).toContain(file[0].sha256);
      return;
    }
    throw new Error('No demo fit of a logger record');
  });

  it.skipIf(!HAS_PDFTOPPM)('has a first page that is not blank (pdftoppm)', async () => {
    const [entity] = await demoFits('checked');
    const r = await binary(viewer.get(`/api/fits/${entity.id}/report.pdf`)).expect(200);
    expect(firstPageInk(r.body)).toBeGreaterThan(0.03);
  });
});

describe('site report', () => {
  it('lets a Viewer download the site report: cover counts, the wells table, the map, cross-validation and every Checked fit’s page', async () => {
    const r = await binary(viewer.get(`/api/sites/${ts.demoSiteId}/reports/site.pdf`)).expect(200);
    expect(r.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="[a-z0-9-]+-site-report-${today()}\\.pdf"$`));
    const { text, pages } = await pdfText(r.body);
    const t = flat(text);
    const checked = (await demoFits('checked')).filter((f) => !f.supersededAt);
    const wells = (await viewer.get(`/api/sites/${ts.demoSiteId}/wells`).expect(200)).body.wells as { name: string }[];
    expect(t).toContain(`Wells ${wells.length}`);
    expect(t).toContain(`Fits Checked ${(await demoFits('checked')).length}`);
    expect(t).toContain(`Fits in the appendix ${checked.length}`);
    for (const w of wells) expect(t).toContain(w.name);
    expect(t).toContain('K map');
    expect(t).toContain('Cross-validation of the K surface');
    expect(pages).toBeGreaterThanOrEqual(4 + checked.length);
    expect((t.match(/Fit report — well /g) ?? []).length).toBe(checked.length);
    for (const c of CAUTIONS) expect(t).toContain(flat(c));
  });

  it('answers an outsider 404 for the site report and a fit report', async () => {
    await (await ts.as(demoEmail('Admin'))).post('/api/admin/users', { email: 'reports.outsider@demo.kfield.example', name: 'Reports Outsider', password: 'outsider-password-1' }).expect(201);
    const outsider = await ts.as('reports.outsider@demo.kfield.example', 'outsider-password-1');
    const [entity] = await demoFits('checked');
    expect((await outsider.get(`/api/sites/${ts.demoSiteId}/reports/site.pdf`)).status).toBe(404);
    expect((await outsider.get(`/api/fits/${entity.id}/report.pdf`)).status).toBe(404);
  });

  it('is listed in the OpenAPI document', async () => {
    const doc = (await viewer.get('/api/openapi.json').expect(200)).body;
    expect(Object.keys(doc.paths)).toEqual(expect.arrayContaining(['/api/fits/{fitId}/report.pdf', '/api/sites/{siteId}/reports/site.pdf']));
  });

  it.skipIf(!HAS_PDFTOPPM)('has a cover page that is not blank (pdftoppm)', async () => {
    const r = await binary(viewer.get(`/api/sites/${ts.demoSiteId}/reports/site.pdf`)).expect(200);
    expect(firstPageInk(r.body)).toBeGreaterThan(0.01);
  });
});
if (!HAS_PDFTOPPM) console.warn('pdftoppm (poppler-utils) is missing: the PNG checks of the reports are skipped');
