import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { outlineBodySchema, outlineListSchema, outlinePatchSchema, outlineSchema } from '@shared/schemas/ksurface';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { createOutlinesService } from './outlines.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const siteParams = z.object({ siteId: z.string().uuid('Site id must be a UUID') });
const outlineParams = siteParams.extend({ outlineId: z.string().uuid('Outline id must be a UUID') });
const fileName = (name: string) => `${name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'outline'}.geojson`;

export function outlinesRoutes(ctx: AppContext): RouteDef[] {
  const svc = createOutlinesService(ctx);
  const ids = (req: { siteAccess?: { siteId: string }; params: Record<string, unknown> }) => [req.siteAccess!.siteId, String(req.params.outlineId)] as const;
  return [
    {
      method: 'get', path: '/api/sites/:siteId/outlines', tag: 'K surface', summary: "The site's outlines (plumes, study areas), WGS84",
      params: siteParams,
      responses: { 200: { description: 'Outlines, oldest first', schema: outlineListSchema } },
      handler: async (req) => ({ outlines: await svc.list(req.siteAccess!.siteId) }),
    },
    {
      method: 'post', path: '/api/sites/:siteId/outlines', tag: 'K surface',
      summary: 'Add an outline: a GeoJSON Polygon or MultiPolygon (or a Feature or FeatureCollection of one), in WGS84 or the site’s system; within 20 km of the site’s wells',
      params: siteParams, body: outlineBodySchema, status: 201,
      responses: { 201: { description: 'The outline, in WGS84, with its area', schema: outlineSchema }, 400: err('Not a polygon, unclosed or crossing rings, outside the site, no area, over 10,000 vertices (field geometry)') },
      handler: (req) => svc.create(req.siteAccess!.siteId, req.user!.id, req.body),
    },
    {
      // Before the plain outline route, which would take "….geojson" for an id.
      method: 'get', path: '/api/sites/:siteId/outlines/:outlineId.geojson', tag: 'K surface', summary: 'Download an outline as a GeoJSON Feature (WGS84)',
      params: outlineParams,
      responses: { 200: { description: 'GeoJSON Feature', contentType: 'application/geo+json' }, 404: err('No such outline') },
      handler: async (req, res) => {
        const { outline, body } = await svc.feature(...ids(req));
        res.setHeader('Content-Type', 'application/geo+json; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="${fileName(outline.name)}"`);
        res.status(200).send(JSON.stringify(body));
      },
    },
    {
      method: 'get', path: '/api/sites/:siteId/outlines/:outlineId', tag: 'K surface', summary: 'One outline',
      params: outlineParams,
      responses: { 200: { description: 'The outline', schema: outlineSchema }, 404: err('No such outline') },
      handler: (req) => svc.get(...ids(req)),
    },
    {
      method: 'patch', path: '/api/sites/:siteId/outlines/:outlineId', tag: 'K surface', summary: 'Rename an outline or replace its geometry (checked like a new one)',
      params: outlineParams, body: outlinePatchSchema,
      responses: { 200: { description: 'The outline', schema: outlineSchema }, 400: err('Bad name or geometry'), 404: err('No such outline') },
      handler: (req) => svc.update(...ids(req), req.body),
    },
    {
      method: 'delete', path: '/api/sites/:siteId/outlines/:outlineId', tag: 'K surface', summary: 'Delete an outline', status: 204,
      params: outlineParams,
      responses: { 204: { description: 'Deleted' }, 404: err('No such outline') },
      handler: (req) => svc.remove(...ids(req)),
    },
  ];
}
