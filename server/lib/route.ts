import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import { settleBody } from './drain-body';
import { parseOrThrow } from './validate';
import { policyFor, type Policy } from '../auth/policy';
import type { AppContext } from '../context';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface ResponseDef {
  description: string;
  schema?: z.ZodType;
  /** Non-JSON payloads (files, tiles) name their media type. */
  contentType?: string;
}

export interface RouteDef {
  method: Method;
  /** Express path, e.g. /api/sites/:siteId */
  path: string;
  summary: string;
  tag: string;
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
  /**
   * Request bodies by media type, for the OpenAPI document only, when the handler reads the body
   * itself (a multipart upload beside a JSON form).
   */
  requestBodies?: Record<string, z.ZodType>;
  /** Status of a successful answer (default 200); 204 sends no body. */
  status?: number;
  responses: Record<number, ResponseDef>;
  /** Extra middleware run after the policy and before validation (rate limiters, uploads). */
  before?: RequestHandler[];
  handler: (req: Request, res: Response) => unknown | Promise<unknown>;
}

export interface MountedRoute extends RouteDef {
  policy: Policy;
}

export const routeKey = (method: string, path: string) => `${method.toUpperCase()} ${path}`;

/**
 * Mount routes with their policy (from the one policy table), then validation, then the handler.
 * Parsed values replace req.params/req.query/req.body so handlers only see validated input.
 */
export function mountRoutes(router: Router, ctx: AppContext, defs: RouteDef[], mounted: MountedRoute[]): void {
  for (const def of defs) {
    const policy = policyFor(def.method, def.path);
    mounted.push({ ...def, policy });
    const validate: RequestHandler = async (req, res, next) => {
      // Whatever of the body no parser or upload took is read first, so the client sees the answer.
      await settleBody(req, res);
      if (def.params) Object.assign(req.params, parseOrThrow(def.params, req.params, 'address'));
      if (def.query) {
        const q = parseOrThrow(def.query, req.query, 'query');
        Object.defineProperty(req, 'query', { value: q, writable: true, configurable: true });
      }
      if (def.body) req.body = parseOrThrow(def.body, req.body, 'request body');
      next();
    };
    const run = async (req: Request, res: Response, _next: NextFunction) => {
      const result = await def.handler(req, res);
      if (res.headersSent) return;
      const status = def.status ?? 200;
      if (status === 204 || result === undefined) res.status(status === 200 ? 204 : status).end();
      else res.status(status).json(result);
    };
    router[def.method](def.path, policy.middleware(ctx), ...(def.before ?? []), validate, run);
  }
}
