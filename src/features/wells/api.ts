import { queryOptions } from '@tanstack/react-query';
import { api, seg } from '@/lib/api-client';
import { importReportSchema, type WellImportBody } from '@shared/schemas/well-import';
import { wellListSchema, wellSchema, type WellInputParsed, type WellPatch } from '@shared/schemas/wells';

export const wellKeys = {
  all: ['wells'] as const,
  lists: () => [...wellKeys.all, 'list'] as const,
  list: (siteId: string) => [...wellKeys.lists(), siteId] as const,
  details: () => [...wellKeys.all, 'detail'] as const,
  detail: (wellId: string) => [...wellKeys.details(), wellId] as const,
};

export function wellsQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: wellKeys.list(siteId),
    queryFn: async () => (await api.get(`/api/sites/${seg(siteId)}/wells`, wellListSchema)).wells,
  });
}

export function wellQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: wellKeys.detail(wellId),
    queryFn: () => api.get(`/api/wells/${seg(wellId)}`, wellSchema),
  });
}

export function createWell(siteId: string, body: WellInputParsed) {
  return api.post(`/api/sites/${seg(siteId)}/wells`, body, wellSchema);
}

export function updateWell(wellId: string, body: WellPatch) {
  return api.patch(`/api/wells/${seg(wellId)}`, body, wellSchema);
}

export function deleteWell(wellId: string) {
  return api.delete(`/api/wells/${seg(wellId)}`);
}

export function importWells(siteId: string, body: WellImportBody, dryRun: boolean) {
  return api.post(`/api/sites/${seg(siteId)}/wells/import${dryRun ? '?dryRun=true' : ''}`, body, importReportSchema);
}

/** The CSV export is a plain download link: the browser keeps the session cookie. */
export function wellsCsvUrl(siteId: string): string {
  return `/api/sites/${seg(siteId)}/wells.csv`;
}
