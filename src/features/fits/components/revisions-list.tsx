import { useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { KUnit } from '@shared/units/conductivity';
import { formatDateTime } from '@/lib/format';
import { revisionsQueryOptions } from '../api';
import { formatK } from '../format';
import { FitStatusBadge } from './fit-status-badge';

/** Every revision of the fit's chain, oldest first; older ones stay readable. */
export function RevisionsList({ siteId, fitId, kUnit }: { siteId: string; fitId: string; kUnit: KUnit }) {
  const { data: fits } = useSuspenseQuery(revisionsQueryOptions(fitId));
  return (
    <ol className="space-y-2" aria-label="Revisions">
      {fits.map((f) => {
        const current = f.id === fitId;
        return (
          <li key={f.id} className="flex flex-wrap items-center justify-between gap-2 text-sm">
            <span className="flex flex-wrap items-center gap-2">
              {current ? (
                <span className="font-semibold text-slate-900" aria-current="page">
                  Revision {f.revision} (this one)
                </span>
              ) : (
                <Link to={`/sites/${siteId}/fits/${f.id}`} className="font-medium text-accent-700 hover:underline">
                  Revision {f.revision}
                </Link>
              )}
              <FitStatusBadge status={f.status} superseded={f.supersededAt !== null} />
            </span>
            <span className="text-slate-600 tabular-nums">
              {formatK(f.result.kMetersPerSecond, kUnit)} · {formatDateTime(f.updatedAt)}
            </span>
          </li>
        );
      })}
    </ol>
  );
}
