import { useState } from 'react';
import { useSuspenseQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import type { ViewerLinkCreated } from '@shared/schemas/viewer-links';
import { Alert } from '@/components/ui/alert';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '@/features/auth/hooks';
import { siteQueryOptions } from '@/features/sites/api';
import { canManageViewerLinks } from '@/features/viewer-links/api';
import { CreateViewerLinkForm } from '@/features/viewer-links/components/create-viewer-link-form';
import { CreatedLinkPanel } from '@/features/viewer-links/components/created-link-panel';
import { ViewerLinksTable } from '@/features/viewer-links/components/viewer-links-table';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';

export function SiteViewerLinksRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the site…" renderError={siteErrorRenderer}>
      <SiteViewerLinks key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

function SiteViewerLinks({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  useDocumentTitle(`Viewer links · ${site.name}`);
  const me = useMe();
  const canManage = canManageViewerLinks(site, me);
  // The new link's URL is on screen once: it lives here, in this page's state, and nowhere else.
  const [created, setCreated] = useState<ViewerLinkCreated | null>(null);

  return (
    <>
      <PageHeader
        title="Viewer links"
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name, to: `/sites/${site.id}` }, { label: 'Viewer links' }]}
        description={
          canManage
            ? 'A viewer link shares this site’s K map, read-only, with anyone who has its URL, without an account, until it expires or is revoked. Send it only to the people it is for.'
            : 'Read-only links to this site’s K map for people without an account. The site’s Leads make and revoke them.'
        }
      />
      {canManage ? (
        <div className="space-y-6">
          <Card aria-labelledby="viewer-links-title">
            <CardHeader titleId="viewer-links-title" title="Links" />
            <QueryBoundary loadingLabel="Loading viewer links…" errorTitle="The viewer links could not be loaded">
              <ViewerLinksTable siteId={site.id} onRevoked={(linkId) => setCreated((shown) => (shown?.id === linkId ? null : shown))} />
            </QueryBoundary>
          </Card>
          <Card aria-labelledby="make-link-title">
            <CardHeader
              titleId="make-link-title"
              title={created ? 'New viewer link' : 'Make a viewer link'}
              description={created ? undefined : 'Choose who it is for, how long it works and what it shows.'}
            />
            <CardBody>
              <div className="max-w-2xl">
                {created ? (
                  <CreatedLinkPanel link={created} showOutboxHint={Boolean(me?.isAdmin)} onDone={() => setCreated(null)} />
                ) : (
                  <CreateViewerLinkForm siteId={site.id} onCreated={setCreated} />
                )}
              </div>
            </CardBody>
          </Card>
        </div>
      ) : (
        <Alert tone="info" title="Only the site’s Leads manage viewer links">
          Ask a Lead of {site.name} if someone outside the team needs to see the K map.
        </Alert>
      )}
    </>
  );
}
