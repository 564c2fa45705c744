import { z } from 'zod';
import { mapWellsSchema } from '@shared/schemas/map';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { createMapService } from './map.service';

export function mapRoutes(ctx: AppContext): RouteDef[] {
  const svc = createMapService(ctx);
  return [
    {
      method: 'get', path: '/api/sites/:siteId/map/wells', tag: 'K map', summary: 'The site’s wells as GeoJSON with Well K (geometric mean of Checked fits), count and spread',
      params: z.object({ siteId: z.string().uuid('Site id must be a UUID') }),
      responses: { 304: { description: 'Unchanged since the ETag sent in If-None-Match' }, 200: { description: 'GeoJSON FeatureCollection (WGS84)', schema: mapWellsSchema, contentType: 'application/geo+json' } },
      handler: async (req, res) => {
        const layer = await svc.wellsLayer(req.siteAccess!.siteId);
        res.setHeader('ETag', layer.etag);
        res.setHeader('Cache-Control', 'private, no-cache');
        if (req.get('if-none-match') === layer.etag) return void res.status(304).end();
        res.type('application/geo+json').send(layer.body);
      },
    },
  ];
}
