import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api, seg } from '@/lib/api-client';
import { fitListSchema } from '@shared/schemas/fits';
import { mapWellsSchema } from '@shared/schemas/map';
import { wellSchema } from '@shared/schemas/wells';

export const kmapKeys = {
  all: ['kmap'] as const,
  wells: (siteId: string) => [...kmapKeys.all, 'wells', siteId] as const,
  well: (wellId: string) => [...kmapKeys.all, 'well', wellId] as const,
  wellFits: (wellId: string) => [...kmapKeys.all, 'well-fits', wellId] as const,
  basemaps: () => [...kmapKeys.all, 'basemaps'] as const,
};

/**
 * The site's wells with their Well K, as GeoJSON. The server answers with an ETag and
 * `no-cache`, so the browser revalidates and an unchanged layer costs a 304.
 */
export function mapWellsQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: kmapKeys.wells(siteId),
    queryFn: () => api.get(`/api/sites/${seg(siteId)}/map/wells`, mapWellsSchema),
  });
}

/** The clicked well's construction, for the side panel. */
export function mapWellQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: kmapKeys.well(wellId),
    queryFn: () => api.get(`/api/wells/${seg(wellId)}`, wellSchema),
  });
}

/** The fits of the clicked well, with their status, for the side panel's links. */
export function mapWellFitsQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: kmapKeys.wellFits(wellId),
    queryFn: async () => (await api.get(`/api/wells/${seg(wellId)}/fits`, fitListSchema)).fits,
  });
}

/** What the map needs of a basemap: its name and its style. */
const basemapOptionSchema = z.object({ id: z.string(), name: z.string(), isDefault: z.boolean(), styleUrl: z.string() });
export type BasemapOption = z.infer<typeof basemapOptionSchema>;

/** The instance's basemaps (GET /api/basemaps, open to every signed-in person) for the basemap switch. */
export function basemapsQueryOptions() {
  return queryOptions({
    queryKey: kmapKeys.basemaps(),
    queryFn: async () => (await api.get('/api/basemaps', z.object({ basemaps: z.array(basemapOptionSchema) }))).basemaps,
    staleTime: 5 * 60_000,
  });
}
