import { useSuspenseQuery } from '@tanstack/react-query';
import { formatDate, plural } from '@/lib/format';
import { viewerLinksQueryOptions } from '../api';
import { viewerLinkStatus } from './link-status';

/** The overview's short list for Leads: the links that work now. */
export function ViewerLinksSummary({ siteId }: { siteId: string }) {
  const { data: links } = useSuspenseQuery(viewerLinksQueryOptions(siteId));
  const now = Date.now();
  const active = links.filter((link) => viewerLinkStatus(link, now) === 'Active');
  if (active.length === 0) {
    return <p className="text-sm text-slate-600">No active links. A viewer link shows the K map, read-only, to someone without an account.</p>;
  }
  return (
    <div className="space-y-2">
      <p className="text-sm text-slate-600">{plural(active.length, 'active link', 'active links')}</p>
      <ul className="divide-y divide-slate-100" aria-label="Active viewer links">
        {active.slice(0, 5).map((link) => (
          <li key={link.id} className="flex items-center justify-between gap-3 py-2">
            <span className="min-w-0 truncate text-sm font-medium text-slate-900">{link.label}</span>
            <span className="shrink-0 text-xs text-slate-500">until {formatDate(link.expiresAt)}</span>
          </li>
        ))}
      </ul>
      {active.length > 5 ? <p className="text-sm text-slate-600">and {active.length - 5} more.</p> : null}
    </div>
  );
}
