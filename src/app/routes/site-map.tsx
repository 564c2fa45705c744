import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { LoadingBlock } from '@/components/ui/spinner';
import { useMe } from '@/features/auth/hooks';
import { basemapsQueryOptions, mapWellsQueryOptions } from '@/features/kmap/api';
import { KMapPage } from '@/features/kmap/components/k-map-page';
import { crsQueryOptions, siteQueryOptions } from '@/features/sites/api';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';

/** The K map workspace of a site (loaded on its own: maplibre and the proj4 definitions stay out of the other pages). */
export function SiteMapRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the K map…" renderError={siteErrorRenderer}>
      <SiteMap key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

function SiteMap({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  const { data: wells } = useSuspenseQuery(mapWellsQueryOptions(siteId));
  const crs = useQuery(crsQueryOptions(site.epsgCode));
  const basemaps = useQuery(basemapsQueryOptions());
  const me = useMe();
  // As the wells pages decide it: Leads and Analysts (and Admins) change outlines and sketches.
  const canEdit = site.myRole === 'Lead' || site.myRole === 'Analyst' || Boolean(me?.isAdmin);
  useDocumentTitle(`K map · ${site.name}`);

  return basemaps.isPending ? (
    <LoadingBlock label="Loading the basemaps…" />
  ) : (
    <KMapPage site={site} wells={wells} crsUnit={crs.data?.unit ?? null} basemaps={basemaps.data ?? []} canEdit={canEdit} />
  );
}
