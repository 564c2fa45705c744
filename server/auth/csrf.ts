import type { Request, RequestHandler } from 'express';
import { AppError } from '../lib/errors';
import { newToken, safeEqual } from './tokens';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export function issueCsrfToken(req: Request): string {
  req.session.csrfToken ??= newToken(24);
  return req.session.csrfToken;
}

/** Synchroniser token: every state-changing API call carries the session's token in x-csrf-token. */
export const requireCsrf: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  const sent = req.get('x-csrf-token');
  const expected = req.session?.csrfToken;
  if (!sent || !expected || !safeEqual(sent, expected)) {
    throw new AppError(
      'CSRF_INVALID',
      'The request is missing its security token or the token is out of date; reload the page and try again',
      403,
    );
  }
  next();
};
