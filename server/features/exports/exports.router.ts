import type { Response } from 'express';
import { errorBodySchema } from '@shared/schemas/common';
import { isobandsQuerySchema, surfaceExportQuerySchema } from '@shared/schemas/exports';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import type { SurfaceQuery } from '../ksurface/ksurface.service';
import { siteParams } from '../sites/sites.router';
import { attachment } from './file-name';
import { createExportsService, type ExportFile } from './exports.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const notMember = err('Not a member or no such site');
const CAUTIONS_NOTE = 'The product cautions apply (slug-test K is local to the screen; interpolated K is an estimate; results support, not replace, professional judgement)';

function send(res: Response, f: ExportFile): void {
  res.setHeader('Content-Type', f.contentType);
  res.setHeader('Content-Disposition', attachment(f.fileName));
  res.setHeader('Cache-Control', 'private, no-store');
  res.status(200).send(f.body);
}

export function exportsRoutes(ctx: AppContext): RouteDef[] {
  const svc = createExportsService(ctx);
  const base = '/api/sites/:siteId/exports';
  const wells = (file: string, format: 'csv' | 'geojson' | 'shapefile' | 'kml', summary: string, contentType: string): RouteDef => ({
    method: 'get', path: `${base}/${file}`, tag: 'Exports', summary: `${summary}. ${CAUTIONS_NOTE}.`,
    params: siteParams,
    responses: { 200: { description: `Attachment <site>-wells-<date>`, contentType }, 404: notMember },
    handler: async (req, res) => send(res, await svc.wells(req.siteAccess!.siteId, format)),
  });
  return [
    wells('wells.csv', 'csv', "The site's wells with Well K as CSV (UTF-8 with BOM, SI, units in the header names, formula characters neutralised)", 'text/csv'),
    wells('wells.geojson', 'geojson', "The site's wells with Well K as GeoJSON (RFC 7946, WGS84; cautions in a top-level member)", 'application/geo+json'),
    wells('wells-shapefile.zip', 'shapefile', "The site's wells with Well K as a zipped point shapefile in the site's system (.prj, .cpg UTF-8, README with the cautions)", 'application/zip'),
    wells('wells.kml', 'kml', "The site's wells with Well K as KML (WGS84; the cautions in the folder's description)", 'application/vnd.google-earth.kml+xml'),
    {
      method: 'get', path: `${base}/k-surface.tif`, tag: 'Exports',
      summary: `The K surface as a float32 GeoTIFF of log10 K (m/s) in the site's system, nodata -9999 outside the outline; the K surface's settings as query; the cautions in ImageDescription. ${CAUTIONS_NOTE}.`,
      params: siteParams, query: surfaceExportQuerySchema,
      responses: { 200: { description: 'Attachment <site>-k-surface-<date>.tif', contentType: 'image/tiff' }, 400: err('Fewer than 2 wells with a checked K, a grid over 1,000,000 cells, bad settings'), 404: notMember },
      handler: async (req, res) => send(res, await svc.surfaceGeoTiff(req.siteAccess!.siteId, req.query as unknown as SurfaceQuery)),
    },
    {
      method: 'get', path: `${base}/k-surface-isobands.geojson`, tag: 'Exports',
      summary: `Isobands of the K surface's log10 K (every stepLog10, default 0.5) as GeoJSON (RFC 7946, WGS84, each band's K range and area); the K surface's settings as query. ${CAUTIONS_NOTE}.`,
      params: siteParams, query: isobandsQuerySchema,
      responses: { 200: { description: 'Attachment <site>-k-surface-isobands-<date>.geojson', contentType: 'application/geo+json' }, 400: err('Fewer than 2 wells with a checked K, a grid over 1,000,000 cells, bad settings'), 404: notMember },
      handler: async (req, res) => send(res, await svc.surfaceIsobands(req.siteAccess!.siteId, req.query as unknown as SurfaceQuery & { stepLog10: number })),
    },
    {
      method: 'get', path: `${base}/fits.csv`, tag: 'Exports',
      summary: `Every Checked fit of the site that counts for Well K as CSV, one row per fit (well, record, method, window, T0, K, r², n, flags, preparer, checker, dates; SI). ${CAUTIONS_NOTE}.`,
      params: siteParams,
      responses: { 200: { description: 'Attachment <site>-fits-<date>.csv', contentType: 'text/csv' }, 404: notMember },
      handler: async (req, res) => send(res, await svc.fitsCsv(req.siteAccess!.siteId)),
    },
  ];
}
