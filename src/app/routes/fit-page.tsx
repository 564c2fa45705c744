import { useSuspenseQueries, useSuspenseQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { fitQueryOptions, recordMetaQueryOptions, reducedQueryOptions, seriesQueryOptions } from '@/features/fits/api';
import { AuditTrail } from '@/features/fits/components/audit-trail';
import { FitStatusBadge } from '@/features/fits/components/fit-status-badge';
import { FitWorkspace } from '@/features/fits/components/fit-workspace';
import { recordLabel } from '@/features/fits/components/record-label';
import { RevisionsList } from '@/features/fits/components/revisions-list';
import { defaultKUnit } from '@/features/fits/format';
import { siteQueryOptions } from '@/features/sites/api';
import { wellQueryOptions } from '@/features/wells/api';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useDocumentTitle } from '@/lib/use-document-title';
import { siteErrorRenderer } from './site-boundary';
import { FIT_METHODS } from '@shared/hydraulics/fitting';

export function FitRoute() {
  const { siteId = '', fitId = '' } = useParams();
  return (
    <QueryBoundary
      loadingLabel="Loading the fit…"
      renderError={(props) =>
        isApiError(props.error) && props.error.status === 404 ? (
          <Alert tone="error" title="Fit not found">
            This fit does not exist, or you are not a member of its site. <Link to="/" className="underline">Go to your sites</Link>
          </Alert>
        ) : (
          siteErrorRenderer(props)
        )
      }
    >
      <FitPage key={fitId} siteId={siteId} fitId={fitId} />
    </QueryBoundary>
  );
}

function FitPage({ siteId, fitId }: { siteId: string; fitId: string }) {
  const { data: fit } = useSuspenseQuery(fitQueryOptions(fitId));
  const [{ data: site }, { data: record }, { data: reduced }, { data: series }] = useSuspenseQueries({
    queries: [siteQueryOptions(fit.siteId || siteId), recordMetaQueryOptions(fit.recordId), reducedQueryOptions(fit.recordId), seriesQueryOptions(fit.recordId)],
  });
  const { data: well } = useSuspenseQuery(wellQueryOptions(fit.wellId));
  const method = `${fit.model === 'high-k' ? 'High-K ' : ''}${FIT_METHODS.find((m) => m.id === fit.method)?.label ?? fit.method}`;
  useDocumentTitle(`Fit · ${fit.wellName}`);
  return (
    <>
      <PageHeader
        title={
          <span className="inline-flex flex-wrap items-center gap-x-3 gap-y-1">
            <span>Fit · {fit.wellName}</span>
            <FitStatusBadge status={fit.status} superseded={fit.supersededAt !== null} />
          </span>
        }
        crumbs={[
          { label: 'Sites', to: '/' },
          { label: site.name, to: `/sites/${site.id}` },
          { label: fit.wellName, to: `/sites/${site.id}/wells/${fit.wellId}` },
          { label: recordLabel(record), to: `/sites/${site.id}/records/${fit.recordId}` },
          { label: `Fit, revision ${fit.revision}` },
        ]}
        description={
          <span className="flex flex-wrap gap-x-4 gap-y-1">
            <span>{method}</span>
            <span>Revision {fit.revision}</span>
            <span>Prepared by {fit.preparedBy.name}</span>
            {fit.submittedAt ? <span>Submitted {formatDateTime(fit.submittedAt)}</span> : null}
            {fit.checkedBy && (fit.status === 'checked' || fit.status === 'sent-back') ? (
              <span>
                {fit.status === 'sent-back' ? 'Sent back' : 'Checked'} by {fit.checkedBy.name}
                {fit.checkedAt ? `, ${formatDateTime(fit.checkedAt)}` : ''}
              </span>
            ) : null}
          </span>
        }
      />
      <div className="mb-6 space-y-3 empty:hidden">
        {fit.status === 'sent-back' && fit.checkComment ? (
          <Alert tone="warning" title={`Sent back by ${fit.checkedBy?.name ?? 'the Checker'}`}>
            <p className="whitespace-pre-line">{fit.checkComment}</p>
          </Alert>
        ) : null}
        {fit.status === 'checked' && fit.checkComment ? (
          <Alert tone="success" title={`Checked by ${fit.checkedBy?.name ?? 'the Checker'}`}>
            <p className="whitespace-pre-line">{fit.checkComment}</p>
          </Alert>
        ) : null}
        {fit.supersededAt ? (
          <Alert tone="info" title="A later revision has been Checked">
            This revision stays readable but no longer counts toward Well K. See the revisions below.
          </Alert>
        ) : null}
      </div>
      <p className="flex justify-end">
        <a href={`/api/fits/${fit.id}/report.pdf`} download className={buttonClasses('secondary', 'sm')} data-testid="fit-report-pdf">
          Download PDF
        </a>
      </p>
      <FitWorkspace
        key={`${fit.id}:${fit.updatedAt}`}
        site={site}
        reduced={reduced}
        series={series}
        fit={fit}
        wellFilterPackPorosity={well.filterPackPorosity}
        aside={
          <Card aria-labelledby="fit-history-title">
            <CardHeader titleId="fit-history-title" title="History" />
            <CardBody className="space-y-6">
              <div className="space-y-2">
                <h3 className="text-sm font-semibold text-slate-900">Revisions</h3>
                <QueryBoundary loadingLabel="Loading the revisions…" errorTitle="The revisions could not be loaded">
                  <RevisionsList siteId={site.id} fitId={fit.id} kUnit={defaultKUnit(site.displayUnits)} />
                </QueryBoundary>
              </div>
              <QueryBoundary loadingLabel="Loading the audit trail…" errorTitle="The audit trail could not be loaded">
                <AuditTrail fitId={fit.id} siteId={site.id} />
              </QueryBoundary>
            </CardBody>
          </Card>
        }
      />
    </>
  );
}
