import type { RequestHandler, Request } from 'express';
import { SITE_ROLES, type SiteRole } from '@shared/schemas/common';
import { forbidden, notFound, unauthorized } from '../lib/errors';
import type { AppContext } from '../context';
import { Site } from '../features/sites/site.entity';
import { Well } from '../features/wells/well.entity';

/** How a route finds the site it acts on. */
export type SiteLocator = (req: Request, ctx: AppContext) => Promise<string | null>;

export type PolicyRule =
  | { kind: 'public' }
  | { kind: 'signedIn' }
  | { kind: 'admin' }
  | { kind: 'site'; roles: readonly SiteRole[]; locate: SiteLocator }
  | { kind: 'deny' };

export interface Policy {
  rule: PolicyRule;
  middleware: (ctx: AppContext) => RequestHandler;
}

/** The site in req.params.siteId; its existence is settled by the membership look-up below. */
const bySiteParam: SiteLocator = async (req) => {
  const siteId = String(req.params.siteId ?? '');
  return /^[0-9a-f-]{36}$/i.test(siteId) ? siteId : null;
};

/** A well's site, from req.params.wellId; null (so 404) when the well does not exist. */
export const byWell: SiteLocator = async (req, ctx) => {
  const wellId = String(req.params.wellId ?? '');
  if (!/^[0-9a-f-]{36}$/i.test(wellId)) return null;
  const well = await ctx.ds.getRepository(Well).findOne({ where: { id: wellId }, select: { id: true, siteId: true } });
  return well?.siteId ?? null;
};

/** A record's site, from req.params.recordId; null (so 404) when the record does not exist. */
export const byRecord: SiteLocator = async (req, ctx) => {
  const recordId = String(req.params.recordId ?? '');
  if (!/^[0-9a-f-]{36}$/i.test(recordId)) return null;
  const rows: { siteId: string }[] = await ctx.ds.query('SELECT "siteId" FROM "records" WHERE "id" = ?', [recordId]);
  return rows[0]?.siteId ?? null;
};

/** A fit's site, from req.params.fitId; null (so 404) when the fit does not exist. */
export const byFit: SiteLocator = async (req, ctx) => {
  const fitId = String(req.params.fitId ?? '');
  if (!/^[0-9a-f-]{36}$/i.test(fitId)) return null;
  const rows: { siteId: string }[] = await ctx.ds.query('SELECT "siteId" FROM "fits" WHERE "id" = ?', [fitId]);
  return rows[0]?.siteId ?? null;
};

/** A viewer link's site, from req.params.linkId; null (so 404) when the link does not exist. */
export const byViewerLink: SiteLocator = async (req, ctx) => {
  const linkId = String(req.params.linkId ?? '');
  if (!/^[0-9a-f-]{36}$/i.test(linkId)) return null;
  const rows: { siteId: string }[] = await ctx.ds.query('SELECT "siteId" FROM "viewer_links" WHERE "id" = ?', [linkId]);
  return rows[0]?.siteId ?? null;
};

const anyRole = SITE_ROLES;
const PUBLIC: PolicyRule = { kind: 'public' };
const SIGNED_IN: PolicyRule = { kind: 'signedIn' };
const ADMIN: PolicyRule = { kind: 'admin' };
const site = (roles: readonly SiteRole[], locate: SiteLocator = bySiteParam): PolicyRule => ({ kind: 'site', roles, locate });

/**
 * Who may call each route. A route that is not listed here is refused to everyone (deny by
 * default), and the policy test fails for it. Admins pass every site rule; a site rule answers
 * 404 to anyone who is not a member, so a site's existence does not leak.
 */
export const policyTable: Record<string, PolicyRule> = {
  'GET /api/health': PUBLIC,
  'GET /api/openapi.json': PUBLIC,

  'GET /api/auth/csrf': PUBLIC,
  'POST /api/auth/login': PUBLIC,
  'POST /api/auth/logout': PUBLIC,
  'GET /api/auth/me': SIGNED_IN,
  'POST /api/auth/password/forgot': PUBLIC,
  'POST /api/auth/password/reset': PUBLIC,
  'GET /api/invitations/:token': PUBLIC,
  'POST /api/invitations/accept': PUBLIC,

  'GET /api/crs/:code': SIGNED_IN,
  'GET /api/sites': SIGNED_IN,
  // And SITE_CREATORS: the sites service answers 403 SITE_CREATOR_REQUIRED (canCreateSites).
  'POST /api/sites': SIGNED_IN,
  'GET /api/sites/:siteId': site(anyRole),
  'PATCH /api/sites/:siteId': site(['Lead']),

  'GET /api/sites/:siteId/members': site(anyRole),
  'POST /api/sites/:siteId/invitations': site(['Lead']),
  'DELETE /api/sites/:siteId/invitations/:invitationId': site(['Lead']),
  'PATCH /api/sites/:siteId/members/:userId': site(['Lead']),
  'DELETE /api/sites/:siteId/members/:userId': site(['Lead']),

  'GET /api/sites/:siteId/wells': site(anyRole),
  'POST /api/sites/:siteId/wells': site(['Lead', 'Analyst']),
  'GET /api/sites/:siteId/wells.csv': site(anyRole),
  'POST /api/sites/:siteId/wells/import': site(['Lead', 'Analyst']),
  'GET /api/wells/:wellId': site(anyRole, byWell),
  'PATCH /api/wells/:wellId': site(['Lead', 'Analyst'], byWell),
  'DELETE /api/wells/:wellId': site(['Lead', 'Analyst'], byWell),

  'POST /api/wells/:wellId/records': site(['Lead', 'Analyst'], byWell),
  'GET /api/wells/:wellId/records': site(anyRole, byWell),
  'POST /api/records/preview': SIGNED_IN,
  'GET /api/records/:recordId': site(anyRole, byRecord),
  'GET /api/records/:recordId/series': site(anyRole, byRecord),
  'GET /api/records/:recordId/file': site(anyRole, byRecord),
  'DELETE /api/records/:recordId': site(['Lead', 'Analyst'], byRecord),

  'GET /api/records/:recordId/reduced': site(anyRole, byRecord),
  'GET /api/records/:recordId/fits': site(anyRole, byRecord),
  'POST /api/records/:recordId/fits': site(['Lead', 'Analyst'], byRecord),
  'GET /api/fits/:fitId': site(anyRole, byFit),
  'PATCH /api/fits/:fitId': site(['Lead', 'Analyst'], byFit),
  'POST /api/fits/:fitId/submit': site(['Lead', 'Analyst'], byFit),
  'POST /api/fits/:fitId/check': site(['Lead', 'Checker'], byFit),
  'GET /api/fits/:fitId/audit': site(anyRole, byFit),
  'GET /api/fits/:fitId/revisions': site(anyRole, byFit),
  'GET /api/wells/:wellId/fits': site(anyRole, byWell),
  'GET /api/wells/:wellId/k': site(anyRole, byWell),
  'GET /api/checks': SIGNED_IN,

  'GET /api/sites/:siteId/map/wells': site(anyRole),

  'GET /api/sites/:siteId/outlines': site(anyRole),
  'POST /api/sites/:siteId/outlines': site(['Lead', 'Analyst']),
  'GET /api/sites/:siteId/outlines/:outlineId': site(anyRole),
  'GET /api/sites/:siteId/outlines/:outlineId.geojson': site(anyRole),
  'PATCH /api/sites/:siteId/outlines/:outlineId': site(['Lead', 'Analyst']),
  'DELETE /api/sites/:siteId/outlines/:outlineId': site(['Lead', 'Analyst']),
  'GET /api/sites/:siteId/k-surface': site(anyRole),
  'GET /api/sites/:siteId/k-surface/cross-validation': site(anyRole),
  'GET /api/sites/:siteId/k-at': site(anyRole),
  'GET /api/sites/:siteId/capture-sketches': site(anyRole),
  'POST /api/sites/:siteId/capture-sketches': site(['Lead', 'Analyst']),
  'GET /api/sites/:siteId/capture-sketches.geojson': site(anyRole),
  'GET /api/sites/:siteId/capture-sketches/:sketchId': site(anyRole),
  'DELETE /api/sites/:siteId/capture-sketches/:sketchId': site(['Lead', 'Analyst']),

  // Exports: every member may download what they may read (Viewer included).
  'GET /api/sites/:siteId/exports/wells.csv': site(anyRole),
  'GET /api/sites/:siteId/exports/wells.geojson': site(anyRole),
  'GET /api/sites/:siteId/exports/wells-shapefile.zip': site(anyRole),
  'GET /api/sites/:siteId/exports/wells.kml': site(anyRole),
  'GET /api/sites/:siteId/exports/k-surface.tif': site(anyRole),
  'GET /api/sites/:siteId/exports/k-surface-isobands.geojson': site(anyRole),
  'GET /api/sites/:siteId/exports/fits.csv': site(anyRole),
  'GET /api/sites/:siteId/reports/site.pdf': site(anyRole),
  'GET /api/fits/:fitId/report.pdf': site(anyRole, byFit),

  'GET /api/sites/:siteId/viewer-links': site(['Lead']),
  'POST /api/sites/:siteId/viewer-links': site(['Lead']),
  'DELETE /api/viewer-links/:linkId': site(['Lead'], byViewerLink),
  'POST /api/viewer-links/:linkId/email': site(['Lead'], byViewerLink),
  // A viewer link's token: no session; each handler resolves the token itself (one function, one
  // 404 for unknown, expired and revoked) and reads only what the link shows.
  'GET /api/view/:token': PUBLIC,
  'GET /api/view/:token/wells': PUBLIC,
  'GET /api/view/:token/k-surface': PUBLIC,
  'GET /api/view/:token/outlines': PUBLIC,
  'GET /api/view/:token/capture-sketches': PUBLIC,

  'GET /api/admin/users': ADMIN,
  'POST /api/admin/users': ADMIN,
  'PATCH /api/admin/users/:userId': ADMIN,
  'POST /api/admin/users/:userId/reset': ADMIN,
  'GET /api/admin/outbox': ADMIN,
  'POST /api/admin/outbox/:messageId/retry': ADMIN,
  'DELETE /api/admin/outbox': ADMIN,

  // Basemaps: tiles, glyphs and styles are public so that viewer-link pages can draw them.
  'GET /tiles/style.json': PUBLIC,
  'GET /tiles/glyphs/:fontstack/:range.pbf': PUBLIC,
  'GET /tiles/:z/:x/:y.pbf': PUBLIC,
  'GET /tiles/:basemapId/style.json': PUBLIC,
  'GET /tiles/:basemapId/:z/:x/:y.pbf': PUBLIC,
  'GET /api/basemaps': SIGNED_IN,
  'GET /api/admin/basemaps': ADMIN,
  'POST /api/admin/basemaps': ADMIN,
  'PATCH /api/admin/basemaps/:basemapId': ADMIN,
  'DELETE /api/admin/basemaps/:basemapId': ADMIN,
};

function middlewareFor(rule: PolicyRule): (ctx: AppContext) => RequestHandler {
  return (ctx) => async (req, _res, next) => {
    if (rule.kind === 'public') return next();
    if (rule.kind === 'deny') throw forbidden('This route has no access policy');
    const user = req.user;
    if (!user) throw unauthorized();
    if (rule.kind === 'signedIn') return next();
    if (rule.kind === 'admin') {
      if (!user.isAdmin) throw forbidden('Only an instance administrator can do this', 'ADMIN_REQUIRED');
      return next();
    }
    const siteId = await rule.locate(req, ctx);
    if (!siteId) throw notFound('The site');
    // One indexed read on every site route: a membership row implies the site exists (foreign key);
    // only an Admin who is not a member needs the site looked up.
    const rows: { role: SiteRole }[] = await ctx.ds.query('SELECT "role" FROM "memberships" WHERE "siteId" = ? AND "userId" = ?', [siteId, user.id]);
    const role = rows[0]?.role ?? null;
    if (!role && !(user.isAdmin && (await ctx.ds.getRepository(Site).exists({ where: { id: siteId } })))) throw notFound('The site');
    if (!user.isAdmin && !rule.roles.includes(role as SiteRole)) {
      throw forbidden(`This needs the ${rule.roles.join(' or ')} role on this site; you are ${role}`, 'ROLE_REQUIRED');
    }
    req.siteAccess = { siteId, role };
    next();
  };
}

export function policyFor(method: string, path: string): Policy {
  const rule = policyTable[`${method.toUpperCase()} ${path}`] ?? ({ kind: 'deny' } as const);
  return { rule, middleware: middlewareFor(rule) };
}
