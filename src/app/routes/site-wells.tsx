import { useSuspenseQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import type { Site } from '@shared/schemas/sites';
import { ButtonLink, buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '@/features/auth/hooks';
import { siteQueryOptions } from '@/features/sites/api';
import { wellsCsvUrl, wellsQueryOptions } from '@/features/wells/api';
import { ExportMenu } from '@/components/export-menu';
import { WellsTable } from '@/features/wells/components/wells-table';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';

export function SiteWellsRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the site…" renderError={siteErrorRenderer}>
      <SiteWells key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

/** Leads and Analysts (and Admins) add, change and import wells. */
export function useCanEditWells(site: Pick<Site, 'myRole'>): boolean {
  const me = useMe();
  return site.myRole === 'Lead' || site.myRole === 'Analyst' || Boolean(me?.isAdmin);
}

function SiteWells({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  useDocumentTitle(`Wells · ${site.name}`);
  const canEdit = useCanEditWells(site);
  return (
    <>
      <PageHeader
        title="Monitoring wells"
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name, to: `/sites/${site.id}` }, { label: 'Wells' }]}
        description={`Construction and location of every well on the site, in ${site.displayUnits === 'SI' ? 'metres' : 'feet (radii in inches)'}. Select a well to see its construction drawing.`}
        actions={
          <>
            {canEdit ? (
              <>
                <ButtonLink to={`/sites/${site.id}/wells/new`}>New well</ButtonLink>
                <ButtonLink to={`/sites/${site.id}/wells/import`} variant="secondary">
                  Import CSV
                </ButtonLink>
              </>
            ) : null}
            <a href={wellsCsvUrl(site.id)} download className={buttonClasses('secondary')} title="In the site’s display units; re-importable">
              Export CSV
            </a>
            <ExportMenu siteId={site.id} />
          </>
        }
      />
      <Card aria-labelledby="wells-table-title">
        <h2 id="wells-table-title" className="sr-only">
          Wells table
        </h2>
        <QueryBoundary loadingLabel="Loading wells…" errorTitle="The wells could not be loaded">
          <WellsRegion site={site} />
        </QueryBoundary>
      </Card>
    </>
  );
}

function WellsRegion({ site }: { site: Site }) {
  const { data: wells } = useSuspenseQuery(wellsQueryOptions(site.id));
  return <WellsTable wells={wells} siteId={site.id} displayUnits={site.displayUnits} epsgCode={site.epsgCode} />;
}
