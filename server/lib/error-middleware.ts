import type { ErrorRequestHandler } from 'express';
import { AppError } from './errors';

/** The one place errors become answers: { error: { code, message, fields? } }. */
export function errorMiddleware(log: (msg: string, e: unknown) => void): ErrorRequestHandler {
  return (e, _req, res, _next) => {
    if (res.headersSent) return;
    if (e instanceof AppError) {
      for (const [k, v] of Object.entries(e.headers ?? {})) res.setHeader(k, v);
      res.status(e.status).json({ error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}) } });
      return;
    }
    const err = e as { type?: string; status?: number; message?: string; limit?: number };
    // body-parser's own errors are the client's: malformed JSON, too large, wrong charset.
    if (err?.type === 'entity.parse.failed') {
      res.status(400).json({ error: { code: 'MALFORMED_JSON', message: 'The request body is not valid JSON' } });
      return;
    }
    if (err?.type === 'entity.too.large') {
      res.status(413).json({ error: { code: 'TOO_LARGE', message: `The request body is larger than the limit of ${err.limit} bytes` } });
      return;
    }
    if (typeof err?.status === 'number' && err.status >= 400 && err.status < 500) {
      res.status(err.status).json({ error: { code: 'BAD_REQUEST', message: err.message ?? 'Bad request' } });
      return;
    }
    log('unhandled error', e);
    res.status(500).json({ error: { code: 'INTERNAL', message: 'Something went wrong on the server; the change was not saved' } });
  };
}
