import { useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '@/features/auth/hooks';
import { InvitationsTable } from '@/features/members/components/invitations-table';
import { InviteForm } from '@/features/members/components/invite-form';
import { MembersTable } from '@/features/members/components/members-table';
import { siteKeys, siteQueryOptions } from '@/features/sites/api';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';

export function SiteMembersRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the site…" renderError={siteErrorRenderer}>
      <SiteMembers key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

function SiteMembers({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  useDocumentTitle(`Members · ${site.name}`);
  const me = useMe();
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const canManage = site.myRole === 'Lead' || Boolean(me?.isAdmin);

  const refreshSite = () => {
    void queryClient.invalidateQueries({ queryKey: siteKeys.all });
  };

  return (
    <>
      <PageHeader
        title="Members"
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name, to: `/sites/${site.id}` }, { label: 'Members' }]}
        description={
          canManage
            ? 'Invite people by e-mail, change what each member may do, or remove them from the site.'
            : 'The people on this site and their roles. The site’s Leads manage membership.'
        }
      />
      <div className="space-y-6">
        <Card aria-labelledby="members-title">
          <CardHeader titleId="members-title" title="Members" />
          <QueryBoundary loadingLabel="Loading members…" errorTitle="The members could not be loaded">
            <MembersTable
              siteId={site.id}
              canManage={canManage}
              myUserId={me?.id ?? ''}
              onMembershipChanged={refreshSite}
              onLeftSite={() => {
                // Leave the page before dropping its data, or it would refetch a site it can no longer see.
                void Promise.resolve(navigate('/', { replace: true })).then(() => {
                  queryClient.removeQueries({ queryKey: siteKeys.detail(site.id) });
                  void queryClient.invalidateQueries({ queryKey: siteKeys.lists() });
                });
              }}
            />
          </QueryBoundary>
        </Card>
        {canManage ? (
          <>
            <Card aria-labelledby="invite-title">
              <CardHeader
                titleId="invite-title"
                title="Invite someone"
                description="They receive an e-mail with a link to join this site. The link works once and expires."
              />
              <CardBody>
                <div className="max-w-2xl">
                  <InviteForm siteId={site.id} />
                </div>
              </CardBody>
            </Card>
            <Card aria-labelledby="invitations-title">
              <CardHeader titleId="invitations-title" title="Pending invitations" />
              <QueryBoundary loadingLabel="Loading invitations…" errorTitle="The invitations could not be loaded">
                <InvitationsTable siteId={site.id} />
              </QueryBoundary>
            </Card>
          </>
        ) : null}
      </div>
    </>
  );
}
