import { queryOptions } from '@tanstack/react-query';
import { ApiError, api, seg } from '@/lib/api-client';
import { crsSchema, siteListSchema, siteSchema, type Crs, type SiteBody, type SitePatch } from '@shared/schemas/sites';

export const siteKeys = {
  all: ['sites'] as const,
  lists: () => [...siteKeys.all, 'list'] as const,
  details: () => [...siteKeys.all, 'detail'] as const,
  detail: (siteId: string) => [...siteKeys.details(), siteId] as const,
};

export const crsKeys = {
  all: ['crs'] as const,
  detail: (code: number) => [...crsKeys.all, code] as const,
};

export function sitesQueryOptions() {
  return queryOptions({
    queryKey: siteKeys.lists(),
    queryFn: async () => (await api.get('/api/sites', siteListSchema)).sites,
  });
}

export function siteQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: siteKeys.detail(siteId),
    queryFn: () => api.get(`/api/sites/${seg(siteId)}`, siteSchema),
  });
}

/** A CRS by EPSG code; null when the code is unknown, so the form can say so without an error state. */
export function crsQueryOptions(code: number) {
  return queryOptions({
    queryKey: crsKeys.detail(code),
    queryFn: async (): Promise<Crs | null> => {
      try {
        return await api.get(`/api/crs/${code}`, crsSchema);
      } catch (error) {
        if (error instanceof ApiError && error.status === 404) return null;
        throw error;
      }
    },
    staleTime: Infinity,
  });
}

export function createSite(body: SiteBody) {
  return api.post('/api/sites', body, siteSchema);
}

export function updateSite(siteId: string, body: SitePatch) {
  return api.patch(`/api/sites/${seg(siteId)}`, body, siteSchema);
}
