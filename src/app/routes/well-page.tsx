import { useState, type ComponentType, type ReactNode } from 'react';
import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import type { Site } from '@shared/schemas/sites';
import type { Well, WellInputParsed } from '@shared/schemas/wells';
import { NotFoundPanel } from '@/components/ui/not-found-panel';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { QueryBoundary, RegionError } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { WellFitsPanel } from '@/features/fits/components/well-fits-panel';
import { WellRecordsPanel } from '@/features/records/components/well-records-panel';
import { siteQueryOptions } from '@/features/sites/api';
import { CrsLookup } from '@/features/sites/components/crs-lookup';
import { deleteWell, updateWell, wellKeys, wellQueryOptions } from '@/features/wells/api';
import { WellDetails } from '@/features/wells/components/well-details';
import { WellForm } from '@/features/wells/components/well-form';
import { WellSchematic } from '@/features/wells/components/well-schematic';
import { StatusBadge } from '@/features/wells/components/well-status';
import { editWellDefaults } from '@/features/wells/form-defaults';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { describeError } from '@/lib/errors';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCanEditWells } from './site-wells';

/** What every section of the well page is given. */
export type WellSectionProps = { site: Site; well: Well; canEdit: boolean };

type WellSection = {
  id: string;
  title: string;
  /** Spans the page's width on large screens. */
  wide?: boolean;
  Component: ComponentType<WellSectionProps>;
};

/*
 * The well page's sections, in order. Each sits in its own card with its own loading and error
 * state, so a section that fetches more (records, fits) adds one line here.
 */
const WELL_SECTIONS: WellSection[] = [
  { id: 'construction', title: 'Construction', Component: ConstructionSection },
  { id: 'details', title: 'Details', Component: DetailsSection },
  { id: 'records', title: 'Records', wide: true, Component: ({ site, well, canEdit }) => <WellRecordsPanel siteId={site.id} wellId={well.id} canEdit={canEdit} displayUnits={site.displayUnits} /> },
  { id: 'fits', title: 'Well K, fits and repeat tests', wide: true, Component: WellFitsPanel },
];

function ConstructionSection({ site, well }: WellSectionProps) {
  return <WellSchematic well={well} displayUnits={site.displayUnits} />;
}

function DetailsSection({ site, well }: WellSectionProps) {
  return <WellDetails well={well} displayUnits={site.displayUnits} siteEpsg={site.epsgCode} />;
}

export function WellPageRoute() {
  const { siteId = '', wellId = '' } = useParams();
  return (
    <QueryBoundary loadingLabel="Loading the well…" renderError={(p) => wellErrorRenderer({ ...p, siteId })}>
      <WellPage key={wellId} siteId={siteId} wellId={wellId} />
    </QueryBoundary>
  );
}

function WellNotFound({ siteId }: { siteId: string }) {
  return <NotFoundPanel title="Well not found" message="This well does not exist, or you are not a member of its site." siteId={siteId} />;
}

function wellErrorRenderer({ error, reset, siteId }: { error: unknown; reset: () => void; siteId: string }): ReactNode {
  if (isApiError(error) && error.status === 404) return <WellNotFound siteId={siteId} />;
  return <RegionError error={error} reset={reset} title="The well could not be loaded" />;
}

function WellPage({ siteId, wellId }: { siteId: string; wellId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  const { data: well } = useSuspenseQuery(wellQueryOptions(wellId));
  useDocumentTitle(`${well.name} · ${site.name}`);
  const canEdit = useCanEditWells(site);
  const [editing, setEditing] = useState(false);
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const toast = useToast();

  const save = useMutation({
    mutationFn: (body: WellInputParsed) => updateWell(well.id, body),
    onSuccess: async (saved) => {
      queryClient.setQueryData(wellKeys.detail(saved.id), saved);
      await queryClient.invalidateQueries({ queryKey: wellKeys.list(site.id) });
      setEditing(false);
      toast.success(`Well ${saved.name} saved.`);
    },
  });
  const removal = useMutation({
    mutationFn: () => deleteWell(well.id),
    onSuccess: async () => {
      await navigate(`/sites/${site.id}/wells`, { replace: true });
      queryClient.removeQueries({ queryKey: wellKeys.detail(well.id) });
      await queryClient.invalidateQueries({ queryKey: wellKeys.list(site.id) });
      toast.success(`Well ${well.name} deleted.`);
    },
    onError: (error) => toast.error(describeError(error)),
  });

  if (well.siteId !== site.id) return <WellNotFound siteId={site.id} />;

  return (
    <>
      <PageHeader
        title={
          <span className="inline-flex flex-wrap items-center gap-3">
            {well.name} <StatusBadge status={well.status} />
          </span>
        }
        crumbs={[{ label: 'Sites', to: '/' }, { label: site.name, to: `/sites/${site.id}` }, { label: 'Wells', to: `/sites/${site.id}/wells` }, { label: well.name }]}
        description={[well.hydroUnit, `${well.aquiferCondition} aquifer`, well.isDemo ? 'invented demo well' : null].filter(Boolean).join(' · ')}
        actions={
          canEdit && !editing ? (
            <>
              <Button variant="secondary" onClick={() => setEditing(true)}>
                Edit well
              </Button>
              <ConfirmButton question={`Delete ${well.name}?`} confirmLabel="Delete" pending={removal.isPending} onConfirm={() => removal.mutate()}>
                Delete
              </ConfirmButton>
            </>
          ) : null
        }
      />
      {editing ? (
        <Card aria-labelledby="well-edit-title" className="mb-6">
          <CardHeader titleId="well-edit-title" title={`Edit ${well.name}`} description="Lengths are shown in the site's units; change any unit beside its value." />
          <CardBody>
            <div className="max-w-3xl">
              <WellForm
                site={site}
                defaultValues={editWellDefaults(well, site)}
                submitLabel="Save changes"
                onCancel={() => setEditing(false)}
                onSubmit={(body) => save.mutateAsync(body)}
                renderCrsStatus={(id, value) => <CrsLookup id={id} value={value} />}
              />
            </div>
          </CardBody>
        </Card>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-2">
        {WELL_SECTIONS.map(({ id, title, wide, Component }) => (
          <Card key={id} aria-labelledby={`well-section-${id}`} className={cn('min-w-0', wide && 'lg:col-span-2')}>
            <CardHeader titleId={`well-section-${id}`} title={title} />
            <CardBody>
              <QueryBoundary loadingLabel={`Loading ${title.toLowerCase()}…`} errorTitle={`The ${title.toLowerCase()} could not be loaded`}>
                <Component site={site} well={well} canEdit={canEdit} />
              </QueryBoundary>
            </CardBody>
          </Card>
        ))}
      </div>
    </>
  );
}
