import { z } from 'zod';
import { isoDateTime } from './common';

/** [west, south, east, north] in degrees. */
export const boundsSchema = z.tuple([z.number(), z.number(), z.number(), z.number()]);
export type Bounds = z.infer<typeof boundsSchema>;

export const vectorLayerSchema = z.object({
  id: z.string(),
  minzoom: z.number().optional(),
  maxzoom: z.number().optional(),
  fields: z.record(z.string(), z.string()).optional(),
  description: z.string().optional(),
});
export type VectorLayer = z.infer<typeof vectorLayerSchema>;

/** What Kfield reads from an MBTiles file's metadata table (and its tiles, where the metadata is silent). */
export const basemapMetadataSchema = z.object({
  title: z.string(),
  description: z.string(),
  attribution: z.string(),
  format: z.literal('pbf'),
  minzoom: z.number().int(),
  maxzoom: z.number().int(),
  bounds: boundsSchema,
  /** [longitude, latitude, zoom] */
  center: z.tuple([z.number(), z.number(), z.number()]),
  vectorLayers: z.array(vectorLayerSchema),
  /** Whether the stored tiles are gzipped; other tiles are gzipped as they are served. */
  gzipped: z.boolean(),
  /** Bounds of the large-scale part of a tileset built with Kfield's schema, if the file says so. */
  localBounds: boundsSchema.nullable(),
});
export type BasemapMetadata = z.infer<typeof basemapMetadataSchema>;

export const basemapSchema = z.object({
  id: z.string(),
  name: z.string(),
  /** The basemap built from tiles/ (id "default"); it cannot be deleted. */
  builtIn: z.boolean(),
  /** Used by every site that has not chosen a basemap of its own. */
  isDefault: z.boolean(),
  /** Whether Kfield's own style applies (the tileset uses Kfield's layer names) or a plain generated one. */
  styleKind: z.enum(['kfield', 'generic']),
  styleUrl: z.string(),
  sizeBytes: z.number(),
  metadata: basemapMetadataSchema,
  createdAt: isoDateTime.nullable(),
  /** How many sites use this basemap: by their own choice, or as the instance default. */
  siteCount: z.number().int(),
});
export type Basemap = z.infer<typeof basemapSchema>;
export const basemapListSchema = z.object({ basemaps: z.array(basemapSchema) });

const basemapNameSchema = z.string().trim().max(120, 'Name must be at most 120 characters');

/** The text fields of the multipart upload (the file itself is the `file` part). */
export const basemapUploadSchema = z.object({
  name: basemapNameSchema.optional(),
});

export const basemapPatchSchema = z
  .object({
    name: basemapNameSchema.min(1, 'Name is required').optional(),
    isDefault: z.boolean().optional(),
  })
  .refine((p) => p.name !== undefined || p.isDefault !== undefined, 'Nothing to change: send name or isDefault');
export type BasemapPatch = z.infer<typeof basemapPatchSchema>;

export const basemapIdSchema = z
  .string()
  .trim()
  .min(1, 'Basemap id is required')
  .max(64, 'Basemap id must be at most 64 characters')
  .regex(/^[A-Za-z0-9-]+$/, 'Basemap id is letters, digits and dashes');

/** What a Lead sees when choosing a site's basemap. */
export const basemapChoiceSchema = basemapSchema.pick({ id: true, name: true, builtIn: true, isDefault: true, styleUrl: true });
export type BasemapChoice = z.infer<typeof basemapChoiceSchema>;
export const basemapChoiceListSchema = z.object({ basemaps: z.array(basemapChoiceSchema) });
