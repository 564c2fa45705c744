import { useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { siteQueryOptions } from '@/features/sites/api';
import { CrsLookup } from '@/features/sites/components/crs-lookup';
import { wellKeys } from '@/features/wells/api';
import { ImportWizard } from '@/features/wells/components/import-wizard';
import { plural } from '@/lib/format';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';
import { useCanEditWells } from './site-wells';

export function WellsImportRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the site…" renderError={siteErrorRenderer}>
      <WellsImport key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

function WellsImport({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  useDocumentTitle(`Import wells · ${site.name}`);
  const canEdit = useCanEditWells(site);
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const toast = useToast();
  return (
    <>
      <PageHeader
        title="Import wells from CSV"
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name, to: `/sites/${site.id}` }, { label: 'Wells', to: `/sites/${site.id}/wells` }, { label: 'Import' }]}
        description="Match the file's columns to well fields, choose its units and coordinates, check every row, then import them all at once."
      />
      {canEdit ? (
        <ImportWizard
          site={site}
          renderCrsStatus={(id, value) => <CrsLookup id={id} value={value} />}
          onImported={async (report) => {
            await queryClient.invalidateQueries({ queryKey: wellKeys.list(site.id) });
            toast.success(`Imported ${plural(report.importedCount, 'well', 'wells')}.`);
            await navigate(`/sites/${site.id}/wells`);
          }}
        />
      ) : (
        <Alert tone="info">Only the site's Leads and Analysts import wells.</Alert>
      )}
    </>
  );
}
