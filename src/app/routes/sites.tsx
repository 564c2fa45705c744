import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { useMe } from '@/features/auth/hooks';
import { CreateSiteForm } from '@/features/sites/components/create-site-form';
import { SiteCards } from '@/features/sites/components/site-cards';
import { useDocumentTitle } from '@/lib/use-document-title';

export function SitesRoute() {
  useDocumentTitle('Sites');
  const me = useMe();
  const navigate = useNavigate();
  const toast = useToast();
  const [creating, setCreating] = useState(false);

  return (
    <>
      <PageHeader
        title="Sites"
        description={
          me?.isAdmin
            ? 'Every site on this Kfield instance. You see them all as an instance admin.'
            : 'The sites you are a member of.'
        }
        actions={
          creating || !me?.canCreateSites ? null : (
            <Button onClick={() => setCreating(true)} aria-expanded={false} aria-controls="new-site">
              New site
            </Button>
          )
        }
      />
      {creating ? (
        <Card className="mb-8" aria-labelledby="new-site-title">
          <CardHeader
            titleId="new-site-title"
            title="New site"
            description="You become the site's Lead and can invite the rest of the team."
          />
          <CardBody>
            <div id="new-site" className="max-w-2xl">
              <CreateSiteForm
                onCancel={() => setCreating(false)}
                onCreated={(site) => {
                  toast.success(`Site “${site.name}” created.`);
                  navigate(`/sites/${site.id}`);
                }}
              />
            </div>
          </CardBody>
        </Card>
      ) : null}
      <QueryBoundary loadingLabel="Loading sites…" errorTitle="The sites could not be loaded">
        <SiteCards
          emptyHint={me?.canCreateSites ? "Create a site with “New site”, or ask a site's Lead to invite you." : "Ask a site's Lead to invite you."}
        />
      </QueryBoundary>
    </>
  );
}
