import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import type { WellInputParsed } from '@shared/schemas/wells';
import { Alert } from '@/components/ui/alert';
import { Card, CardBody } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { siteQueryOptions } from '@/features/sites/api';
import { CrsLookup } from '@/features/sites/components/crs-lookup';
import { createWell, wellKeys } from '@/features/wells/api';
import { WellForm } from '@/features/wells/components/well-form';
import { newWellDefaults } from '@/features/wells/form-defaults';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';
import { useCanEditWells } from './site-wells';

export function NewWellRoute() {
  const { siteId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the site…" renderError={siteErrorRenderer}>
      <NewWell key={siteId} siteId={siteId} />
    </QueryBoundary>
  );
}

function NewWell({ siteId }: { siteId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  useDocumentTitle(`New well · ${site.name}`);
  const canEdit = useCanEditWells(site);
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const toast = useToast();
  const mutation = useMutation({
    mutationFn: (body: WellInputParsed) => createWell(site.id, body),
    onSuccess: async (well) => {
      queryClient.setQueryData(wellKeys.detail(well.id), well);
      await queryClient.invalidateQueries({ queryKey: wellKeys.list(site.id) });
      toast.success(`Well ${well.name} added.`);
      await navigate(`/sites/${site.id}/wells/${well.id}`);
    },
  });
  return (
    <>
      <PageHeader
        title="New well"
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name, to: `/sites/${site.id}` }, { label: 'Wells', to: `/sites/${site.id}/wells` }, { label: 'New well' }]}
        description="Each length takes the unit you choose beside it; Kfield stores metres."
      />
      <Card>
        <CardBody>
          {canEdit ? (
            <div className="max-w-3xl">
              <WellForm
                site={site}
                defaultValues={newWellDefaults(site)}
                submitLabel="Add well"
                onCancel={() => void navigate(`/sites/${site.id}/wells`)}
                onSubmit={(body) => mutation.mutateAsync(body)}
                renderCrsStatus={(id, value) => <CrsLookup id={id} value={value} />}
              />
            </div>
          ) : (
            <Alert tone="info">Only the site's Leads and Analysts add wells.</Alert>
          )}
        </CardBody>
      </Card>
    </>
  );
}
