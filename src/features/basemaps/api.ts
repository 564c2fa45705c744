import { queryOptions } from '@tanstack/react-query';
import { ApiError, api, seg } from '@/lib/api-client';
import { csrfResponseSchema } from '@shared/schemas/auth';
import { errorBodySchema } from '@shared/schemas/common';
import { basemapChoiceListSchema, basemapListSchema, basemapSchema, type Basemap, type BasemapPatch } from '@shared/schemas/basemaps';

export const basemapKeys = {
  all: ['basemaps'] as const,
  adminList: () => [...basemapKeys.all, 'admin'] as const,
  choices: () => [...basemapKeys.all, 'choices'] as const,
};

/** Every basemap with its metadata (Admin). */
export function adminBasemapsQueryOptions() {
  return queryOptions({
    queryKey: basemapKeys.adminList(),
    queryFn: async () => (await api.get('/api/admin/basemaps', basemapListSchema)).basemaps,
  });
}

/** The basemaps a site can choose (any signed-in person). */
export function basemapChoicesQueryOptions() {
  return queryOptions({
    queryKey: basemapKeys.choices(),
    queryFn: async () => (await api.get('/api/basemaps', basemapChoiceListSchema)).basemaps,
  });
}

export function updateBasemap(basemapId: string, patch: BasemapPatch) {
  return api.patch(`/api/admin/basemaps/${seg(basemapId)}`, patch, basemapSchema);
}

export function deleteBasemap(basemapId: string) {
  return api.delete(`/api/admin/basemaps/${seg(basemapId)}`);
}

/**
 * Upload an MBTiles file with progress. fetch cannot report upload progress, so this one call
 * uses XMLHttpRequest, with the same CSRF header and the same error shape as the fetch client.
 */
export async function uploadBasemap(file: File, name: string, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<Basemap> {
  const { csrfToken } = await api.get('/api/auth/csrf', csrfResponseSchema);
  const form = new FormData();
  if (name.trim()) form.append('name', name.trim());
  form.append('file', file);
  return new Promise<Basemap>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/admin/basemaps');
    xhr.setRequestHeader('x-csrf-token', csrfToken);
    xhr.setRequestHeader('accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'NETWORK_ERROR', 'Cannot reach the Kfield server. Check your connection and try again.'));
    xhr.onabort = () => reject(new ApiError(0, 'ABORTED', 'The upload was cancelled.'));
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = basemapSchema.safeParse(body);
        if (parsed.success) resolve(parsed.data);
        else reject(new ApiError(xhr.status, 'BAD_RESPONSE', 'The server sent an answer Kfield did not expect.'));
        return;
      }
      const err = errorBodySchema.safeParse(body);
      reject(
        err.success
          ? new ApiError(xhr.status, err.data.error.code, err.data.error.message, { fields: err.data.error.fields })
          : new ApiError(xhr.status, `HTTP_${xhr.status}`, `The server answered ${xhr.status}.`),
      );
    };
    signal?.addEventListener('abort', () => xhr.abort());
    xhr.send(form);
  });
}
