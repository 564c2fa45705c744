import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { crossValidationSchema, kAtQuerySchema, kAtSchema, kSurfaceQuerySchema, kSurfaceSchema } from '@shared/schemas/ksurface';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { createKSurfaceService, type SurfaceQuery } from './ksurface.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const siteParams = z.object({ siteId: z.string().uuid('Site id must be a UUID') });

export function kSurfaceRoutes(ctx: AppContext): RouteDef[] {
  const svc = createKSurfaceService(ctx);
  const query = (req: { query: unknown }) => req.query as SurfaceQuery;
  return [
    {
      method: 'get', path: '/api/sites/:siteId/k-surface', tag: 'K surface',
      summary: 'IDW of log10 Well K (Checked fits) over a grid, clipped to an outline; computed on request (grids up to 1,000,000 cells)',
      params: siteParams, query: kSurfaceQuerySchema,
      responses: { 200: { description: 'The surface: Float32 log10 K cells (base64), grid and WGS84 corners', schema: kSurfaceSchema }, 400: err('Fewer than 2 wells with a checked K, a grid over 1,000,000 cells, bad settings') },
      handler: (req) => svc.surface(req.siteAccess!.siteId, query(req)),
    },
    {
      method: 'get', path: '/api/sites/:siteId/k-surface/cross-validation', tag: 'K surface',
      summary: 'Leave-one-out cross-validation of the surface (RMSE and mean error in log10 K, per power) and next-test spots inside the outline',
      params: siteParams, query: kSurfaceQuerySchema,
      responses: { 200: { description: 'Cross-validation', schema: crossValidationSchema }, 400: err('Fewer than 2 wells with a checked K, bad settings') },
      handler: (req) => svc.crossValidation(req.siteAccess!.siteId, query(req)),
    },
    {
      method: 'get', path: '/api/sites/:siteId/k-at', tag: 'K surface',
      summary: 'The surface’s K at a point given in the site’s system, the 5 nearest wells and a suggested saturated thickness',
      params: siteParams, query: kAtQuerySchema,
      responses: { 200: { description: 'K at the point', schema: kAtSchema }, 400: err('No x/y, fewer than 2 wells with a checked K') },
      handler: (req) => svc.kAt(req.siteAccess!.siteId, req.query as unknown as SurfaceQuery & { x: number; y: number }),
    },
  ];
}
