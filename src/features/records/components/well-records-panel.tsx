import { useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { RECORD_TEST_TYPE_LABELS } from '@shared/schemas/records';
import type { DisplayUnits } from '@shared/schemas/sites';
import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { Table, Td, Th } from '@/components/ui/table';
import { formatDate } from '@/lib/format';
import { wellRecordsQueryOptions } from '../api';
import { formatCount, formatDuration, formatLevel } from '../format';

const SOURCE_LABELS = { tape: 'Tape readings', logger: 'Logger file' } as const;
const REFERENCE_SHORT = { depth: 'depth below MP', vented: 'vented sensor', absolute: 'absolute + barometric' } as const;

/** A well's records, newest first, with the actions that add one. H0 in the site's units when given. */
export function WellRecordsPanel({ siteId, wellId, canEdit, displayUnits = 'SI' }: { siteId: string; wellId: string; canEdit: boolean; displayUnits?: DisplayUnits }) {
  const { data: records } = useSuspenseQuery(wellRecordsQueryOptions(wellId));
  const base = `/sites/${siteId}/wells/${wellId}/records/new`;
  return (
    <div className="space-y-4">
      {canEdit ? (
        <div className="flex flex-wrap gap-2">
          <ButtonLink to={`${base}/tape`} variant="secondary" size="sm">
            Add tape readings
          </ButtonLink>
          <ButtonLink to={`${base}/logger`} variant="secondary" size="sm">
            Upload logger file
          </ButtonLink>
        </div>
      ) : null}
      {records.length === 0 ? (
        <EmptyState title="No records yet">
          {canEdit ? 'Type the tape readings of a slug or bail-down test, or upload a logger file.' : 'Nobody has added a recovery-test record to this well yet.'}
        </EmptyState>
      ) : (
        <Table caption="Recovery-test records of the well" stackOnMobile minWidth="min-w-[46rem]">
          <thead>
            <tr>
              <Th>Test</Th>
              <Th>Date</Th>
              <Th>Source</Th>
              <Th className="text-right">Readings</Th>
              <Th className="text-right">H0</Th>
              <Th className="text-right">Duration</Th>
              <Th>
                <span className="sr-only">Open</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {records.map((r) => (
              <tr key={r.id}>
                <Td label="Test">
                  <span>
                  <span className="font-medium text-slate-900">{RECORD_TEST_TYPE_LABELS[r.testType]}</span>
                  {r.warnings.length > 0 ? (
                    <span className="ml-2 rounded bg-amber-50 px-1.5 py-0.5 text-xs text-amber-900 ring-1 ring-amber-200">
                      {r.warnings.length === 1 ? '1 warning' : `${r.warnings.length} warnings`}
                    </span>
                  ) : null}
                  </span>
                </Td>
                <Td label="Date">{r.testDate ? formatDate(r.testDate) : '—'}</Td>
                <Td label="Source">
                  <span>
                    {SOURCE_LABELS[r.source]}
                    <span className="block text-xs text-slate-500">{REFERENCE_SHORT[r.reference]}</span>
                  </span>
                </Td>
                <Td label="Readings" className="text-right tabular-nums">
                  {formatCount(r.sampleCount)}
                </Td>
                <Td label="H0" className="text-right tabular-nums whitespace-nowrap">
                  {formatLevel(Math.abs(r.h0M), displayUnits)}
                </Td>
                <Td label="Duration" className="text-right tabular-nums whitespace-nowrap">
                  {formatDuration(r.durationSeconds)}
                </Td>
                <Td className="text-right">
                  <Link
                    to={`/sites/${siteId}/records/${r.id}`}
                    className="font-medium text-accent-700 hover:underline"
                    aria-label={`Open the record ${RECORD_TEST_TYPE_LABELS[r.testType]}${r.testDate ? ` of ${formatDate(r.testDate)}` : ''}`}
                  >
                    Open
                  </Link>
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </div>
  );
}
