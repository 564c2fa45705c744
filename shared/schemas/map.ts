import { z } from 'zod';

/**
 * Properties of one well on the K map (kept small: a site may have thousands of wells; the popup
 * reads the well itself for its construction). K in m/s; null Well K while no fit is Checked.
 */
export const mapWellPropertiesSchema = z.object({
  id: z.string(),
  name: z.string(),
  status: z.string(),
  hydroUnit: z.string().nullable(),
  wellK: z.number().nullable(),
  log10K: z.number().nullable(),
  count: z.number().int(),
  log10StdDev: z.number().nullable(),
  screenTopDepthM: z.number(),
  screenBottomDepthM: z.number(),
  screenTopElevationM: z.number(),
  screenBottomElevationM: z.number(),
  groundElevationM: z.number(),
});
export type MapWellProperties = z.infer<typeof mapWellPropertiesSchema>;

export const mapWellsSchema = z.object({
  type: z.literal('FeatureCollection'),
  /** [west, south, east, north] in degrees, null for a site without wells. */
  bbox: z.tuple([z.number(), z.number(), z.number(), z.number()]).nullable(),
  features: z.array(
    z.object({
      type: z.literal('Feature'),
      id: z.string(),
      geometry: z.object({ type: z.literal('Point'), coordinates: z.tuple([z.number(), z.number()]) }),
      properties: mapWellPropertiesSchema,
    }),
  ),
});
export type MapWells = z.infer<typeof mapWellsSchema>;
