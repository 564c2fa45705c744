import { z } from 'zod';
import { kSurfaceQuerySchema } from './ksurface';

/** The K surface exports take the K surface's own settings; the isobands also their spacing. */
export const surfaceExportQuerySchema = kSurfaceQuerySchema;
export const isobandsQuerySchema = kSurfaceQuerySchema.extend({
  /** Band width in log10 K (0.5: two bands a decade). */
  stepLog10: z.coerce
    .number({ error: 'Band width must be a number' })
    .refine(Number.isFinite, 'Band width must be a number')
    .min(0.1, 'Band width must be at least 0.1 (log10 K)')
    .max(2, 'Band width must be at most 2 (log10 K)')
    .default(0.5),
});
export type IsobandsQuery = z.input<typeof isobandsQuerySchema>;

/** The export routes under /api/sites/:siteId/exports/, for links on the client. */
export const EXPORT_FILES = {
  wellsCsv: 'wells.csv',
  wellsGeoJson: 'wells.geojson',
  wellsShapefile: 'wells-shapefile.zip',
  wellsKml: 'wells.kml',
  surfaceGeoTiff: 'k-surface.tif',
  surfaceIsobands: 'k-surface-isobands.geojson',
  fitsCsv: 'fits.csv',
} as const;
export const exportUrl = (siteId: string, file: (typeof EXPORT_FILES)[keyof typeof EXPORT_FILES], query?: Record<string, string | number | undefined | null>) => {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(query ?? {})) if (v !== undefined && v !== null && v !== '') q.set(k, String(v));
  const s = q.toString();
  return `/api/sites/${siteId}/exports/${file}${s ? `?${s}` : ''}`;
};
