import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { importQuerySchema, importReportSchema, wellImportBodySchema } from '@shared/schemas/well-import';
import { wellInputSchema, wellListSchema, wellPatchSchema, wellSchema } from '@shared/schemas/wells';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { siteParams } from '../sites/sites.router';
import { createWellsImport, multipartImport, wellsCsv } from './wells.import';
import { createWellsService } from './wells.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
export const wellParams = z.object({ wellId: z.string().uuid('Well id must be a UUID') });

export function wellsRoutes(ctx: AppContext): RouteDef[] {
  const svc = createWellsService(ctx);
  const importer = createWellsImport(ctx);
  return [
    {
      method: 'get', path: '/api/sites/:siteId/wells', tag: 'Wells', summary: "The site's monitoring wells (SI: metres, depths below ground)",
      params: siteParams,
      responses: { 200: { description: 'Wells, sorted by name', schema: wellListSchema }, 404: err('Not a member or no such site') },
      handler: async (req) => ({ wells: await svc.list(req.siteAccess!.siteId) }),
    },
    {
      method: 'post', path: '/api/sites/:siteId/wells', tag: 'Wells',
      summary: 'Add a well: lengths each with a unit (m, cm, mm, ft, in), coordinates in an EPSG system or as latitude/longitude',
      params: siteParams, body: wellInputSchema, status: 201,
      responses: {
        201: { description: 'The well, in SI', schema: wellSchema },
        400: err('Invalid fields, each named: construction, coordinates outside the system’s area of use, unknown unit'),
        409: err('A well of that name exists on the site'),
      },
      handler: (req) => svc.create(req.siteAccess!.siteId, req.body),
    },
    {
      method: 'get', path: '/api/sites/:siteId/wells.csv', tag: 'Wells', summary: "Export the site's wells as CSV in its display units (units in the headers)",
      params: siteParams,
      responses: { 200: { description: 'CSV, one well per row', contentType: 'text/csv' }, 404: err('Not a member or no such site') },
      handler: async (req, res) => {
        const site = await svc.siteOrThrow(req.siteAccess!.siteId);
        const csv = wellsCsv(site, await svc.list(site.id));
        const file = `${site.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'site'}-wells.csv`;
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="${file}"`);
        res.status(200).send(csv);
      },
    },
    {
      method: 'post', path: '/api/sites/:siteId/wells/import', tag: 'Wells',
      summary: 'Import wells from CSV (JSON with the text, or multipart: file + settings JSON); ?dryRun=true lists every row’s problems by line without saving; otherwise all or nothing',
      params: siteParams, query: importQuerySchema, body: wellImportBodySchema, status: 201,
      before: [multipartImport],
      responses: {
        200: { description: 'Dry run: the report, nothing saved', schema: importReportSchema },
        201: { description: 'Imported: every row saved in one transaction', schema: importReportSchema },
        400: err('Unreadable file, incomplete mapping, or rows with problems (fields keyed lines.<line>.<field>); nothing saved'),
        413: err('File over the size limit'),
      },
      handler: async (req, res) => {
        const dryRun = (req.query as unknown as { dryRun: boolean }).dryRun;
        const report = await importer.run(req.siteAccess!.siteId, req.body, dryRun);
        if (dryRun) res.status(200).json(report);
        return report;
      },
    },
    {
      method: 'get', path: '/api/wells/:wellId', tag: 'Wells', summary: 'One well, in SI',
      params: wellParams,
      responses: { 200: { description: 'The well', schema: wellSchema }, 404: err('Not a member, or no such well') },
      handler: (req) => svc.get(String(req.params.wellId)),
    },
    {
      method: 'patch', path: '/api/wells/:wellId', tag: 'Wells', summary: 'Change a well: any of the fields; the changed well is checked as a whole',
      params: wellParams, body: wellPatchSchema,
      responses: { 200: { description: 'The well', schema: wellSchema }, 400: err('Invalid fields, each named'), 409: err('Name already used on the site') },
      handler: (req) => svc.update(String(req.params.wellId), req.body),
    },
    {
      method: 'delete', path: '/api/wells/:wellId', tag: 'Wells', summary: 'Delete a well that has no records',
      params: wellParams, status: 204,
      responses: { 204: { description: 'Deleted' }, 409: err('The well has records') },
      handler: async (req) => {
        await svc.remove(String(req.params.wellId));
      },
    },
  ];
}
