import { queryOptions } from '@tanstack/react-query';
import { api, seg } from '@/lib/api-client';
import type { Me } from '@shared/schemas/auth';
import { outlineListSchema } from '@shared/schemas/ksurface';
import type { Site } from '@shared/schemas/sites';
import {
  viewerLinkCreatedSchema,
  viewerLinkEmailedSchema,
  viewerLinkListSchema,
  type ViewerLinkBody,
  type ViewerLinkEmailBody,
} from '@shared/schemas/viewer-links';

export const viewerLinkKeys = {
  all: ['viewer-links'] as const,
  list: (siteId: string) => [...viewerLinkKeys.all, siteId] as const,
  outlines: (siteId: string) => [...viewerLinkKeys.all, 'outlines', siteId] as const,
};

/** The site's links, newest first. The list never carries a link's URL: the server cannot show it again. */
export function viewerLinksQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: viewerLinkKeys.list(siteId),
    queryFn: async () => (await api.get(`/api/sites/${seg(siteId)}/viewer-links`, viewerLinkListSchema)).links,
  });
}

/**
 * The outlines a frozen K surface may be clipped to: the K map's outlines route, asked here rather
 * than through the K map's api module, which brings the map's drawing code into the main bundle.
 */
export function linkOutlinesQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: viewerLinkKeys.outlines(siteId),
    queryFn: async () => (await api.get(`/api/sites/${seg(siteId)}/outlines`, outlineListSchema)).outlines.map(({ id, name }) => ({ id, name })),
  });
}

/** Viewer links are managed by the site's Leads (and instance admins), as the server's policy says. */
export function canManageViewerLinks(site: Pick<Site, 'myRole'>, me: Me | null | undefined): boolean {
  return site.myRole === 'Lead' || Boolean(me?.isAdmin);
}

/** The answer's `url` is shown this once: keep it in component state, never in a cache. */
export function createViewerLink(siteId: string, body: ViewerLinkBody) {
  return api.post(`/api/sites/${seg(siteId)}/viewer-links`, body, viewerLinkCreatedSchema);
}

export function revokeViewerLink(linkId: string) {
  return api.delete(`/api/viewer-links/${seg(linkId)}`);
}

/**
 * `url` is the one shown at creation: the server checks it against the token's hash. The answer's
 * `held` lists the addresses the mail limits kept back.
 */
export function emailViewerLink(linkId: string, body: ViewerLinkEmailBody) {
  return api.post(`/api/viewer-links/${seg(linkId)}/email`, body, viewerLinkEmailedSchema);
}
