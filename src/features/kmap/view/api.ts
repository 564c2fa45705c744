import { queryOptions } from '@tanstack/react-query';
import { kSurfaceSchema } from '@shared/schemas/ksurface';
import { viewInfoSchema, viewOutlineListSchema, viewSketchListSchema, viewWellsSchema } from '@shared/schemas/viewer-links';
import { api, isApiError, seg } from '@/lib/api-client';

/*
 * The read-only page of a viewer link: everything it reads goes through /api/view/:token, the only
 * routes a token opens. Nothing is retried on a 404 (the link is dead) and nothing is kept after
 * the page closes (the server answers no-store).
 */
export const viewKeys = {
  all: ['view'] as const,
  info: (token: string) => [...viewKeys.all, token, 'info'] as const,
  layer: (token: string, layer: 'wells' | 'k-surface' | 'outlines' | 'capture-sketches') => [...viewKeys.all, token, layer] as const,
};

const base = (token: string) => `/api/view/${seg(token)}`;
const retry = (failures: number, error: unknown) => failures < 2 && !(isApiError(error) && error.status < 500);

export function viewInfoQueryOptions(token: string) {
  return queryOptions({ queryKey: viewKeys.info(token), queryFn: () => api.get(base(token), viewInfoSchema), retry, staleTime: Infinity });
}

export function viewWellsQueryOptions(token: string, enabled: boolean) {
  return queryOptions({ queryKey: viewKeys.layer(token, 'wells'), queryFn: () => api.get(`${base(token)}/wells`, viewWellsSchema), retry, enabled, staleTime: Infinity });
}

export function viewSurfaceQueryOptions(token: string, enabled: boolean) {
  return queryOptions({ queryKey: viewKeys.layer(token, 'k-surface'), queryFn: () => api.get(`${base(token)}/k-surface`, kSurfaceSchema), retry, enabled, staleTime: Infinity });
}

export function viewOutlinesQueryOptions(token: string, enabled: boolean) {
  return queryOptions({
    queryKey: viewKeys.layer(token, 'outlines'),
    queryFn: async () => (await api.get(`${base(token)}/outlines`, viewOutlineListSchema)).outlines,
    retry, enabled, staleTime: Infinity,
  });
}

export function viewSketchesQueryOptions(token: string, enabled: boolean) {
  return queryOptions({
    queryKey: viewKeys.layer(token, 'capture-sketches'),
    queryFn: async () => (await api.get(`${base(token)}/capture-sketches`, viewSketchListSchema)).sketches,
    retry, enabled, staleTime: Infinity,
  });
}
