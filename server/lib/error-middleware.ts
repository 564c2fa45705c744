import type { ErrorRequestHandler, Response } from 'express';
import { settleBody } from './drain-body';
import { QueryFailedError } from 'typeorm';
import { AppError, conflict } from './errors';

/** The columns of a unique constraint SQLite refused, e.g. ['users.email'], or null for any other error. */
export function uniqueViolation(e: unknown): string[] | null {
  if (!(e instanceof QueryFailedError)) return null;
  const driver = (e as QueryFailedError & { driverError?: { code?: string; message?: string } }).driverError;
  if (driver?.code !== 'SQLITE_CONSTRAINT_UNIQUE' && driver?.code !== 'SQLITE_CONSTRAINT_PRIMARYKEY') return null;
  const m = /constraint failed: (.+)$/.exec(driver.message ?? '');
  return m ? m[1].split(',').map((c) => c.trim()) : [];
}

// What a person can act on, for the constraints that a request's own input can hit.
const UNIQUE_MESSAGES: Record<string, { message: string; field: string; fieldMessage: string }> = {
  'users.email': { message: 'An account with this e-mail already exists', field: 'email', fieldMessage: 'An account with this e-mail already exists' },
  'wells.siteId,wells.name': { message: 'A well with this name already exists at this site', field: 'name', fieldMessage: 'Another well at this site has this name' },
};

/**
 * A unique constraint met under a race (two requests both checked, both wrote) is the client's
 * conflict, not a server fault.
 */
export function uniqueViolationError(columns: string[]): AppError {
  const known = UNIQUE_MESSAGES[columns.join(',')];
  if (known) return conflict('CONFLICT', known.message, { [known.field]: known.fieldMessage });
  const field = columns.at(-1)?.split('.').at(-1);
  return conflict(
    'CONFLICT',
    field ? `Another record already has this ${field}` : 'The change conflicts with an existing record',
    field ? { [field]: 'Already taken' } : undefined,
  );
}

/** The one place errors become answers: { error: { code, message, fields? } }. */
export function errorMiddleware(log: (msg: string, e: unknown) => void): ErrorRequestHandler {
  const answer = errorAnswer(log);
  return (e, req, res, _next) => {
    if (res.headersSent) return;
    // A refusal before the body was read (sign-in needed, no such site, bad JSON type) still reaches
    // the client: the rest of a small body is read first. Bodies over a limit are the upload
    // middleware's and body-parser's to end (413).
    const tooLarge = (e as { status?: number })?.status === 413 || (e as { type?: string })?.type === 'entity.too.large';
    if (tooLarge) return answer(e, res);
    void settleBody(req, res).then(() => answer(e, res));
  };
}

function errorAnswer(log: (msg: string, e: unknown) => void) {
  return (e: unknown, res: Response) => {
    if (res.headersSent) return;
    const unique = uniqueViolation(e);
    if (unique) e = uniqueViolationError(unique);
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
