import { z } from 'zod';
import { isoDateTime } from './common';
import { captureSketchSchema, kSurfaceQuerySchema, outlineGeometrySchema } from './ksurface';
import { mapWellPropertiesSchema, mapWellsSchema } from './map';
import { displayUnitsSchema } from './sites';

/*
 * Viewer links: a read-only, revocable, expiring link to a site's K map for people without an
 * account. The token (32 random bytes, base64url) is shown once, in the create answer; the server
 * keeps only its SHA-256, so it can never show the token again.
 */

export const VIEWER_LINK_DEFAULT_DAYS = 30;
export const VIEWER_LINK_MAX_DAYS = 365;
export const VIEWER_LINK_MAX_ADDRESSES = 20;

/** The K surface settings frozen into a link: the K surface query's fields, parsed once at creation. */
export const viewerSurfaceSettingsSchema = kSurfaceQuerySchema;
export type ViewerSurfaceSettings = z.output<typeof viewerSurfaceSettingsSchema>;

export const viewerLayersBodySchema = z.object({
  wells: z.boolean({ error: 'Say whether the link shows the wells' }).default(true),
  surface: z.boolean({ error: 'Say whether the link shows the K surface' }).default(false),
  /** The surface's settings, frozen; used only when `surface` is true. */
  surfaceSettings: viewerSurfaceSettingsSchema.optional(),
  outlines: z.boolean({ error: 'Say whether the link shows the outlines' }).default(false),
  sketches: z.boolean({ error: 'Say whether the link shows the capture sketches' }).default(false),
});

export const viewerLinkBodySchema = z.object({
  /** Who the link is for. */
  label: z.string({ error: 'Label is required' }).trim().min(1, 'Label is required').max(120, 'Label must be at most 120 characters'),
  expiresInDays: z.coerce
    .number({ error: 'Expiry must be a whole number of days' })
    .int('Expiry must be a whole number of days')
    .min(1, 'Expiry must be at least 1 day')
    .max(VIEWER_LINK_MAX_DAYS, `Expiry must be at most ${VIEWER_LINK_MAX_DAYS} days`)
    .default(VIEWER_LINK_DEFAULT_DAYS),
  layers: viewerLayersBodySchema.refine((l) => l.wells || l.surface || l.outlines || l.sketches, 'Choose at least one layer'),
  showNames: z.boolean({ error: 'Say whether well names appear' }).default(false),
  showConstruction: z.boolean({ error: 'Say whether well construction appears' }).default(false),
});
export type ViewerLinkBody = z.input<typeof viewerLinkBodySchema>;

export const viewerLayersSchema = z.object({
  wells: z.boolean(),
  surface: z.boolean(),
  /** The frozen K surface settings; null when the surface is off. */
  surfaceSettings: viewerSurfaceSettingsSchema.nullable(),
  outlines: z.boolean(),
  sketches: z.boolean(),
});
export type ViewerLayers = z.infer<typeof viewerLayersSchema>;

/** A link as its site's Leads see it (never the token). */
export const viewerLinkSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  label: z.string(),
  layers: viewerLayersSchema,
  showNames: z.boolean(),
  showConstruction: z.boolean(),
  /** The name of the Lead who made it. */
  createdBy: z.string(),
  createdAt: isoDateTime,
  expiresAt: isoDateTime,
  revokedAt: isoDateTime.nullable(),
  lastViewedAt: isoDateTime.nullable(),
  viewCount: z.number().int(),
});
export type ViewerLink = z.infer<typeof viewerLinkSchema>;
export const viewerLinkListSchema = z.object({ links: z.array(viewerLinkSchema) });

/** The create answer: the link and its full URL on PUBLIC_URL, shown this once. */
export const viewerLinkCreatedSchema = viewerLinkSchema.extend({ url: z.string() });
export type ViewerLinkCreated = z.infer<typeof viewerLinkCreatedSchema>;

/**
 * E-mail a link. The server keeps only the token's hash, so the Lead's client sends back the URL
 * (or the token) it was shown at creation; the server checks its hash against the link's.
 */
export const viewerLinkEmailBodySchema = z
  .object({
    to: z
      .array(z.string().trim().email('Enter a valid e-mail address'), { error: 'Give the addresses to send the link to' })
      .min(1, 'Give at least one address')
      .max(VIEWER_LINK_MAX_ADDRESSES, `At most ${VIEWER_LINK_MAX_ADDRESSES} addresses at a time`),
    url: z.string().max(2000).optional(),
    token: z.string().max(200).optional(),
  })
  .refine((b) => b.url || b.token, { message: 'Send the link’s URL as shown when it was made', path: ['url'] });
export type ViewerLinkEmailBody = z.input<typeof viewerLinkEmailBodySchema>;
export const viewerLinkEmailedSchema = z.object({
  queued: z.number().int(),
  /** Addresses not mailed now: this link went to them minutes ago, or they had enough mail from Kfield today. */
  held: z.array(z.string()),
});

/** GET /api/view/:token — what the read-only page needs to draw itself. */
export const viewInfoSchema = z.object({
  siteName: z.string(),
  epsgCode: z.number().int(),
  crsName: z.string(),
  displayUnits: displayUnitsSchema,
  basemapStyleUrl: z.string(),
  layers: z.object({ wells: z.boolean(), surface: z.boolean(), outlines: z.boolean(), sketches: z.boolean() }),
  showNames: z.boolean(),
  showConstruction: z.boolean(),
  cautions: z.array(z.string()),
  expiresAt: isoDateTime,
});
export type ViewInfo = z.infer<typeof viewInfoSchema>;

/** The wells layer of a view: the K map's GeoJSON with names and construction removed unless allowed. */
export const VIEW_CONSTRUCTION_FIELDS = ['groundElevationM', 'screenTopDepthM', 'screenBottomDepthM', 'screenTopElevationM', 'screenBottomElevationM'] as const;
const viewWellProperties = mapWellPropertiesSchema.partial({ name: true, groundElevationM: true, screenTopDepthM: true, screenBottomDepthM: true, screenTopElevationM: true, screenBottomElevationM: true });
export const viewWellsSchema = mapWellsSchema.extend({
  features: z.array(mapWellsSchema.shape.features.element.extend({ properties: viewWellProperties })),
});
export type ViewWells = z.infer<typeof viewWellsSchema>;

export const viewOutlineSchema = z.object({ id: z.string(), name: z.string(), geometry: outlineGeometrySchema, areaM2: z.number() });
export const viewOutlineListSchema = z.object({ outlines: z.array(viewOutlineSchema) });
export const viewSketchSchema = z.object({
  id: z.string(), name: z.string(), lon: z.number(), lat: z.number(), x: z.number(), y: z.number(),
  results: captureSketchSchema.shape.results, createdAt: isoDateTime, cautions: z.array(z.string()),
});
export const viewSketchListSchema = z.object({ sketches: z.array(viewSketchSchema) });
export type ViewSketch = z.infer<typeof viewSketchSchema>;
export type ViewOutline = z.infer<typeof viewOutlineSchema>;
