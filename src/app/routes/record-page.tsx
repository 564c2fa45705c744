import { useState, type ReactNode } from 'react';
import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { CAUTIONS } from '@shared/cautions';
import type { RecordDto } from '@shared/schemas/records';
import { Alert } from '@/components/ui/alert';
import { NotFoundPanel } from '@/components/ui/not-found-panel';
import { ButtonLink } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { QueryBoundary, RegionError } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { useMe } from '@/features/auth/hooks';
import { RecordFitsPanel } from '@/features/fits/components/record-fits-panel';
import { deleteRecord, invalidateWellRecords, recordFileUrl, recordKeys, recordQueryOptions, recordSeriesQueryOptions } from '@/features/records/api';
import { RecoveryCurve } from '@/features/records/components/recovery-curve';
import { DIRECTION_LABELS, formatBytes, formatCount, formatDuration, formatLevel, recordTitle, REFERENCE_LABELS } from '@/features/records/format';
import { siteQueryOptions } from '@/features/sites/api';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { formatDateTime } from '@/lib/format';
import { useDocumentTitle } from '@/lib/use-document-title';

export function RecordPageRoute() {
  const { siteId = '', recordId = '' } = useParams();
  return (
    <QueryBoundary
      loadingLabel="Loading the record…"
      renderError={({ error, reset }) =>
        isApiError(error) && error.status === 404 ? <RecordNotFound siteId={siteId} /> : <RegionError error={error} reset={reset} title="The record could not be loaded" />
      }
    >
      <RecordPage key={recordId} siteId={siteId} recordId={recordId} />
    </QueryBoundary>
  );
}

function RecordNotFound({ siteId }: { siteId: string }) {
  return <NotFoundPanel title="Record not found" message="This record does not exist, or you are not a member of its site." siteId={siteId} />;
}

function Item({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="min-w-0">
      <dt className="text-xs text-slate-500">{term}</dt>
      <dd className="mt-0.5 text-sm break-words text-slate-900">{children}</dd>
    </div>
  );
}

/** "entered as 13.99 ft": the static level in the unit it was typed in. */
function enteredStatic(record: RecordDto): string {
  const s = record.settings as { static?: number; units?: string; staticLevel?: { value: number; unit: string } };
  if (record.source === 'tape' && typeof s.static === 'number') return `entered as ${s.static} ${s.units ?? 'm'}`;
  if (s.staticLevel) return `entered as ${s.staticLevel.value} ${s.staticLevel.unit}`;
  return 'entered';
}

function settingsSummary(record: RecordDto): string[] {
  const s = record.settings as {
    valueUnit?: string;
    units?: string;
    timeFormat?: string;
    mapping?: { time?: { format?: string; timeZone?: string; timestampLayout?: string } };
    waterDensityKgM3?: number;
    barometric?: { valueUnit?: string; clockOffsetSeconds?: number };
  };
  const lines: string[] = [];
  if (record.source === 'tape') {
    lines.push(`Depths in ${s.units ?? 'm'}, time as ${s.timeFormat ?? 's'}`);
  } else {
    const t = s.mapping?.time;
    lines.push(`Values in ${s.valueUnit ?? '?'}; time ${t?.format === 'timestamp' ? `as dates and times (${t.timestampLayout}), zone ${t.timeZone}` : `as elapsed ${t?.format}`}`);
    if (record.reference !== 'depth' && s.waterDensityKgM3) lines.push(`Water density ${s.waterDensityKgM3} kg/m³`);
    if (s.barometric) lines.push(`Barometric record in ${s.barometric.valueUnit}${s.barometric.clockOffsetSeconds ? `, clock shifted by ${s.barometric.clockOffsetSeconds} s` : ''}`);
  }
  return lines;
}

function Curve({ record, scale }: { record: RecordDto; scale: 'log' | 'linear' }) {
  const { data: series } = useSuspenseQuery(recordSeriesQueryOptions(record.id, scale));
  const afterStart = series.plottable + (scale === 'log' ? (series.belowStatic ?? 0) : 0);
  const overshoot = (series.belowStatic ?? 0) > 0.05 * Math.max(1, afterStart);
  if (series.plottable === 0) return <Alert tone="warning">No reading after the test start lies above static, so there is nothing to draw on a log axis.</Alert>;
  return (
    <div className="space-y-3">
      {overshoot && scale === 'log' ? (
        <Alert tone="warning">
          {formatCount(series.belowStatic ?? 0)} readings after the start lie at or below static (H/H0 ≤ 0): the water overshot static, as in an oscillating
          (underdamped) response. A log axis cannot show them; the linear axis does.
        </Alert>
      ) : null}
      <RecoveryCurve
        elapsedSeconds={series.elapsedSeconds}
        normalizedHead={series.normalizedHead}
        omitted={series.omitted}
        scale={scale}
        segmentStarts={series.segmentStarts}
        label={`Normalized head of the record, ${formatCount(series.plottable)} readings${series.plottable > series.elapsedSeconds.length ? ` drawn as ${formatCount(series.elapsedSeconds.length)} points that keep the curve's shape` : ''}`}
      />
    </div>
  );
}

function AxisToggle({ scale, onChange }: { scale: 'log' | 'linear'; onChange: (s: 'log' | 'linear') => void }) {
  return (
    <div role="group" aria-label="H/H0 axis" className="inline-flex rounded-md shadow-sm ring-1 ring-slate-300">
      {(['log', 'linear'] as const).map((s) => (
        <button
          key={s}
          type="button"
          aria-pressed={scale === s}
          onClick={() => onChange(s)}
          className={`px-3 py-1 text-sm first:rounded-l-md last:rounded-r-md ${scale === s ? 'bg-accent-700 text-white' : 'bg-white text-slate-700 hover:bg-slate-50'}`}
        >
          {s === 'log' ? 'Log axis' : 'Linear axis'}
        </button>
      ))}
    </div>
  );
}

function RecordPage({ siteId, recordId }: { siteId: string; recordId: string }) {
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  const { data: record } = useSuspenseQuery(recordQueryOptions(recordId));
  const me = useMe();
  const [scale, setScale] = useState<'log' | 'linear'>('log');
  const canEdit = site.myRole === 'Lead' || site.myRole === 'Analyst' || Boolean(me?.isAdmin);
  const title = recordTitle(record);
  useDocumentTitle(`${record.wellName}: ${title}`);
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const toast = useToast();
  const removal = useMutation({
    mutationFn: () => deleteRecord(record.id),
    onSuccess: async () => {
      await navigate(`/sites/${site.id}/wells/${record.wellId}`, { replace: true });
      queryClient.removeQueries({ queryKey: recordKeys.detail(record.id) });
      await invalidateWellRecords(queryClient, record.wellId);
      toast.success('Record deleted.');
    },
    onError: (e) => toast.error(describeError(e)),
  });

  if (record.siteId !== site.id) return <RecordNotFound siteId={site.id} />;
  const unit = site.displayUnits;
  const levelTerm = record.reference === 'depth' ? 'Static level (depth below MP)' : 'Static level (head above the sensor)';
  return (
    <>
      <PageHeader
        title={title}
        crumbs={[
          { label: 'Sites', to: '/' },
          { label: site.name, to: `/sites/${site.id}` },
          { label: 'Wells', to: `/sites/${site.id}/wells` },
          { label: record.wellName, to: `/sites/${site.id}/wells/${record.wellId}` },
          { label: 'Record' },
        ]}
        description={`${record.source === 'tape' ? 'Tape readings' : 'Logger file'} · ${REFERENCE_LABELS[record.reference]}${record.isDemo ? ' · invented demo record' : ''}`}
        actions={
          canEdit ? (
            <>
              <ButtonLink to={`/sites/${site.id}/records/${record.id}/fit`}>Fit this record</ButtonLink>
              <ConfirmButton question="Delete this record and its files?" confirmLabel="Delete" pending={removal.isPending} onConfirm={() => removal.mutate()}>
                Delete
              </ConfirmButton>
            </>
          ) : null
        }
      />
      {record.warnings.length > 0 ? (
        <Alert tone="warning" title="Check this record" className="mb-6">
          <ul className="list-disc space-y-0.5 pl-5">
            {record.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Alert>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-3">
        <Card aria-labelledby="record-curve" className="min-w-0 lg:col-span-2">
          <CardHeader
            titleId="record-curve"
            title="Normalized head H/H0"
            description={scale === 'log' ? 'Semi-log plot from the test start; a Hvorslev recovery is a straight line through (0, 1).' : 'H/H0 from the test start on a linear axis: 1 at the start, 0 at static.'}
            actions={<AxisToggle scale={scale} onChange={setScale} />}
          />
          <CardBody>
            <QueryBoundary loadingLabel="Loading the curve…" errorTitle="The curve could not be loaded">
              <Curve record={record} scale={scale} />
            </QueryBoundary>
          </CardBody>
        </Card>
        <Card aria-labelledby="record-meta" className="min-w-0">
          <CardHeader titleId="record-meta" title="The record" />
          <CardBody>
            <dl className="grid grid-cols-2 gap-x-4 gap-y-3">
              <Item term="Well">
                <Link to={`/sites/${site.id}/wells/${record.wellId}`} className="text-accent-700 hover:underline">
                  {record.wellName}
                </Link>
              </Item>
              <Item term="Direction">{DIRECTION_LABELS[record.direction]}</Item>
              <Item term="Readings">{formatCount(record.sampleCount)}</Item>
              <Item term="Duration after the start">{formatDuration(record.durationSeconds)}</Item>
              <Item term="Test start">
                {formatDuration(record.testStartSeconds)} after the first reading ({record.testStartSource})
                {record.startedAt ? <span className="block text-xs text-slate-500">{formatDateTime(record.startedAt)}</span> : null}
              </Item>
              <Item term="H0">
                {formatLevel(Math.abs(record.h0M), unit)}
                {record.expectedH0M !== null ? <span className="block text-xs text-slate-500">expected from the slug: {formatLevel(record.expectedH0M, unit)}</span> : null}
              </Item>
              <Item term={levelTerm}>
                {formatLevel(record.staticLevelM, unit)}
                <span className="block text-xs text-slate-500">{record.staticSource === 'entered' ? enteredStatic(record) : `mean of ${record.preTestCount} pre-test readings`}</span>
              </Item>
              <Item term="Field crew">{record.fieldCrew || '—'}</Item>
              <Item term="Added">
                {formatDateTime(record.createdAt)}
                {record.createdBy ? <span className="block text-xs text-slate-500">by {record.createdBy.name}</span> : null}
              </Item>
            </dl>
            <ul className="mt-4 space-y-0.5 text-xs text-slate-600">
              {settingsSummary(record).map((l) => (
                <li key={l}>{l}</li>
              ))}
            </ul>
            {record.notes ? <p className="mt-3 text-sm whitespace-pre-line text-slate-700">{record.notes}</p> : null}
          </CardBody>
        </Card>
        <Card aria-labelledby="record-fits" className="min-w-0 lg:col-span-3">
          <CardHeader titleId="record-fits" title="Fits of this record" />
          <CardBody>
            <QueryBoundary loadingLabel="Loading the fits…" errorTitle="The fits could not be loaded">
              <RecordFitsPanel siteId={site.id} recordId={record.id} displayUnits={site.displayUnits} />
            </QueryBoundary>
          </CardBody>
        </Card>
        <Card aria-labelledby="record-files" className="min-w-0 lg:col-span-3">
          <CardHeader titleId="record-files" title="Files, as uploaded" description="Kept byte for byte; the SHA-256 lets anyone check a copy." />
          <CardBody>
            <ul className="divide-y divide-slate-100">
              {record.files.map((f) => (
                <li key={f.which} className="flex flex-wrap items-center justify-between gap-3 py-2">
                  <div className="min-w-0">
                    <p className="text-sm font-medium break-all text-slate-900">{f.name}</p>
                    <p className="text-xs text-slate-500">
                      {f.which === 'raw' ? (record.source === 'tape' ? 'The readings as typed' : 'Logger file') : 'Barometric file'} · {formatBytes(f.sizeBytes)} · {f.mediaType}
                    </p>
                    <p className="font-mono text-[11px] break-all text-slate-500">SHA-256 {f.sha256}</p>
                  </div>
                  <a href={recordFileUrl(record.id, f.which)} download={f.name} className="text-sm font-medium text-accent-700 hover:underline">
                    Download
                    <span className="sr-only"> {f.name}</span>
                  </a>
                </li>
              ))}
            </ul>
          </CardBody>
        </Card>
      </div>
      <aside aria-label="Cautions" className="mt-8 space-y-1 border-t border-slate-200 pt-4 text-xs leading-relaxed text-slate-600">
        <h2 className="font-semibold tracking-wide text-slate-600 uppercase">Cautions</h2>
        {CAUTIONS.map((c) => (
          <p key={c}>{c}</p>
        ))}
      </aside>
    </>
  );
}
