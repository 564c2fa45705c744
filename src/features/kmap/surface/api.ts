import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api, seg } from '@/lib/api-client';
import { downloadBlob } from '../export-png';
import {
  captureSketchListSchema,
  captureSketchSchema,
  crossValidationSchema,
  kAtSchema,
  outlineListSchema,
  outlineSchema,
  type CaptureSketchBody,
  type OutlineBody,
} from '@shared/schemas/ksurface';

export const surfaceKeys = {
  all: ['ksurface'] as const,
  outlines: (siteId: string) => [...surfaceKeys.all, 'outlines', siteId] as const,
  crossValidation: (siteId: string, query: string) => [...surfaceKeys.all, 'cv', siteId, query] as const,
  kAt: (siteId: string, query: string) => [...surfaceKeys.all, 'k-at', siteId, query] as const,
  sketches: (siteId: string) => [...surfaceKeys.all, 'sketches', siteId] as const,
};

/** The surface settings as the API's query string (k-surface, cross-validation, k-at). */
export interface SurfaceQuery {
  outlineId: string | null;
  power: number;
  neighbours: number | null;
  searchRadiusM: number | null;
  cellSizeM: number | null;
  units: readonly string[] | null;
  screenElevationMinM: number | null;
  screenElevationMaxM: number | null;
}

export function surfaceQueryString(q: SurfaceQuery, extra: Record<string, number> = {}): string {
  const p = new URLSearchParams();
  if (q.outlineId) p.set('outlineId', q.outlineId);
  p.set('power', String(q.power));
  if (q.neighbours !== null) p.set('neighbours', String(q.neighbours));
  if (q.searchRadiusM !== null) p.set('searchRadiusM', String(q.searchRadiusM));
  if (q.cellSizeM !== null) p.set('cellSizeM', String(q.cellSizeM));
  if (q.units !== null) p.set('units', q.units.join(','));
  if (q.screenElevationMinM !== null) p.set('screenElevationMinM', String(q.screenElevationMinM));
  if (q.screenElevationMaxM !== null) p.set('screenElevationMaxM', String(q.screenElevationMaxM));
  for (const [k, v] of Object.entries(extra)) p.set(k, String(v));
  return p.toString();
}

/** The same settings as the body's `surface` field of a capture sketch. */
export function surfaceBody(q: SurfaceQuery): CaptureSketchBody['surface'] {
  return {
    ...(q.outlineId ? { outlineId: q.outlineId } : {}),
    power: q.power,
    ...(q.neighbours !== null ? { neighbours: q.neighbours } : {}),
    ...(q.searchRadiusM !== null ? { searchRadiusM: q.searchRadiusM } : {}),
    ...(q.units !== null ? { units: [...q.units] } : {}),
    ...(q.screenElevationMinM !== null ? { screenElevationMinM: q.screenElevationMinM } : {}),
    ...(q.screenElevationMaxM !== null ? { screenElevationMaxM: q.screenElevationMaxM } : {}),
  } as CaptureSketchBody['surface'];
}

export function outlinesQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: surfaceKeys.outlines(siteId),
    queryFn: async () => (await api.get(`/api/sites/${seg(siteId)}/outlines`, outlineListSchema)).outlines,
  });
}

export const createOutline = (siteId: string, body: OutlineBody) => api.post(`/api/sites/${seg(siteId)}/outlines`, body, outlineSchema);
export const patchOutline = (siteId: string, outlineId: string, body: Partial<OutlineBody>) =>
  api.patch(`/api/sites/${seg(siteId)}/outlines/${seg(outlineId)}`, body, outlineSchema);
export const deleteOutline = (siteId: string, outlineId: string) => api.delete(`/api/sites/${seg(siteId)}/outlines/${seg(outlineId)}`);
export const outlineGeojsonUrl = (siteId: string, outlineId: string) => `/api/sites/${seg(siteId)}/outlines/${seg(outlineId)}.geojson`;

export function crossValidationQueryOptions(siteId: string, query: string, enabled: boolean) {
  return queryOptions({
    queryKey: surfaceKeys.crossValidation(siteId, query),
    queryFn: () => api.get(`/api/sites/${seg(siteId)}/k-surface/cross-validation?${query}`, crossValidationSchema),
    enabled,
    staleTime: 60_000,
    retry: false,
  });
}

export function kAtQueryOptions(siteId: string, query: string, enabled: boolean) {
  return queryOptions({
    queryKey: surfaceKeys.kAt(siteId, query),
    queryFn: () => api.get(`/api/sites/${seg(siteId)}/k-at?${query}`, kAtSchema),
    enabled,
    retry: false,
  });
}

export function sketchesQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: surfaceKeys.sketches(siteId),
    queryFn: async () => (await api.get(`/api/sites/${seg(siteId)}/capture-sketches`, captureSketchListSchema)).sketches,
  });
}

export const createSketch = (siteId: string, body: CaptureSketchBody) => api.post(`/api/sites/${seg(siteId)}/capture-sketches`, body, captureSketchSchema);
export const deleteSketch = (siteId: string, sketchId: string) => api.delete(`/api/sites/${seg(siteId)}/capture-sketches/${seg(sketchId)}`);
export const sketchesGeojsonUrl = (siteId: string) => `/api/sites/${seg(siteId)}/capture-sketches.geojson`;

/** Downloads a server GeoJSON export through the page (the session cookie goes along). */
export async function downloadUrl(url: string, fileName: string): Promise<void> {
  const response = await fetch(url, { credentials: 'same-origin' });
  if (!response.ok) {
    const body = await response.json().catch(() => null);
    const parsed = z.object({ error: z.object({ message: z.string() }) }).safeParse(body);
    throw new Error(parsed.success ? parsed.data.error.message : `The export failed (${response.status}).`);
  }
  downloadBlob(await response.blob(), fileName);
}
