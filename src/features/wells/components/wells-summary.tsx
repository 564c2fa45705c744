import { useSuspenseQuery } from '@tanstack/react-query';
import { plural } from '@/lib/format';
import { wellsQueryOptions } from '../api';

/** A short count of the site's wells for the site overview. */
export function WellsSummary({ siteId }: { siteId: string }) {
  const { data: wells } = useSuspenseQuery(wellsQueryOptions(siteId));
  if (wells.length === 0) return <p className="text-sm text-slate-600">No monitoring wells yet.</p>;
  const active = wells.filter((w) => w.status === 'active').length;
  const units = new Set(wells.map((w) => w.hydroUnit).filter(Boolean)).size;
  return (
    <dl className="grid grid-cols-3 gap-3 text-center">
      <div>
        <dt className="text-xs text-slate-500">Wells</dt>
        <dd className="text-xl font-semibold text-slate-900">{wells.length}</dd>
      </div>
      <div>
        <dt className="text-xs text-slate-500">Active</dt>
        <dd className="text-xl font-semibold text-slate-900">{active}</dd>
      </div>
      <div>
        <dt className="text-xs text-slate-500">Units</dt>
        <dd className="text-xl font-semibold text-slate-900" title={plural(units, 'hydrostratigraphic unit', 'hydrostratigraphic units')}>
          {units}
        </dd>
      </div>
    </dl>
  );
}
