import { queryOptions, type QueryClient } from '@tanstack/react-query';
import { api, seg } from '@/lib/api-client';
import {
  checkQueueSchema,
  fitAuditSchema,
  fitListSchema,
  fitSchema,
  reducedRecordSchema,
  wellKSchema,
  type CheckBody,
  type Fit,
  type FitBody,
  type FitPatch,
  type ReducedRecordDto,
} from '@shared/schemas/fits';
import { recordListSchema, recordSchema, seriesSchema } from '@shared/schemas/records';

export const reducedDtoSchema = reducedRecordSchema;
export type ReducedDto = ReducedRecordDto;

/** Readings sent for a preview; the saved result is always computed on all of them. */
export const PREVIEW_MAX_POINTS = 20000;
/** Points of the drawn curve (downsampled by the server, shape kept). */
export const PLOT_POINTS = 2000;

export const fitKeys = {
  all: ['fits'] as const,
  record: (recordId: string) => [...fitKeys.all, 'record-meta', recordId] as const,
  reduced: (recordId: string) => [...fitKeys.all, 'reduced', recordId] as const,
  series: (recordId: string) => [...fitKeys.all, 'series', recordId] as const,
  recordFits: (recordId: string) => [...fitKeys.all, 'record', recordId] as const,
  details: () => [...fitKeys.all, 'detail'] as const,
  detail: (fitId: string) => [...fitKeys.details(), fitId] as const,
  revisions: (fitId: string) => [...fitKeys.all, 'revisions', fitId] as const,
  audit: (fitId: string) => [...fitKeys.all, 'audit', fitId] as const,
  wellK: (wellId: string) => [...fitKeys.all, 'well-k', wellId] as const,
  wellFits: (wellId: string) => [...fitKeys.all, 'well-fits', wellId] as const,
  wellRecords: (wellId: string) => [...fitKeys.all, 'well-records', wellId] as const,
  checks: () => [...fitKeys.all, 'checks'] as const,
};

export function reducedQueryOptions(recordId: string) {
  return queryOptions({
    queryKey: fitKeys.reduced(recordId),
    queryFn: () => api.get(`/api/records/${seg(recordId)}/reduced?maxPoints=${PREVIEW_MAX_POINTS}`, reducedDtoSchema),
    // A record's readings do not change once stored.
    staleTime: Infinity,
  });
}

/** The record's metadata (well, test type and date) for the workspace's headings. */
export function recordMetaQueryOptions(recordId: string) {
  return queryOptions({
    queryKey: fitKeys.record(recordId),
    queryFn: () => api.get(`/api/records/${seg(recordId)}`, recordSchema),
  });
}

export function seriesQueryOptions(recordId: string) {
  return queryOptions({
    queryKey: fitKeys.series(recordId),
    queryFn: () => api.get(`/api/records/${seg(recordId)}/series?points=${PLOT_POINTS}`, seriesSchema),
    staleTime: Infinity,
  });
}

export function recordFitsQueryOptions(recordId: string) {
  return queryOptions({
    queryKey: fitKeys.recordFits(recordId),
    queryFn: async () => (await api.get(`/api/records/${seg(recordId)}/fits`, fitListSchema)).fits,
  });
}

export function fitQueryOptions(fitId: string) {
  return queryOptions({
    queryKey: fitKeys.detail(fitId),
    queryFn: () => api.get(`/api/fits/${seg(fitId)}`, fitSchema),
  });
}

export function revisionsQueryOptions(fitId: string) {
  return queryOptions({
    queryKey: fitKeys.revisions(fitId),
    queryFn: async () => (await api.get(`/api/fits/${seg(fitId)}/revisions`, fitListSchema)).fits,
  });
}

export function auditQueryOptions(fitId: string) {
  return queryOptions({
    queryKey: fitKeys.audit(fitId),
    queryFn: async () => (await api.get(`/api/fits/${seg(fitId)}/audit`, fitAuditSchema)).events,
  });
}

export function wellKQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: fitKeys.wellK(wellId),
    queryFn: () => api.get(`/api/wells/${seg(wellId)}/k`, wellKSchema),
  });
}

export function wellFitsQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: fitKeys.wellFits(wellId),
    queryFn: async () => (await api.get(`/api/wells/${seg(wellId)}/fits`, fitListSchema)).fits,
  });
}

/** The well's records, for the legend of the repeat-test overlay. */
export function wellRecordsQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: fitKeys.wellRecords(wellId),
    queryFn: async () => (await api.get(`/api/wells/${seg(wellId)}/records`, recordListSchema)).records,
  });
}

export function checksQueryOptions() {
  return queryOptions({
    queryKey: fitKeys.checks(),
    queryFn: async () => (await api.get('/api/checks', checkQueueSchema)).items,
  });
}

export function createFit(recordId: string, body: FitBody) {
  return api.post(`/api/records/${seg(recordId)}/fits`, body, fitSchema);
}

/** A Checked fit is not changed: the server answers with a new revision (another id). */
export function updateFit(fitId: string, body: FitPatch) {
  return api.patch(`/api/fits/${seg(fitId)}`, body, fitSchema);
}

/** Submit with a reason for each flag that changes K and is not answered by the fit. */
export function submitFit(fitId: string, reasons: Record<string, string> = {}) {
  return api.post(`/api/fits/${seg(fitId)}/submit`, { reasons }, fitSchema);
}

export function checkFit(fitId: string, body: CheckBody) {
  return api.post(`/api/fits/${seg(fitId)}/check`, body, fitSchema);
}

/** After a change to a fit: everything that shows it, its chain, its well or the check queue. */
export async function invalidateFit(queryClient: QueryClient, fit: Pick<Fit, 'id' | 'recordId' | 'wellId'>, previousId?: string) {
  const keys = [
    fitKeys.detail(fit.id),
    fitKeys.audit(fit.id),
    fitKeys.revisions(fit.id),
    fitKeys.recordFits(fit.recordId),
    fitKeys.wellFits(fit.wellId),
    fitKeys.wellK(fit.wellId),
    fitKeys.checks(),
  ];
  if (previousId && previousId !== fit.id) keys.push(fitKeys.detail(previousId), fitKeys.audit(previousId), fitKeys.revisions(previousId));
  await Promise.all(keys.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}
