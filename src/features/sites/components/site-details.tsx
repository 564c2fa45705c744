import type { Site } from '@shared/schemas/sites';
import { DISPLAY_UNITS_LABELS } from '@shared/schemas/sites';
import { formatDate } from '@/lib/format';
import { myRoleLabel } from './role-label';

export function SiteDetails({ site }: { site: Site }) {
  return (
    <dl className="grid gap-x-6 gap-y-4 text-sm sm:grid-cols-[12rem_1fr]">
      <dt className="text-slate-500">Description</dt>
      <dd className="whitespace-pre-line text-slate-800">{site.description || <span className="text-slate-400">None</span>}</dd>
      <dt className="text-slate-500">Coordinate reference system</dt>
      <dd className="text-slate-800">
        EPSG:{site.epsgCode} · {site.crsName}
      </dd>
      <dt className="text-slate-500">Display units</dt>
      <dd className="text-slate-800">{DISPLAY_UNITS_LABELS[site.displayUnits]}</dd>
      <dt className="text-slate-500">Hydrostratigraphic units</dt>
      <dd className="text-slate-800">
        {site.hydroUnits.length > 0 ? (
          <ul className="flex flex-wrap gap-2">
            {site.hydroUnits.map((unit) => (
              <li key={unit} className="rounded bg-slate-100 px-2 py-0.5 text-slate-700">
                {unit}
              </li>
            ))}
          </ul>
        ) : (
          <span className="text-slate-400">None yet</span>
        )}
      </dd>
      <dt className="text-slate-500">Your role</dt>
      <dd className="text-slate-800">{myRoleLabel(site)}</dd>
      <dt className="text-slate-500">Created</dt>
      <dd className="text-slate-800">{formatDate(site.createdAt)}</dd>
    </dl>
  );
}
