import type { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { csrfResponseSchema } from '@shared/schemas/auth';

/** Every failed call to the Kfield API ends up as one of these. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string> | undefined;
  /** From a Retry-After header (429), in seconds. */
  readonly retryAfterSeconds: number | undefined;

  constructor(
    status: number,
    code: string,
    message: string,
    options: { fields?: Record<string, string>; retryAfterSeconds?: number } = {},
  ) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.fields = options.fields;
    this.retryAfterSeconds = options.retryAfterSeconds;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

const UNSAFE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
export const CSRF_HEADER = 'x-csrf-token';

let csrfToken: string | null = null;
let csrfRequest: Promise<string> | null = null;

/** Sign-in, sign-out and accepting an invitation regenerate the session and hand back a new token. */
export function setCsrfToken(token: string | null): void {
  csrfToken = token;
}

async function fetchCsrfToken(): Promise<string> {
  // One request even when several mutations start at once.
  csrfRequest ??= send('GET', '/api/auth/csrf', undefined, false)
    .then(async (response) => {
      const { csrfToken: token } = csrfResponseSchema.parse(await response.json());
      csrfToken = token;
      return token;
    })
    .finally(() => {
      csrfRequest = null;
    });
  return csrfRequest;
}

async function send(method: string, path: string, body: unknown, withCsrf: boolean): Promise<Response> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  if (withCsrf) headers[CSRF_HEADER] = csrfToken ?? (await fetchCsrfToken());
  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      credentials: 'same-origin',
    });
  } catch {
    throw new ApiError(0, 'NETWORK_ERROR', 'Cannot reach the Kfield server. Check your connection and try again.');
  }
  if (!response.ok) throw await toApiError(response);
  return response;
}

async function toApiError(response: Response): Promise<ApiError> {
  const retryAfterSeconds = parseRetryAfter(response.headers.get('retry-after'));
  let payload: unknown = null;
  try {
    payload = await response.json();
  } catch {
    // Not JSON (a proxy page, an empty body): fall through to the generic message.
  }
  const parsed = errorBodySchema.safeParse(payload);
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error;
    return new ApiError(response.status, code, message, { fields, retryAfterSeconds });
  }
  const statusText = response.statusText ? ` ${response.statusText}` : '';
  return new ApiError(response.status, `HTTP_${response.status}`, `The server answered ${response.status}${statusText}.`, {
    retryAfterSeconds,
  });
}

/** Retry-After is either delay-seconds or an HTTP date. */
function parseRetryAfter(value: string | null): number | undefined {
  if (!value) return undefined;
  const seconds = Number(value);
  if (Number.isFinite(seconds)) return seconds > 0 ? Math.ceil(seconds) : undefined;
  const at = Date.parse(value);
  if (Number.isNaN(at)) return undefined;
  const delta = Math.ceil((at - Date.now()) / 1000);
  return delta > 0 ? delta : undefined;
}

async function request(method: string, path: string, body?: unknown): Promise<Response> {
  const unsafe = UNSAFE_METHODS.has(method);
  try {
    return await send(method, path, body, unsafe);
  } catch (error) {
    // The session may have been regenerated elsewhere (another tab signed in or out): refresh once.
    if (unsafe && error instanceof ApiError && error.status === 403 && error.code === 'CSRF_INVALID') {
      csrfToken = null;
      await fetchCsrfToken();
      return send(method, path, body, true);
    }
    throw error;
  }
}

async function readJson<S extends z.ZodType>(response: Response, schema: S): Promise<z.output<S>> {
  let payload: unknown;
  try {
    payload = await response.json();
  } catch {
    throw new ApiError(response.status, 'BAD_RESPONSE', 'The server sent an answer Kfield could not read.');
  }
  const parsed = schema.safeParse(payload);
  if (!parsed.success) {
    throw new ApiError(response.status, 'BAD_RESPONSE', 'The server sent an answer Kfield did not expect.');
  }
  return parsed.data;
}

/**
 * The one fetch client. Answers are parsed with the shared zod schema for that route, so a
 * component only ever sees data of the declared shape.
 */
export const api = {
  async get<S extends z.ZodType>(path: string, schema: S): Promise<z.output<S>> {
    return readJson(await request('GET', path), schema);
  },
  async post<S extends z.ZodType>(path: string, body: unknown, schema: S): Promise<z.output<S>> {
    return readJson(await request('POST', path, body ?? {}), schema);
  },
  async patch<S extends z.ZodType>(path: string, body: unknown, schema: S): Promise<z.output<S>> {
    return readJson(await request('PATCH', path, body), schema);
  },
  /** For answers without a body worth reading (202, 204). */
  async postNoContent(path: string, body?: unknown): Promise<void> {
    await request('POST', path, body ?? {});
  },
  async delete(path: string): Promise<void> {
    await request('DELETE', path);
  },
};

/** Path segments from users or the URL go through this. */
export function seg(value: string): string {
  return encodeURIComponent(value);
}
