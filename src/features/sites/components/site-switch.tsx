import { useQuery } from '@tanstack/react-query';
import { useNavigate } from 'react-router-dom';
import { InlineSelect } from '@/components/ui/field';
import { sitesQueryOptions } from '../api';

/** The top bar's way between sites; quietly absent until the list is in (or when there is none). */
export function SiteSwitch({ currentSiteId }: { currentSiteId: string | undefined }) {
  const navigate = useNavigate();
  const { data: sites } = useQuery(sitesQueryOptions());
  if (!sites || sites.length === 0) return null;
  const known = currentSiteId !== undefined && sites.some((s) => s.id === currentSiteId);
  return (
    <InlineSelect
      label="Switch site"
      className="max-w-[14rem] truncate"
      value={known ? currentSiteId : ''}
      onChange={(event) => navigate(event.target.value ? `/sites/${event.target.value}` : '/')}
    >
      <option value="">All sites</option>
      {sites.map((site) => (
        <option key={site.id} value={site.id}>
          {site.name}
        </option>
      ))}
    </InlineSelect>
  );
}
