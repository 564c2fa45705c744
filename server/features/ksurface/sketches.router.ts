import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { captureSketchBodySchema, captureSketchListSchema, captureSketchSchema } from '@shared/schemas/ksurface';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { createSketchesService } from './sketches.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const siteParams = z.object({ siteId: z.string().uuid('Site id must be a UUID') });
const sketchParams = siteParams.extend({ sketchId: z.string().uuid('Sketch id must be a UUID') });

export function sketchesRoutes(ctx: AppContext): RouteDef[] {
  const svc = createSketchesService(ctx);
  return [
    {
      method: 'get', path: '/api/sites/:siteId/capture-sketches', tag: 'Capture sketches', summary: "The site's capture sketches with their numbers",
      params: siteParams,
      responses: { 200: { description: 'Sketches, oldest first', schema: captureSketchListSchema } },
      handler: async (req) => ({ sketches: await svc.list(req.siteAccess!.siteId) }),
    },
    {
      method: 'post', path: '/api/sites/:siteId/capture-sketches', tag: 'Capture sketches',
      summary: 'Sketch a trial extraction well: Javandel & Tsang capture zone, stagnation point and Cooper-Jacob drawdown, computed and stored',
      params: siteParams, body: captureSketchBodySchema, status: 201,
      responses: { 201: { description: 'The sketch with the server’s numbers', schema: captureSketchSchema }, 400: err('Bad rate, thickness, K or gradient (each named), collinear wells, wells without a static level') },
      handler: (req) => svc.create(req.siteAccess!.siteId, req.user!.id, req.body),
    },
    {
      method: 'get', path: '/api/sites/:siteId/capture-sketches.geojson', tag: 'Capture sketches',
      summary: 'Download every sketch as a GeoJSON FeatureCollection: trial wells, stagnation points and envelopes with their numbers and the cautions',
      params: siteParams,
      responses: { 200: { description: 'GeoJSON FeatureCollection (WGS84)', contentType: 'application/geo+json' } },
      handler: async (req, res) => {
        const body = await svc.featureCollection(req.siteAccess!.siteId);
        res.setHeader('Content-Type', 'application/geo+json; charset=utf-8');
        res.setHeader('Content-Disposition', 'attachment; filename="capture-sketches.geojson"');
        res.status(200).send(JSON.stringify(body));
      },
    },
    {
      method: 'get', path: '/api/sites/:siteId/capture-sketches/:sketchId', tag: 'Capture sketches', summary: 'One capture sketch',
      params: sketchParams,
      responses: { 200: { description: 'The sketch', schema: captureSketchSchema }, 404: err('No such sketch') },
      handler: (req) => svc.get(req.siteAccess!.siteId, String(req.params.sketchId)),
    },
    {
      method: 'delete', path: '/api/sites/:siteId/capture-sketches/:sketchId', tag: 'Capture sketches', summary: 'Delete a capture sketch', status: 204,
      params: sketchParams,
      responses: { 204: { description: 'Deleted' }, 404: err('No such sketch') },
      handler: (req) => svc.remove(req.siteAccess!.siteId, String(req.params.sketchId)),
    },
  ];
}
