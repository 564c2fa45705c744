import type { Request, Response } from 'express';
import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import type { Actor } from '../fits/fits.service';
import { siteParams } from '../sites/sites.router';
import { attachment } from '../exports/file-name';
import { createReportsService, type ReportFile } from './reports.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const actor = (req: Request): Actor => ({ user: req.user!, role: req.siteAccess?.role ?? null });

function send(res: Response, f: ReportFile): void {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', attachment(f.fileName));
  res.setHeader('Cache-Control', 'private, no-store');
  res.status(200).send(f.body);
}

export function reportsRoutes(ctx: AppContext): RouteDef[] {
  const svc = createReportsService(ctx);
  return [
    {
      method: 'get', path: '/api/fits/:fitId/report.pdf', tag: 'Reports',
      summary: "One fit's report as PDF (one or two pages, the site's paper size and units with SI alongside; a fit that is not Checked carries a NOT CHECKED watermark; the cautions on the page)",
      params: z.object({ fitId: z.string().uuid('Fit id must be a UUID') }),
      responses: { 200: { description: 'Attachment <site>-fit-<well>-r<revision>-<date>.pdf', contentType: 'application/pdf' }, 404: err('No such fit, or not a member of its site') },
      handler: async (req, res) => send(res, await svc.fitReport(String(req.params.fitId), actor(req))),
    },
    {
      method: 'get', path: '/api/sites/:siteId/reports/site.pdf', tag: 'Reports',
      summary: 'The site report as PDF: cover, wells with Well K, the K map figure, the histogram of log10 K, cross-validation, capture sketches and every Checked fit’s page (the cautions on the cover)',
      params: siteParams,
      responses: { 200: { description: 'Attachment <site>-site-report-<date>.pdf', contentType: 'application/pdf' }, 404: err('Not a member or no such site') },
      handler: async (req, res) => send(res, await svc.siteReport(req.siteAccess!.siteId, actor(req))),
    },
  ];
}
