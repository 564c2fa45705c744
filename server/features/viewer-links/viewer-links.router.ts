import fs from 'node:fs';
import type { RequestHandler, Router } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import { kSurfaceSchema } from '@shared/schemas/ksurface';
import {
  viewerLinkBodySchema,
  viewerLinkCreatedSchema,
  viewerLinkEmailBodySchema,
  viewerLinkEmailedSchema,
  viewerLinkListSchema,
  viewInfoSchema,
  viewOutlineListSchema,
  viewSketchListSchema,
  viewWellsSchema,
} from '@shared/schemas/viewer-links';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { createViewerLinksService } from './viewer-links.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const siteParams = z.object({ siteId: z.string().uuid('Site id must be a UUID') });
const linkParams = z.object({ linkId: z.string().uuid('Link id must be a UUID') });
// Any string: a malformed token gets the same 404 as an unknown one (no 400 that tells them apart).
const tokenParams = z.object({ token: z.string() });
const NOT_FOUND = err('Unknown, expired or revoked link, or a layer the link does not show: one answer for all');

/**
 * The view routes' own middleware: no referrer (the token is in the page's URL), nothing stored
 * by a cache, and a limit per client address answered in the one error shape.
 */
function viewGuards(perMinute: number): RequestHandler[] {
  const headers: RequestHandler = (_req, res, next) => {
    res.setHeader('Referrer-Policy', 'no-referrer');
    res.setHeader('Cache-Control', 'no-store');
    next();
  };
  const limiter = rateLimit({
    windowMs: 60_000,
    limit: perMinute,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    keyGenerator: (req) => `view:${ipKeyGenerator(req.ip ?? '')}`,
    handler: (_req, res) => {
      res.setHeader('Retry-After', '60');
      res.status(429).json({ error: { code: 'RATE_LIMITED', message: 'Too many requests for viewer pages from this address; try again in a minute.' } });
    },
  });
  return [headers, limiter];
}

/** The page shell when the client has not been built (API tests, a server-only checkout). */
const NO_CLIENT_PAGE = (found: boolean) =>
  `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Kfield</title></head><body><h1>${found ? 'Kfield viewer' : 'This viewer link does not exist or no longer works'}</h1></body></html>`;

/**
 * `GET /view/:token`, the read-only page: the client's index.html, answered 200 when the token
 * opens a view and 404 (the same page, which then shows its 404 screen) when it is unknown,
 * expired or revoked. Same guards as the view API: no referrer, no-store, the per-address limit.
 */
export function mountViewPage(router: Router, ctx: AppContext, indexHtml: string): void {
  const svc = createViewerLinksService(ctx);
  router.get('/view/:token', ...viewGuards(ctx.config.VIEW_REQUESTS_PER_MINUTE), async (req, res, next) => {
    try {
      const found = await svc.opens(String(req.params.token));
      res.status(found ? 200 : 404);
      if (!fs.existsSync(indexHtml)) return void res.type('html').send(NO_CLIENT_PAGE(found));
      res.sendFile(indexHtml, { cacheControl: false, lastModified: false, etag: false });
    } catch (e) {
      next(e);
    }
  });
}

/** The Lead's routes: make, list, revoke and e-mail a site's viewer links (signed in, after the session). */
export function viewerLinksRoutes(ctx: AppContext): RouteDef[] {
  const svc = createViewerLinksService(ctx);
  return [
    {
      method: 'get', path: '/api/sites/:siteId/viewer-links', tag: 'Viewer links', summary: 'The site’s viewer links, newest first (never their tokens)',
      params: siteParams,
      responses: { 200: { description: 'Viewer links', schema: viewerLinkListSchema } },
      handler: async (req) => ({ links: await svc.list(req.siteAccess!.siteId) }),
    },
    {
      method: 'post', path: '/api/sites/:siteId/viewer-links', tag: 'Viewer links',
      summary: 'Make a viewer link: label, expiry (default 30 days, at most 365), layers (K surface settings frozen), names and construction shown or not; the answer’s url is shown this once',
      params: siteParams, body: viewerLinkBodySchema, status: 201,
      responses: { 201: { description: 'The link and its full URL (the only time the token is shown)', schema: viewerLinkCreatedSchema }, 400: err('Bad label, expiry or layers (each named)') },
      handler: (req) => svc.create(req.siteAccess!.siteId, req.user!.id, req.body),
    },
    {
      method: 'delete', path: '/api/viewer-links/:linkId', tag: 'Viewer links', summary: 'Revoke a viewer link: its next request gets the 404 page', status: 204,
      params: linkParams,
      responses: { 204: { description: 'Revoked (or already revoked)' }, 404: err('No such link') },
      handler: (req) => svc.revoke(String(req.params.linkId)),
    },
    {
      method: 'post', path: '/api/viewer-links/:linkId/email', tag: 'Viewer links',
      summary: 'E-mail a viewer link to 1–20 addresses through the outbox. Kfield keeps only the token’s hash, so send the url (or token) shown at creation; it must be this link’s',
      params: linkParams, body: viewerLinkEmailBodySchema,
      responses: {
        200: { description: 'One message queued per address, except those held back by the mail limits (listed in held)', schema: viewerLinkEmailedSchema },
        400: err('Bad addresses, or a URL that is not this link’s (VIEWER_LINK_MISMATCH)'),
        409: err('The link was revoked or has expired (VIEWER_LINK_ENDED)'),
        429: err('Too many viewer-link e-mails from this account or address in the last hour'),
      },
      handler: (req) => svc.email(String(req.params.linkId), req.user!, req.body, { clientAddress: req.ip ?? null }),
    },
  ];
}

/**
 * The token's read-only routes (an allow-list: nothing else opens with a token). Mounted before the
 * session middleware: a viewer has no account, so no session is read or made for these requests.
 */
export function viewRoutes(ctx: AppContext): RouteDef[] {
  const svc = createViewerLinksService(ctx);
  const before = viewGuards(ctx.config.VIEW_REQUESTS_PER_MINUTE);
  const token = (req: { params: Record<string, unknown> }) => String(req.params.token);
  return [
    {
      method: 'get', path: '/api/view/:token', tag: 'Viewer links', summary: 'What a viewer link shows: site name, system, units, basemap, layers, cautions, expiry (no sign-in; counts a view)',
      params: tokenParams, before,
      responses: { 200: { description: 'The view', schema: viewInfoSchema }, 404: NOT_FOUND, 429: err('Too many view requests from this address') },
      handler: (req) => svc.info(token(req)),
    },
    {
      method: 'get', path: '/api/view/:token/wells', tag: 'Viewer links', summary: 'The link’s wells by Well K (GeoJSON, WGS84); names and construction only when the link shows them',
      params: tokenParams, before,
      responses: { 200: { description: 'GeoJSON FeatureCollection', schema: viewWellsSchema, contentType: 'application/geo+json' }, 404: NOT_FOUND },
      handler: async (req, res) => {
        const body = await svc.wells(token(req));
        res.type('application/geo+json').send(body);
      },
    },
    {
      method: 'get', path: '/api/view/:token/k-surface', tag: 'Viewer links', summary: 'The K surface with the settings frozen in the link (query ignored)',
      params: tokenParams, before,
      responses: { 200: { description: 'The surface', schema: kSurfaceSchema }, 400: err('Fewer than 2 wells with a checked K'), 404: NOT_FOUND },
      handler: (req) => svc.surface(token(req)),
    },
    {
      method: 'get', path: '/api/view/:token/outlines', tag: 'Viewer links', summary: 'The site’s outlines (WGS84), without their authors',
      params: tokenParams, before,
      responses: { 200: { description: 'Outlines', schema: viewOutlineListSchema }, 404: NOT_FOUND },
      handler: (req) => svc.outlines(token(req)),
    },
    {
      method: 'get', path: '/api/view/:token/capture-sketches', tag: 'Viewer links', summary: 'The site’s capture sketches: place and numbers, without inputs or authors',
      params: tokenParams, before,
      responses: { 200: { description: 'Sketches', schema: viewSketchListSchema }, 404: NOT_FOUND },
      handler: (req) => svc.sketches(token(req)),
    },
  ];
}
