import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type passport from 'passport';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { z } from 'zod';
import {
  csrfResponseSchema,
  forgotPasswordBodySchema,
  loginBodySchema,
  loginResponseSchema,
  meSchema,
  resetPasswordBodySchema,
} from '@shared/schemas/auth';
import { errorBodySchema, okSchema } from '@shared/schemas/common';
import type { AppContext } from '../../context';
import { AppError, unauthorized } from '../../lib/errors';
import type { RouteDef } from '../../lib/route';
import { issueCsrfToken } from '../../auth/csrf';
import type { SqliteSessionStore } from '../../auth/session-store';
import { canCreateSites } from '../sites/sites.service';
import { User } from '../users/user.entity';
import { createAuthService } from './auth.service';

const err = (description: string) => ({ description, schema: errorBodySchema });

/** Sign the user in on a fresh session (passport regenerates the id) and hand back a new CSRF token. */
export async function signIn(req: Request, user: Express.User): Promise<string> {
  await new Promise<void>((resolve, reject) => req.login(user, (e) => (e ? reject(e) : resolve())));
  req.session.signedInAtMs = Date.now();
  return issueCsrfToken(req);
}

/** Each failure past the per-address threshold waits this much longer, up to the cap. */
const SLOWDOWN_STEP_MS = 500;
const SLOWDOWN_MAX_MS = 3000;

const accountKey = (req: Request) => String((req.body as { email?: unknown })?.email ?? '').trim().toLowerCase();
const addressKey = (req: Request) => ipKeyGenerator(req.ip ?? '');

/**
 * Failed sign-ins are counted per account and per account-and-address, and those refuse with 429;
 * per address they only slow down, so people behind one shared address (an office, a proxy) are
 * not locked out by someone else's guessing. Counts live in express-rate-limit's memory store.
 */
function loginLimiters(ctx: AppContext): RequestHandler[] {
  const windowMs = ctx.config.LOGIN_WINDOW_SECONDS * 1000;
  const common = { windowMs, skipSuccessfulRequests: true, legacyHeaders: false };
  const tooMany = (scope: string) => (req: Request, res: Response) => {
    const reset = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime?.getTime() ?? Date.now() + windowMs;
    const seconds = Math.max(1, Math.ceil((reset - Date.now()) / 1000));
    res.setHeader('Retry-After', String(seconds));
    const minutes = Math.ceil(seconds / 60);
    res.status(429).json({
      error: {
        code: 'RATE_LIMITED',
        message: `Too many failed sign-in attempts ${scope}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
      },
    });
  };
  const slowDown = rateLimit({
    ...common,
    standardHeaders: false,
    limit: ctx.config.LOGIN_SLOWDOWN_AFTER_PER_ADDRESS,
    requestPropertyName: 'loginSlowdown',
    keyGenerator: (req) => `ip:${addressKey(req)}`,
    handler: (req, _res, next) => {
      const info = (req as Request & { loginSlowdown?: { used: number; limit: number } }).loginSlowdown;
      const over = info ? info.used - info.limit : 1;
      setTimeout(next, Math.min(SLOWDOWN_MAX_MS, over * SLOWDOWN_STEP_MS));
    },
  });
  return [
    slowDown,
    rateLimit({
      ...common,
      standardHeaders: 'draft-7',
      limit: ctx.config.LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS,
      keyGenerator: (req) => `acct-ip:${accountKey(req)}|${addressKey(req)}`,
      handler: tooMany('for this account from this address'),
    }),
    rateLimit({
      ...common,
      standardHeaders: 'draft-7',
      limit: ctx.config.LOGIN_MAX_FAILURES,
      keyGenerator: (req) => `acct:${accountKey(req)}`,
      handler: tooMany('for this account'),
    }),
  ];
}

export function authRoutes(ctx: AppContext, pp: passport.PassportStatic, store: SqliteSessionStore): RouteDef[] {
  const auth = createAuthService(ctx, store);
  const limiters = loginLimiters(ctx);

  return [
    {
      method: 'get', path: '/api/auth/csrf', tag: 'Sign-in', summary: 'The CSRF token of this session',
      responses: { 200: { description: 'Token to send as x-csrf-token', schema: csrfResponseSchema } },
      handler: (req) => ({ csrfToken: issueCsrfToken(req) }),
    },
    {
      method: 'post', path: '/api/auth/login', tag: 'Sign-in', summary: 'Sign in with e-mail and password',
      body: loginBodySchema, before: limiters,
      responses: {
        200: { description: 'Signed in', schema: loginResponseSchema },
        400: err('Missing or malformed e-mail or password'),
        401: err('Wrong e-mail or password, or a disabled account (the same answer, so neither can be told apart)'),
        429: err('Too many failed attempts for this account, from this address or from anywhere'),
      },
      handler: (req: Request, res: Response) =>
        new Promise<unknown>((resolve, reject) => {
          const next: NextFunction = (e?: unknown) => (e ? reject(e) : resolve(undefined));
          pp.authenticate('local', (e: unknown, user: Express.User | false) => {
            if (e) return reject(e);
            if (!user) return reject(new AppError('BAD_CREDENTIALS', 'The e-mail or password is not right', 401));
            signIn(req, user)
              .then(async (csrfToken) => {
                await ctx.ds.getRepository(User).update({ id: user.id }, { lastSignInAt: new Date() });
                resolve({ user: meSchema.parse({ ...user, canCreateSites: await canCreateSites(ctx, user) }), csrfToken });
              })
              .catch(reject);
          })(req, res, next);
        }),
    },
    {
      method: 'post', path: '/api/auth/logout', tag: 'Sign-in', summary: 'Sign out and end the session',
      responses: { 200: { description: 'Signed out; a fresh token for the anonymous session', schema: csrfResponseSchema } },
      handler: async (req) => {
        await new Promise<void>((resolve, reject) => req.logout((e) => (e ? reject(e) : resolve())));
        await new Promise<void>((resolve, reject) => req.session.regenerate((e) => (e ? reject(e) : resolve())));
        return { csrfToken: issueCsrfToken(req) };
      },
    },
    {
      method: 'get', path: '/api/auth/me', tag: 'Sign-in', summary: 'The signed-in user',
      responses: { 200: { description: 'Signed in', schema: z.object({ user: meSchema }) }, 401: err('Signed out') },
      handler: async (req) => {
        if (!req.user) throw unauthorized();
        return { user: meSchema.parse({ ...req.user, canCreateSites: await canCreateSites(ctx, req.user) }) };
      },
    },
    {
      method: 'post', path: '/api/auth/password/forgot', tag: 'Sign-in', summary: 'E-mail a password reset link',
      body: forgotPasswordBodySchema, status: 202,
      responses: { 202: { description: 'Sent if the address has an account', schema: okSchema }, 400: err('Malformed e-mail'), 429: err('Too many requests from this address') },
      handler: async (req) => {
        await auth.sendReset(req.body.email, { clientAddress: req.ip ?? null });
        return { ok: true };
      },
    },
    {
      method: 'post', path: '/api/auth/password/reset', tag: 'Sign-in', summary: 'Set a new password with a reset link',
      body: resetPasswordBodySchema,
      responses: { 200: { description: 'Password changed', schema: okSchema }, 400: err('Bad password or expired/used link') },
      handler: async (req) => {
        await auth.resetPassword(req.body.token, req.body.password);
        return { ok: true };
      },
    },
  ];
}
