import { z } from 'zod';
import { basemapIdSchema } from './basemaps';
import { emailSchema, isoDateTime, siteRoleSchema } from './common';

export const DISPLAY_UNITS = ['SI', 'US'] as const;
export const displayUnitsSchema = z.enum(DISPLAY_UNITS, { error: 'Choose SI or US customary units' });
export type DisplayUnits = z.infer<typeof displayUnitsSchema>;
export const DISPLAY_UNITS_LABELS: Record<DisplayUnits, string> = {
  SI: 'SI (m, m/s)',
  US: 'US customary (ft, ft/d)',
};

export const epsgCodeSchema = z.coerce
  .number({ error: 'EPSG code must be a number' })
  .int('EPSG code must be a whole number')
  .min(1024, 'EPSG code must be between 1024 and 999999')
  .max(999999, 'EPSG code must be between 1024 and 999999');

export const hydroUnitNameSchema = z
  .string()
  .trim()
  .min(1, 'Unit name is required')
  .max(80, 'Unit name must be at most 80 characters');

const siteNameSchema = z
  .string({ error: 'Name is required' })
  .trim()
  .min(1, 'Name is required')
  .max(120, 'Name must be at most 120 characters');
const descriptionSchema = z.string().trim().max(2000, 'Description must be at most 2000 characters');
const hydroUnitsSchema = z
  .array(hydroUnitNameSchema)
  .max(50, 'At most 50 hydrostratigraphic units')
  .refine((a) => new Set(a.map((s) => s.toLowerCase())).size === a.length, 'Unit names must be unique');

export const siteBodySchema = z.object({
  name: siteNameSchema,
  description: descriptionSchema.default(''),
  epsgCode: epsgCodeSchema,
  displayUnits: displayUnitsSchema,
  hydroUnits: hydroUnitsSchema.default([]),
});
export type SiteBody = z.input<typeof siteBodySchema>;
export const sitePatchSchema = z.object({
  name: siteNameSchema.optional(),
  description: descriptionSchema.optional(),
  epsgCode: epsgCodeSchema.optional(),
  displayUnits: displayUnitsSchema.optional(),
  hydroUnits: hydroUnitsSchema.optional(),
  /** A basemap id ("default" for the built-in one), or null for the instance default. */
  basemapId: basemapIdSchema.nullable().optional(),
});
export type SitePatch = z.input<typeof sitePatchSchema>;

export const crsSchema = z.object({
  code: z.number(),
  name: z.string(),
  unit: z.string().nullable(),
  area: z.string().nullable(),
  /** [west, south, east, north] in degrees */
  bbox: z.tuple([z.number(), z.number(), z.number(), z.number()]).nullable(),
  /** The definition proj4 uses, so a map can project without shipping the EPSG registry. */
  proj4: z.string(),
});
export type Crs = z.infer<typeof crsSchema>;

export const siteSchema = z.object({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  epsgCode: z.number(),
  crsName: z.string(),
  displayUnits: displayUnitsSchema,
  hydroUnits: z.array(z.string()),
  /** The caller's role on this site; null for an Admin who is not a member. */
  myRole: siteRoleSchema.nullable(),
  memberCount: z.number(),
  /** The basemap the site chose; null means the instance default. */
  basemapId: z.string().nullable(),
  /** The style of the basemap the site's maps use (its choice, or the instance default). */
  basemapStyleUrl: z.string(),
  createdAt: isoDateTime,
});
export type Site = z.infer<typeof siteSchema>;
export const siteListSchema = z.object({ sites: z.array(siteSchema) });

export const memberSchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string().nullable().describe('Left out (null) for a Viewer'),
  role: siteRoleSchema,
  disabled: z.boolean(),
  since: isoDateTime,
});
export type Member = z.infer<typeof memberSchema>;

export const invitationSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: siteRoleSchema,
  invitedBy: z.string(),
  createdAt: isoDateTime,
  expiresAt: isoDateTime,
});
export type Invitation = z.infer<typeof invitationSchema>;

export const membersResponseSchema = z.object({
  members: z.array(memberSchema),
  invitations: z.array(invitationSchema),
});

export const inviteBodySchema = z.object({ email: emailSchema, role: siteRoleSchema });
export type InviteBody = z.infer<typeof inviteBodySchema>;
export const memberPatchSchema = z.object({ role: siteRoleSchema });
