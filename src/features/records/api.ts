import { queryOptions, type QueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { csrfResponseSchema } from '@shared/schemas/auth';
import { errorBodySchema } from '@shared/schemas/common';
import {
  previewSchema,
  recordListSchema,
  recordSchema,
  seriesSchema,
  type LoggerSettingsInput,
  type Preview,
  type PreviewSettings,
  type RecordDto,
  type TapeBodyInput,
} from '@shared/schemas/records';
import { api, ApiError, CSRF_HEADER, seg } from '@/lib/api-client';

export const recordKeys = {
  all: ['records'] as const,
  lists: () => [...recordKeys.all, 'list'] as const,
  list: (wellId: string) => [...recordKeys.lists(), wellId] as const,
  details: () => [...recordKeys.all, 'detail'] as const,
  detail: (recordId: string) => [...recordKeys.details(), recordId] as const,
  series: (recordId: string, points: number, scale: 'log' | 'linear') => [...recordKeys.all, 'series', recordId, scale, points] as const,
};

/** Points of the record page's curve; the server keeps its shape by LTTB on log H/H0. */
export const CURVE_POINTS = 2000;

export function wellRecordsQueryOptions(wellId: string) {
  return queryOptions({
    queryKey: recordKeys.list(wellId),
    queryFn: async () => (await api.get(`/api/wells/${seg(wellId)}/records`, recordListSchema)).records,
  });
}

export function recordQueryOptions(recordId: string) {
  return queryOptions({
    queryKey: recordKeys.detail(recordId),
    queryFn: () => api.get(`/api/records/${seg(recordId)}`, recordSchema),
  });
}

export function recordSeriesQueryOptions(recordId: string, scale: 'log' | 'linear' = 'log', points = CURVE_POINTS) {
  return queryOptions({
    queryKey: recordKeys.series(recordId, points, scale),
    queryFn: () => api.get(`/api/records/${seg(recordId)}/series?scale=${scale}&points=${points}`, seriesSchema),
    // A record's readings never change once stored.
    staleTime: Infinity,
  });
}

export function recordFileUrl(recordId: string, which: 'raw' | 'barometric'): string {
  return `/api/records/${seg(recordId)}/file?which=${which}`;
}

/**
 * After a record is added or removed: this feature's lists, and any other query keyed by the well
 * (other features' summaries of the well's records refetch without this one knowing their keys).
 */
export async function invalidateWellRecords(queryClient: QueryClient, wellId: string): Promise<void> {
  await queryClient.invalidateQueries({ predicate: (q) => q.queryKey[0] === recordKeys.all[0] || q.queryKey.includes(wellId) });
}

export function createTapeRecord(wellId: string, body: TapeBodyInput): Promise<RecordDto> {
  return api.post(`/api/wells/${seg(wellId)}/records`, body, recordSchema);
}

export function deleteRecord(recordId: string): Promise<void> {
  return api.delete(`/api/records/${seg(recordId)}`);
}

async function csrfToken(): Promise<string> {
  return (await api.get('/api/auth/csrf', csrfResponseSchema)).csrfToken;
}

/** The start of a big logger file is enough to read its layout; the whole file is sent on upload. */
export const PREVIEW_BYTES = 2 * 1024 * 1024;

function errorOf(status: number, text: string): ApiError {
  let payload: unknown = null;
  try {
    payload = JSON.parse(text);
  } catch {
    // Not JSON: a proxy's page or an empty body.
  }
  const parsed = errorBodySchema.safeParse(payload);
  if (parsed.success) return new ApiError(status, parsed.data.error.code, parsed.data.error.message, { fields: parsed.data.error.fields });
  if (status === 0) return new ApiError(0, 'NETWORK_ERROR', 'Cannot reach the Kfield server. Check your connection and try again.');
  return new ApiError(status, `HTTP_${status}`, `The server answered ${status}.`);
}

/**
 * A multipart POST through XMLHttpRequest, which reports upload progress (fetch cannot), with
 * the session's CSRF token and the one error shape turned into an ApiError.
 */
function postForm<S extends z.ZodType>(path: string, form: FormData, schema: S, onProgress?: (fraction: number) => void): Promise<z.output<S>> {
  return csrfToken().then(
    (token) =>
      new Promise<z.output<S>>((resolve, reject) => {
        const xhr = new XMLHttpRequest();
        xhr.open('POST', path);
        xhr.setRequestHeader(CSRF_HEADER, token);
        xhr.setRequestHeader('accept', 'application/json');
        if (onProgress) {
          xhr.upload.onprogress = (e) => {
            if (e.lengthComputable) onProgress(e.loaded / e.total);
          };
        }
        xhr.onerror = () => reject(errorOf(0, ''));
        xhr.onload = () => {
          if (xhr.status < 200 || xhr.status >= 300) return reject(errorOf(xhr.status, xhr.responseText));
          let body: unknown;
          try {
            body = JSON.parse(xhr.responseText);
          } catch {
            return reject(new ApiError(xhr.status, 'BAD_RESPONSE', 'The server sent an answer Kfield could not read.'));
          }
          const parsed = schema.safeParse(body);
          if (!parsed.success) return reject(new ApiError(xhr.status, 'BAD_RESPONSE', 'The server sent an answer Kfield did not expect.'));
          resolve(parsed.data);
        };
        xhr.send(form);
      }),
  );
}

export interface LoggerFiles {
  file: File;
  barometric?: File | null;
}

/** POST /api/records/preview with the start of the logger file (and the barometric file). */
export function previewLoggerFiles(files: LoggerFiles, settings: PreviewSettings): Promise<Preview> {
  const form = new FormData();
  const sampled: string[] = [];
  const sample = (f: File, name: 'file' | 'barometric') => {
    if (f.size > PREVIEW_BYTES) {
      sampled.push(name);
      form.append(name, f.slice(0, PREVIEW_BYTES, f.type), f.name);
    } else {
      form.append(name, f, f.name);
    }
  };
  sample(files.file, 'file');
  if (files.barometric) sample(files.barometric, 'barometric');
  form.append('settings', JSON.stringify(settings));
  if (sampled.length) form.append('sampled', sampled.join(','));
  return postForm('/api/records/preview', form, previewSchema);
}

/** POST /api/wells/:wellId/records with the whole file(s) and the settings, reporting upload progress. */
export function uploadLoggerRecord(wellId: string, files: LoggerFiles, settings: LoggerSettingsInput, onProgress: (fraction: number) => void): Promise<RecordDto> {
  const form = new FormData();
  form.append('settings', JSON.stringify(settings));
  form.append('file', files.file, files.file.name);
  if (files.barometric) form.append('barometric', files.barometric, files.barometric.name);
  return postForm(`/api/wells/${seg(wellId)}/records`, form, recordSchema, onProgress);
}
