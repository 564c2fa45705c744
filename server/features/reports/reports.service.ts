import type { Fit } from '@shared/schemas/fits';
import type { AppContext } from '../../context';
import { notFound } from '../../lib/errors';
import { createFitsService, loadReduced, type Actor } from '../fits/fits.service';
import { RecordEntity } from '../records/record.entity';
import { RecordFile } from '../records/record-file.entity';
import { Site } from '../sites/site.entity';
import { Well } from '../wells/well.entity';
import { exportFileName } from '../exports/file-name';
import { fitPage, type FitPageData } from './fit-page';
import { createDoc, toBuffer, writeFooters, type PageSize } from './pdf';
import { createSiteReportData, siteReportPages } from './site-report';

export interface ReportFile {
  fileName: string;
  body: Buffer;
}

/** The site's choice of paper; a site that never chose gets Letter with US units and A4 otherwise. */
export function pageSizeFor(site: Pick<Site, 'displayUnits'> & { reportPageSize?: PageSize | null }): PageSize {
  return site.reportPageSize ?? (site.displayUnits === 'US' ? 'Letter' : 'A4');
}

export function createReportsService(ctx: AppContext) {
  const { ds } = ctx;
  const fits = createFitsService(ctx);

  async function siteOrThrow(siteId: string): Promise<Site> {
    const site = await ds.getRepository(Site).findOneBy({ id: siteId });
    if (!site) throw notFound('The site');
    return site;
  }

  /** What one fit's page shows, read fresh: the fit, its well, its record, its files' names and hashes, the full reduced series. */
  async function fitPageData(site: Site, fit: Fit, wells?: Map<string, Well>): Promise<FitPageData> {
    const record = await ds.getRepository(RecordEntity).findOneOrFail({ where: { id: fit.recordId } });
    const well = wells?.get(fit.wellId) ?? (await ds.getRepository(Well).findOneOrFail({ where: { id: fit.wellId } }));
    const files = await ds.getRepository(RecordFile).find({ where: { recordId: record.id }, select: { id: true, role: true, name: true, sha256: true, sizeBytes: true } });
    const raw = files.find((f) => f.role === 'raw') ?? null;
    const baro = files.find((f) => f.role === 'barometric') ?? null;
    const reduced = await loadReduced(ds.manager, record);
    // Every reading from the test start, as the workspace plots them.
    const start = reduced.testStartIndex;
    return {
      site: { name: site.name, epsgCode: site.epsgCode, crsName: site.crsName, units: site.displayUnits },
      fit,
      well,
      record: {
        source: record.source, reference: record.reference, testType: record.direction, testDate: record.testDate, fieldCrew: record.fieldCrew, notes: record.notes,
        staticLevelM: record.staticLevelM, h0M: record.h0M, sampleCount: record.sampleCount, durationSeconds: record.durationSeconds, slugVolumeM3: record.slugVolumeM3,
        rawFile: raw ? { name: raw.name, sha256: raw.sha256, sizeBytes: raw.sizeBytes } : null,
        barometricFile: baro ? { name: baro.name, sha256: baro.sha256 } : null,
      },
      series: { elapsedSeconds: reduced.elapsedSeconds.subarray(start), normalizedHead: reduced.normalizedHead.subarray(start) },
    };
  }

  async function fitReport(fitId: string, actor: Actor): Promise<ReportFile> {
    const fit = await fits.get(fitId, actor);
    const site = await siteOrThrow(fit.siteId);
    const now = new Date();
    const doc = createDoc(pageSizeFor(site), { title: `Fit report: well ${fit.wellName}, ${site.name}`, subject: `Kfield fit ${fit.id}` });
    fitPage(doc, await fitPageData(site, fit));
    writeFooters(doc, () => `fit ${fit.id} (revision ${fit.revision})`, now);
    return { fileName: exportFileName(site.name, `fit-${fit.wellName.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-r${fit.revision}`, 'pdf', now), body: await toBuffer(doc) };
  }

  async function siteReport(siteId: string, actor: Actor): Promise<ReportFile> {
    const site = await siteOrThrow(siteId);
    const now = new Date();
    const data = await createSiteReportData(ctx, site);
    const doc = createDoc(pageSizeFor(site), { title: `Site report: ${site.name}`, subject: `Kfield site report ${site.id}` });
    siteReportPages(doc, data, now);
    // The appendix: every Checked fit that counts for Well K, by well.
    const checked = data.checkedFitIds;
    const wells = new Map((await ds.getRepository(Well).find({ where: { siteId } })).map((w) => [w.id, w]));
    const appendixStart = doc.bufferedPageRange().count;
    for (const id of checked) fitPage(doc, await fitPageData(site, await fits.get(id, actor), wells));
    const pageCount = doc.bufferedPageRange().count;
    writeFooters(doc, (i) => (i >= appendixStart && i < pageCount ? `site report ${site.name}, appendix` : `site report ${site.name}`), now);
    return { fileName: exportFileName(site.name, 'site-report', 'pdf', now), body: await toBuffer(doc) };
  }

  return { fitReport, siteReport };
}

export type ReportsService = ReturnType<typeof createReportsService>;
