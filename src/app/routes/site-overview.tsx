import { useState } from 'react';
import { useSuspenseQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { Button, ButtonLink } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { useMe } from '@/features/auth/hooks';
import { MembersSummary } from '@/features/members/components/members-summary';
import { siteQueryOptions } from '@/features/sites/api';
import { EditSiteForm } from '@/features/sites/components/edit-site-form';
import { SiteDetails } from '@/features/sites/components/site-details';
import { ViewerLinksSummary } from '@/features/viewer-links/components/viewer-links-summary';
import { WellsSummary } from '@/features/wells/components/wells-summary';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';

export function SiteOverviewRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the site…" renderError={siteErrorRenderer}>
      <SiteOverview key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

function SiteOverview({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  useDocumentTitle(site.name);
  const me = useMe();
  const toast = useToast();
  const [editing, setEditing] = useState(false);
  const canManage = site.myRole === 'Lead' || Boolean(me?.isAdmin);

  return (
    <>
      <PageHeader
        title={site.name}
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name }]}
        description={`EPSG:${site.epsgCode} · ${site.crsName}`}
        actions={<ButtonLink to={`/sites/${site.id}/map`}>K map</ButtonLink>}
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_20rem]">
        <Card aria-labelledby="site-details-title">
          <CardHeader
            titleId="site-details-title"
            title={editing ? 'Edit site' : 'Site details'}
            actions={
              canManage && !editing ? (
                <Button variant="secondary" size="sm" onClick={() => setEditing(true)}>
                  Edit site
                </Button>
              ) : null
            }
          />
          <CardBody>
            {editing ? (
              <div className="max-w-2xl">
                <EditSiteForm
                  site={site}
                  onCancel={() => setEditing(false)}
                  onSaved={() => {
                    setEditing(false);
                    toast.success('Site details saved.');
                  }}
                />
              </div>
            ) : (
              <SiteDetails site={site} />
            )}
          </CardBody>
        </Card>
        <div className="space-y-6 self-start">
          <Card aria-labelledby="site-wells-title">
            <CardHeader
              titleId="site-wells-title"
              title="Monitoring wells"
              actions={
                <ButtonLink to={`/sites/${site.id}/wells`} variant="ghost" size="sm">
                  Wells table
                </ButtonLink>
              }
            />
            <CardBody>
              <QueryBoundary loadingLabel="Loading wells…" errorTitle="The wells could not be loaded">
                <WellsSummary siteId={site.id} />
              </QueryBoundary>
            </CardBody>
          </Card>
          <Card aria-labelledby="site-members-title">
            <CardHeader
              titleId="site-members-title"
              title="Members"
              actions={
                <ButtonLink to={`/sites/${site.id}/members`} variant="ghost" size="sm">
                  {canManage ? 'Manage members' : 'All members'}
                </ButtonLink>
              }
            />
            <CardBody>
              <QueryBoundary loadingLabel="Loading members…" errorTitle="The members could not be loaded">
                <MembersSummary siteId={site.id} />
              </QueryBoundary>
            </CardBody>
          </Card>
          {canManage ? (
            <Card aria-labelledby="site-viewer-links-title">
              <CardHeader
                titleId="site-viewer-links-title"
                title="Viewer links"
                actions={
                  <ButtonLink to={`/sites/${site.id}/viewer-links`} variant="ghost" size="sm">
                    Manage viewer links
                  </ButtonLink>
                }
              />
              <CardBody>
                <QueryBoundary loadingLabel="Loading viewer links…" errorTitle="The viewer links could not be loaded">
                  <ViewerLinksSummary siteId={site.id} />
                </QueryBoundary>
              </CardBody>
            </Card>
          ) : null}
        </div>
      </div>
    </>
  );
}
