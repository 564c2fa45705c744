import { useMemo, useState } from 'react';
import { useSuspenseQueries, useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { FIT_METHODS } from '@shared/hydraulics/fitting';
import { repeatTestFlags } from '@shared/hydraulics/qc';
import type { ReducedRecord } from '@shared/hydraulics/reduction';
import type { Fit } from '@shared/schemas/fits';
import type { Site } from '@shared/schemas/sites';
import type { Well } from '@shared/schemas/wells';
import { isKUnit, K_UNITS, type KUnit } from '@shared/units/conductivity';
import { EmptyState } from '@/components/ui/empty-state';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { InlineSelect } from '@/components/ui/field';
import { Table, Td, Th } from '@/components/ui/table';
import { useSessionState } from '@/lib/use-session-state';
import { seriesQueryOptions, wellFitsQueryOptions, wellKQueryOptions, wellRecordsQueryOptions } from '../api';
import { defaultKUnit, formatK, formatLogSpread } from '../format';
import { defaultTimeUnit, PLOT_TIME_UNITS, recoveryEndSeconds, type PlotTimeUnit } from '../plot-math';
import { FitStatusBadge } from './fit-status-badge';
import { QcFlagList } from './qc-flags';
import { recordLabel } from './record-label';
import { CURVE_COLOURS, RepeatTestsPlot } from './repeat-tests-plot';

/** The latest revision of every chain, newest first. */
function latestRevisions(fits: readonly Fit[]): Fit[] {
  const byChain = new Map<string, Fit>();
  for (const f of fits) {
    const current = byChain.get(f.chainId);
    if (!current || f.revision > current.revision) byChain.set(f.chainId, f);
  }
  return [...byChain.values()].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
}

function WellKSummary({ wellId, kUnit }: { wellId: string; kUnit: KUnit }) {
  const { data: k } = useSuspenseQuery(wellKQueryOptions(wellId));
  if (k.kMetersPerSecond === null) {
    return (
      <p className="text-sm text-slate-700" data-testid="well-k">
        <span className="font-medium">No Well K yet:</span> the well has no Checked fit. Only Checked fits count toward Well K and the map.
      </p>
    );
  }
  return (
    <div className="space-y-1" data-testid="well-k">
      <p className="text-2xl font-semibold text-slate-900 tabular-nums" data-k-si={k.kMetersPerSecond}>
        {formatK(k.kMetersPerSecond, kUnit)}
      </p>
      {kUnit !== 'm/s' ? <p className="text-sm text-slate-700 tabular-nums">{formatK(k.kMetersPerSecond, 'm/s')}</p> : null}
      <p className="text-sm text-slate-700">
        Geometric mean of {k.count} Checked {k.count === 1 ? 'fit' : 'fits'}
        {k.log10StdDev !== null ? `; spread ${formatLogSpread(k.log10StdDev)}` : ' (no spread with a single fit)'}.
      </p>
      <p className="text-xs text-slate-500">{k.reference}</p>
    </div>
  );
}

function FitsTable({ site, wellId, kUnit, labels }: { site: Site; wellId: string; kUnit: KUnit; labels: Map<string, string> }) {
  const { data } = useSuspenseQuery(wellFitsQueryOptions(wellId));
  const fits = latestRevisions(data);
  if (fits.length === 0) return <p className="text-sm text-slate-600">No fits yet: open one of the well’s records and fit it.</p>;
  return (
    <Table caption="Fits of the well's records, latest revision of each" stackOnMobile minWidth="min-w-[44rem]">
      <thead>
        <tr>
          <Th>Record</Th>
          <Th>Method</Th>
          <Th>Status</Th>
          <Th className="text-right">K</Th>
          <Th>Prepared by</Th>
          <Th>
            <span className="sr-only">Open</span>
          </Th>
        </tr>
      </thead>
      <tbody>
        {fits.map((f) => (
          <tr key={f.id}>
            <Td label="Record">{labels.get(f.recordId) ?? 'Record'}</Td>
            <Td label="Method">{f.model === 'high-k' ? 'High-K ' : ''}{FIT_METHODS.find((m) => m.id === f.method)?.label ?? f.method}</Td>
            <Td label="Status">
              <span className="inline-flex flex-wrap items-center gap-1.5">
                <FitStatusBadge status={f.status} superseded={f.supersededAt !== null} />
                <span className="text-xs text-slate-500">rev. {f.revision}</span>
              </span>
            </Td>
            <Td label="K" className="text-right whitespace-nowrap tabular-nums">
              {formatK(f.result.kMetersPerSecond, kUnit)}
            </Td>
            <Td label="Prepared by">{f.preparedBy.name}</Td>
            <Td className="text-right">
              <Link to={`/sites/${site.id}/fits/${f.id}`} className="font-medium text-accent-700 hover:underline" aria-label={`Open the fit of ${labels.get(f.recordId) ?? 'the record'}, revision ${f.revision}`}>
                Open
              </Link>
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}

function RepeatTests({ site, wellId }: { site: Site; wellId: string }) {
  const { data: records } = useSuspenseQuery(wellRecordsQueryOptions(wellId));
  const ordered = useMemo(() => [...records].sort((a, b) => (a.testDate ?? a.createdAt).localeCompare(b.testDate ?? b.createdAt)), [records]);
  const series = useSuspenseQueries({ queries: ordered.map((r) => seriesQueryOptions(r.id)) });
  const recovery = Math.max(
    0,
    ...series.map((q, i) => recoveryEndSeconds(q.data.elapsedSeconds, q.data.normalizedHead) ?? ordered[i].durationSeconds),
  );
  const [timeUnit, setTimeUnit] = useSessionState<PlotTimeUnit>(
    `kfield.repeatUnit.${wellId}`,
    defaultTimeUnit(recovery),
    (v): v is PlotTimeUnit => PLOT_TIME_UNITS.some((u) => u.id === v),
  );
  const [whole, setWhole] = useState(false);
  const curves = ordered.map((r, i) => ({
    id: r.id,
    label: recordLabel(r),
    colour: CURVE_COLOURS[i % CURVE_COLOURS.length],
    elapsedSeconds: series[i].data.elapsedSeconds,
    normalizedHead: series[i].data.normalizedHead,
  }));
  const flags = useMemo(() => {
    if (ordered.length < 2) return [];
    const tests = ordered.map((r, i) => {
      const s = series[i].data;
      const reduced: ReducedRecord = {
        reference: r.reference,
        testType: r.direction,
        staticLevelM: r.staticLevelM,
        staticSource: r.staticSource,
        preTestCount: 0,
        testStartSeconds: 0,
        testStartIndex: 0,
        testStartSource: r.testStartSource,
        h0M: r.h0M,
        elapsedSeconds: Float64Array.from(s.elapsedSeconds),
        displacementM: Float64Array.from(s.normalizedHead, (h) => h * r.h0M),
        normalizedHead: Float64Array.from(s.normalizedHead),
      };
      return { label: recordLabel(r), reduced };
    });
    return repeatTestFlags(tests);
  }, [ordered, series]);

  if (ordered.length === 0) {
    return <EmptyState title="No records yet">Add a record of a slug or bail-down test to this well to fit it.</EmptyState>;
  }
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-sm font-semibold text-slate-900">
          Normalized curves of the well’s {ordered.length === 1 ? 'record' : `${ordered.length} records`}
        </h3>
        <div className="flex flex-wrap items-center gap-3">
          <label className="flex items-center gap-2 text-sm text-slate-700">
            <input type="checkbox" checked={whole} onChange={(e) => setWhole(e.target.checked)} className="size-4 accent-accent-700" />
            Whole records
          </label>
          <InlineSelect label="Time unit of the curves" value={timeUnit} onChange={(e) => setTimeUnit(e.target.value as PlotTimeUnit)}>
            {PLOT_TIME_UNITS.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </InlineSelect>
        </div>
      </div>
      <RepeatTestsPlot curves={curves} timeUnit={timeUnit} whole={whole} />
      {flags.length > 0 ? <QcFlagList flags={flags} /> : ordered.length > 1 ? <p className="text-xs text-slate-600">The repeat tests’ normalized curves agree within 20 %.</p> : null}
      <ul className="flex flex-wrap gap-2" aria-label="Fit a record">
        {ordered.map((r) => (
          <li key={r.id}>
            <Link
              to={`/sites/${site.id}/records/${r.id}/fit`}
              className="inline-flex min-h-8 items-center rounded-md bg-white px-3 py-1 text-sm font-medium text-slate-800 shadow-sm ring-1 ring-slate-300 ring-inset hover:bg-slate-50"
            >
              New fit: {recordLabel(r)}
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}

/** The well page's section: Well K, the fits of the well's records and the repeat-test overlay. */
export function WellFitsPanel({ site, well }: { site: Site; well: Well }) {
  const [kUnit, setKUnit] = useSessionState<KUnit>(`kfield.kUnit.${site.id}`, defaultKUnit(site.displayUnits), isKUnit);
  const { data: records } = useSuspenseQuery(wellRecordsQueryOptions(well.id));
  const labels = useMemo(() => new Map(records.map((r) => [r.id, recordLabel(r)])), [records]);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0 space-y-1">
          <h3 className="text-sm font-semibold text-slate-900">Well K</h3>
          <QueryBoundary loadingLabel="Loading Well K…" errorTitle="Well K could not be loaded">
            <WellKSummary wellId={well.id} kUnit={kUnit} />
          </QueryBoundary>
        </div>
        <InlineSelect label="K unit" value={kUnit} onChange={(e) => setKUnit(e.target.value as KUnit)}>
          {K_UNITS.map((u) => (
            <option key={u.id} value={u.id}>
              {u.label}
            </option>
          ))}
        </InlineSelect>
      </div>
      <div className="space-y-2">
        <h3 className="text-sm font-semibold text-slate-900">Fits</h3>
        <QueryBoundary loadingLabel="Loading the fits…" errorTitle="The fits could not be loaded">
          <FitsTable site={site} wellId={well.id} kUnit={kUnit} labels={labels} />
        </QueryBoundary>
      </div>
      <QueryBoundary loadingLabel="Loading the curves…" errorTitle="The curves could not be loaded">
        <RepeatTests site={site} wellId={well.id} />
      </QueryBoundary>
    </div>
  );
}
