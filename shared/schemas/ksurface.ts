import { z } from 'zod';
import { isoDateTime } from './common';

/*
 * The API contract of plume outlines, the K surface (IDW of log10 Well K) and capture sketches.
 * Geometry on the wire is GeoJSON in WGS84 (lon, lat); x/y in the site's coordinate system where
 * named so. Numbers are SI (m, s, m/s, m²/s, m³/s); the client converts at the edges.
 */

const position = z.tuple([z.number(), z.number()]).rest(z.number());
const ring = z.array(position);
export const polygonGeometrySchema = z.object({ type: z.literal('Polygon'), coordinates: z.array(ring) });
export const multiPolygonGeometrySchema = z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(ring)) });
export const outlineGeometrySchema = z.discriminatedUnion('type', [polygonGeometrySchema, multiPolygonGeometrySchema], {
  error: 'The outline must be a GeoJSON Polygon or MultiPolygon',
});
export type OutlineGeometry = z.infer<typeof outlineGeometrySchema>;

/** Upload or drawn outline. `geometry` may also be a Feature or a FeatureCollection of one polygon feature. */
export const outlineBodySchema = z.object({
  name: z.string({ error: 'Name is required' }).trim().min(1, 'Name is required').max(120, 'Name must be at most 120 characters'),
  /** 'wgs84': lon/lat degrees; 'site': coordinates in the site's own system (its EPSG code). */
  crs: z.enum(['wgs84', 'site'], { error: 'Say whether the coordinates are WGS84 (lon/lat) or in the site’s system' }).default('wgs84'),
  geometry: z.unknown(),
});
export type OutlineBody = z.input<typeof outlineBodySchema>;
export const outlinePatchSchema = z.object({
  name: outlineBodySchema.shape.name.optional(),
  crs: outlineBodySchema.shape.crs.optional(),
  geometry: z.unknown().optional(),
});

export const outlineSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  name: z.string(),
  /** WGS84. */
  geometry: outlineGeometrySchema,
  /** Geodesic area, m². */
  areaM2: z.number(),
  /** The name of the person who made it. */
  createdBy: z.string(),
  createdById: z.string(),
  createdAt: isoDateTime,
  updatedAt: isoDateTime,
});
export type Outline = z.infer<typeof outlineSchema>;
export const outlineListSchema = z.object({ outlines: z.array(outlineSchema) });

/** The wells that feed a surface follow the K map's filters. */
const csvList = z
  .union([z.string(), z.array(z.string())])
  .optional()
  .transform((v) => (v === undefined ? undefined : (Array.isArray(v) ? v : v.split(',')).map((s) => s.trim()).filter(Boolean)));
const optionalNumber = (label: string) =>
  z.coerce.number({ error: `${label} must be a number` }).refine(Number.isFinite, `${label} must be a number`).optional();

export const kSurfaceQuerySchema = z.object({
  outlineId: z.string().uuid('Outline id must be a UUID').optional(),
  power: z.coerce.number({ error: 'Power must be a number' }).min(0.5, 'Power must be at least 0.5').max(6, 'Power must be at most 6').default(2),
  /** Nearest-k neighbours; unset: every well. */
  neighbours: z.coerce.number({ error: 'Neighbours must be a whole number' }).int('Neighbours must be a whole number').min(1, 'Neighbours must be at least 1').max(1000, 'Neighbours must be at most 1000').optional(),
  searchRadiusM: z.coerce.number({ error: 'Search radius must be a number' }).positive('Search radius must be greater than 0').optional(),
  /** Unset: about 200 cells across the outline (or the wells' extent). */
  cellSizeM: z.coerce.number({ error: 'Cell size must be a number' }).positive('Cell size must be greater than 0').optional(),
  /** Hydrostratigraphic units to include (comma-separated); unset: all. */
  units: csvList,
  screenElevationMinM: optionalNumber('Lowest screen elevation'),
  screenElevationMaxM: optionalNumber('Highest screen elevation'),
});
export type KSurfaceQuery = z.input<typeof kSurfaceQuerySchema>;

export const kSurfaceSchema = z.object({
  /** The projected system the grid is laid out in (the site's when projected, else a local one). */
  gridCrs: z.object({ proj4: z.string(), label: z.string() }),
  minX: z.number(),
  minY: z.number(),
  cellSizeM: z.number(),
  cols: z.number().int(),
  rows: z.number().int(),
  /** Row-major from the north-west cell, log10 K (m/s); null outside the outline or beyond the search radius. Base64 of little-endian Float32, NaN for empty. */
  log10K: z.string(),
  /** The grid's corners in WGS84 [lon, lat]: top-left, top-right, bottom-right, bottom-left (a maplibre image source). */
  corners: z.tuple([position, position, position, position]),
  wellsUsed: z.number().int(),
  warnings: z.array(z.string()),
  /** Geometric mean of K over the cells inside the outline, m/s. */
  geometricMeanK: z.number().nullable(),
  settings: z.object({ power: z.number(), neighbours: z.number().nullable(), searchRadiusM: z.number().nullable(), outlineId: z.string().nullable() }),
  /** The product's cautions (shared/cautions.ts), to show beside the surface. */
  cautions: z.array(z.string()),
});
export type KSurface = z.infer<typeof kSurfaceSchema>;

export const crossValidationSchema = z.object({
  power: z.number(),
  n: z.number().int(),
  rmseLog10: z.number(),
  meanErrorLog10: z.number(),
  byPower: z.array(z.object({ power: z.number(), rmseLog10: z.number(), meanErrorLog10: z.number() })),
  suggestedPower: z.number(),
  wells: z.array(z.object({ wellId: z.string(), name: z.string(), observedLog10K: z.number(), predictedLog10K: z.number(), errorLog10: z.number() })),
  /** Places inside the outline where a new test would tell the most, best first; x/y in the site's system. */
  nextTestSpots: z.array(z.object({ x: z.number(), y: z.number(), lon: z.number(), lat: z.number(), score: z.number(), nearestWellM: z.number() })),
  cautions: z.array(z.string()),
});
export type CrossValidation = z.infer<typeof crossValidationSchema>;

export const kAtQuerySchema = kSurfaceQuerySchema.extend({
  x: z.coerce.number({ error: 'x must be a number' }),
  y: z.coerce.number({ error: 'y must be a number' }),
});
export const kAtSchema = z.object({
  x: z.number(),
  y: z.number(),
  lon: z.number(),
  lat: z.number(),
  log10K: z.number().nullable(),
  kMetersPerSecond: z.number().nullable(),
  wellsUsed: z.number().int(),
  nearest: z.array(z.object({ wellId: z.string(), name: z.string(), distanceM: z.number(), kMetersPerSecond: z.number().nullable(), saturatedThicknessM: z.number().nullable() })),
  /** Mean saturated thickness of the nearest wells that give one, m (the default b). */
  suggestedThicknessM: z.number().nullable(),
});
export type KAt = z.infer<typeof kAtSchema>;

export const RATE_UNITS = ['L/s', 'm3/d', 'gpm'] as const;
export const rateUnitSchema = z.enum(RATE_UNITS, { error: 'Choose L/s, m³/d or US gpm' });

export const gradientInputSchema = z.discriminatedUnion('mode', [
  z.object({
    mode: z.literal('typed'),
    magnitude: z.number({ error: 'Gradient must be a number' }).positive('Gradient must be greater than 0').max(1, 'Gradient must be at most 1'),
    /** Direction the groundwater flows toward, degrees clockwise from grid north. */
    flowDirectionDeg: z.number({ error: 'Flow direction must be a number of degrees' }).min(0, 'Flow direction must be 0–360°').max(360, 'Flow direction must be 0–360°'),
  }),
  z.object({
    mode: z.literal('wells'),
    /** Three or more wells with a static water level: a least-squares plane of heads. */
    wellIds: z.array(z.string().uuid('Well id must be a UUID')).min(3, 'Choose at least three wells with a static water level'),
  }),
]);

export const captureSketchBodySchema = z.object({
  name: z.string({ error: 'Name is required' }).trim().min(1, 'Name is required').max(120, 'Name must be at most 120 characters'),
  /** The trial well in the site's coordinate system. */
  x: z.number({ error: 'x must be a number' }),
  y: z.number({ error: 'y must be a number' }),
  rate: z.object({ value: z.number({ error: 'Pumping rate must be a number' }).positive('Pumping rate must be greater than 0'), unit: rateUnitSchema }),
  thicknessM: z.number({ error: 'Saturated thickness must be a number' }).positive('Saturated thickness must be greater than 0'),
  /** Unset: the K surface's value at the spot (same settings). */
  kMetersPerSecond: z.number().positive('K must be greater than 0').optional(),
  gradient: gradientInputSchema,
  storativity: z.number().positive('Storativity must be greater than 0').max(1, 'Storativity must be at most 1').default(1e-4),
  drawdownRadiusM: z.number().positive('Radius must be greater than 0').default(10),
  drawdownTimeS: z.number().positive('Time must be greater than 0').default(86_400),
  surface: kSurfaceQuerySchema.partial().optional(),
  notes: z.string().max(4000).default(''),
});
export type CaptureSketchBody = z.input<typeof captureSketchBodySchema>;

export const captureSketchSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  name: z.string(),
  x: z.number(),
  y: z.number(),
  lon: z.number(),
  lat: z.number(),
  inputs: captureSketchBodySchema.omit({ name: true, x: true, y: true }),
  results: z.object({
    kMetersPerSecond: z.number(),
    transmissivityM2PerS: z.number(),
    rateM3PerS: z.number(),
    gradient: z.number(),
    flowDirectionDeg: z.number(),
    darcyVelocityMPerS: z.number(),
    stagnationPointM: z.number(),
    captureWidthAtWellM: z.number(),
    captureWidthFarM: z.number(),
    stagnationPoint: z.object({ lon: z.number(), lat: z.number() }),
    /** The dividing streamline as a WGS84 polygon (the capture envelope, closed far upgradient). */
    envelope: polygonGeometrySchema,
    cooperJacob: z.object({ drawdownM: z.number(), u: z.number(), valid: z.boolean(), note: z.string() }),
  }),
  /** The name of the person who made it. */
  createdBy: z.string(),
  createdById: z.string(),
  createdAt: isoDateTime,
  cautions: z.array(z.string()),
});
export type CaptureSketch = z.infer<typeof captureSketchSchema>;
export const captureSketchListSchema = z.object({ sketches: z.array(captureSketchSchema) });
