import { useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { Site } from '@shared/schemas/sites';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/empty-state';
import { plural } from '@/lib/format';
import { sitesQueryOptions } from '../api';
import { myRoleLabel } from './role-label';

export function SiteCards({ emptyHint }: { emptyHint: string }) {
  const { data: sites } = useSuspenseQuery(sitesQueryOptions());
  if (sites.length === 0) {
    return <EmptyState title="No sites yet">{emptyHint}</EmptyState>;
  }
  return (
    <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" aria-label="Sites">
      {sites.map((site) => (
        <li key={site.id}>
          <SiteCard site={site} />
        </li>
      ))}
    </ul>
  );
}

function SiteCard({ site }: { site: Site }) {
  return (
    <article className="relative flex h-full flex-col gap-3 rounded-lg bg-white p-4 shadow-sm ring-1 ring-slate-200 transition hover:ring-accent-500 focus-within:ring-2 focus-within:ring-accent-600">
      <div className="flex items-start justify-between gap-3">
        <h2 className="min-w-0 text-base font-semibold break-words text-slate-900">
          {/* The link covers the whole card; its name stays the site's name. */}
          <Link to={`/sites/${site.id}`} className="after:absolute after:inset-0 focus-visible:outline-none">
            {site.name}
          </Link>
        </h2>
        <Badge tone={site.myRole === 'Lead' ? 'accent' : 'neutral'}>{myRoleLabel(site)}</Badge>
      </div>
      {site.description ? <p className="line-clamp-2 text-sm text-slate-600">{site.description}</p> : null}
      <dl className="mt-auto grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
        <dt className="text-slate-500">CRS</dt>
        <dd className="min-w-0 truncate text-slate-800" title={`EPSG:${site.epsgCode} · ${site.crsName}`}>
          EPSG:{site.epsgCode} · {site.crsName}
        </dd>
        <dt className="text-slate-500">Members</dt>
        <dd className="text-slate-800">{plural(site.memberCount, 'member', 'members')}</dd>
      </dl>
    </article>
  );
}
