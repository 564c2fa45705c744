import { buttonClasses } from '@/components/ui/button';
import { CAUTIONS } from '@shared/cautions';
import { EXPORT_FILES, exportUrl } from '@shared/schemas/exports';

type File = (typeof EXPORT_FILES)[keyof typeof EXPORT_FILES];

interface Item {
  file: File;
  label: string;
  hint: string;
  /** Surface exports take the K surface's current settings. */
  surface?: boolean;
}

const WELLS: Item[] = [
  { file: EXPORT_FILES.wellsCsv, label: 'Wells with Well K (CSV)', hint: 'SI, for a spreadsheet' },
  { file: EXPORT_FILES.wellsGeoJson, label: 'Wells with Well K (GeoJSON)', hint: 'WGS84' },
  { file: EXPORT_FILES.wellsShapefile, label: 'Wells with Well K (shapefile, zip)', hint: 'the site’s coordinate system' },
  { file: EXPORT_FILES.wellsKml, label: 'Wells with Well K (KML)', hint: 'for a globe viewer' },
];
const SURFACE: Item[] = [
  { file: EXPORT_FILES.surfaceGeoTiff, label: 'K surface (GeoTIFF)', hint: 'float32 log10 K, the settings shown', surface: true },
  { file: EXPORT_FILES.surfaceIsobands, label: 'K surface bands (GeoJSON)', hint: 'half-decade bands of K', surface: true },
];
const FITS: Item[] = [{ file: EXPORT_FILES.fitsCsv, label: 'Checked fits (CSV)', hint: 'one row per fit' }];

/**
 * Plain download links to the site's exports (the session cookie goes along). With `surfaceQuery`
 * (the K surface's settings as a query string) the surface exports are offered too.
 */
export function ExportMenu({ siteId, surfaceQuery, size = 'md' }: { siteId: string; surfaceQuery?: string | null; size?: 'sm' | 'md' }) {
  const items = [...WELLS, ...(surfaceQuery !== undefined ? SURFACE : []), ...FITS];
  const href = (i: Item) => {
    const base = exportUrl(siteId, i.file);
    return i.surface && surfaceQuery ? `${base}?${surfaceQuery}` : base;
  };
  return (
    <details className="group relative" data-testid="export-menu">
      <summary className={buttonClasses('secondary', size, 'cursor-pointer list-none [&::-webkit-details-marker]:hidden')}>
        Export <span aria-hidden="true" className="ml-1 text-xs">▾</span>
      </summary>
      <div className="absolute right-0 z-30 mt-1 w-80 rounded-md bg-white p-2 text-sm shadow-lg ring-1 ring-slate-200">
        <ul className="space-y-0.5">
          {items.map((i) => (
            <li key={i.file}>
              {i.surface && surfaceQuery === null ? (
                <span className="block rounded px-2 py-1 text-slate-400" title="Show a K surface first">
                  {i.label}
                </span>
              ) : (
                <a href={href(i)} download className="block rounded px-2 py-1 text-slate-800 hover:bg-slate-100 focus-visible:bg-slate-100">
                  {i.label} <span className="text-xs text-slate-500">— {i.hint}</span>
                </a>
              )}
            </li>
          ))}
        </ul>
        <p className="mt-2 border-t border-slate-200 px-2 pt-2 text-xs text-slate-600">
          The cautions go with every export (in the file, or its README): {CAUTIONS[0]} {CAUTIONS[1]}
        </p>
      </div>
    </details>
  );
}
