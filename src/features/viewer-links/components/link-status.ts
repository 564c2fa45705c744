import type { ViewerLayers, ViewerLink } from '@shared/schemas/viewer-links';

export type ViewerLinkStatus = 'Active' | 'Revoked' | 'Expired';

/** A revoked link says so even after its expiry date has passed: revoking is the act a Lead took. */
export function viewerLinkStatus(link: Pick<ViewerLink, 'revokedAt' | 'expiresAt'>, now: number = Date.now()): ViewerLinkStatus {
  if (link.revokedAt) return 'Revoked';
  return Date.parse(link.expiresAt) <= now ? 'Expired' : 'Active';
}

const LAYER_WORDS: Array<[keyof Omit<ViewerLayers, 'surfaceSettings'>, string]> = [
  ['wells', 'Wells'],
  ['surface', 'K surface'],
  ['outlines', 'Outlines'],
  ['sketches', 'Capture sketches'],
];

/** The layers a link shows, in the K map's order, as short words. */
export function layerWords(layers: Omit<ViewerLayers, 'surfaceSettings'>): string[] {
  return LAYER_WORDS.filter(([key]) => layers[key]).map(([, word]) => word);
}

/** What a viewer learns about each well beyond its position and Well K. */
export function wellDetailWords(link: Pick<ViewerLink, 'showNames' | 'showConstruction'>): string {
  if (link.showNames && link.showConstruction) return 'Names, construction';
  if (link.showNames) return 'Names';
  return link.showConstruction ? 'Construction' : 'None';
}

/** The moment a link made now for `days` days stops working (as the server computes it). */
export function expiryDate(days: number, now: number = Date.now()): Date {
  return new Date(now + days * 86_400_000);
}
