import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { crsSchema, epsgCodeSchema, siteBodySchema, sitePatchSchema, siteListSchema, siteSchema } from '@shared/schemas/sites';
import type { AppContext } from '../../context';
import { notFound } from '../../lib/errors';
import type { RouteDef } from '../../lib/route';
import { lookupCrs } from './crs';
import { createSitesService } from './sites.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
export const siteParams = z.object({ siteId: z.string().uuid('Site id must be a UUID') });

export function sitesRoutes(ctx: AppContext): RouteDef[] {
  const svc = createSitesService(ctx);
  return [
    {
      method: 'get', path: '/api/crs/:code', tag: 'Sites', summary: 'Look up a coordinate reference system by EPSG code',
      params: z.object({ code: epsgCodeSchema }),
      responses: { 200: { description: 'The CRS', schema: crsSchema }, 404: err('Unknown code') },
      handler: (req) => {
        const crs = lookupCrs(Number(req.params.code));
        if (!crs) throw notFound(`EPSG code ${req.params.code}`);
        return crs;
      },
    },
    {
      method: 'get', path: '/api/sites', tag: 'Sites', summary: 'The sites I belong to (all sites for an Admin)',
      responses: { 200: { description: 'Sites', schema: siteListSchema } },
      handler: async (req) => ({ sites: await svc.list(req.user!) }),
    },
    {
      method: 'post', path: '/api/sites', tag: 'Sites', summary: 'Create a site; the creator becomes its Lead',
      body: siteBodySchema, status: 201,
      responses: { 201: { description: 'Created', schema: siteSchema }, 400: err('Invalid fields or unknown EPSG code'), 403: err('Not allowed to create sites (SITE_CREATORS)') },
      handler: (req) => svc.create(req.user!, req.body),
    },
    {
      method: 'get', path: '/api/sites/:siteId', tag: 'Sites', summary: 'One site',
      params: siteParams,
      responses: { 200: { description: 'The site', schema: siteSchema }, 404: err('Not a member or no such site') },
      handler: (req) => svc.get(req.siteAccess!.siteId, req.siteAccess!.role),
    },
    {
      method: 'patch', path: '/api/sites/:siteId', tag: 'Sites', summary: 'Change a site (Lead)',
      params: siteParams, body: sitePatchSchema,
      responses: { 200: { description: 'The site', schema: siteSchema }, 400: err('Invalid fields') },
      handler: (req) => svc.update(req.siteAccess!.siteId, req.siteAccess!.role, req.body),
    },
  ];
}
