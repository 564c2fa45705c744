import { useSuspenseQueries, useSuspenseQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { recordMetaQueryOptions, reducedQueryOptions, seriesQueryOptions } from '@/features/fits/api';
import { FitWorkspace } from '@/features/fits/components/fit-workspace';
import { recordLabel } from '@/features/fits/components/record-label';
import { siteQueryOptions } from '@/features/sites/api';
import { wellQueryOptions } from '@/features/wells/api';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';

export function NewFitRoute() {
  const { siteId = '', recordId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the record…" renderError={siteErrorRenderer}>
      <NewFit key={recordId} siteId={siteId} recordId={recordId} />
    </QueryBoundary>
  );
}

function NewFit({ siteId, recordId }: { siteId: string; recordId: string }) {
  const [{ data: site }, { data: record }, { data: reduced }, { data: series }] = useSuspenseQueries({
    queries: [siteQueryOptions(siteId), recordMetaQueryOptions(recordId), reducedQueryOptions(recordId), seriesQueryOptions(recordId)],
  });
  const { data: well } = useSuspenseQuery(wellQueryOptions(record.wellId));
  useDocumentTitle(`New fit · ${record.wellName}`);
  return (
    <>
      <PageHeader
        title={`New fit · ${record.wellName}`}
        crumbs={[
          { label: 'Sites', to: '/' },
          { label: site.name, to: `/sites/${site.id}` },
          { label: record.wellName, to: `/sites/${site.id}/wells/${record.wellId}` },
          { label: recordLabel(record), to: `/sites/${site.id}/records/${record.id}` },
          { label: 'New fit' },
        ]}
        description={`${recordLabel(record)}. Choose the method and the fitting window; K updates as you go. Save to keep the fit as a Draft.`}
      />
      <FitWorkspace site={site} reduced={reduced} series={series} fit={null} wellFilterPackPorosity={well.filterPackPorosity} />
    </>
  );
}
