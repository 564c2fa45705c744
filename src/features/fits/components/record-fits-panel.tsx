import { useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { FIT_METHODS } from '@shared/hydraulics/fitting';
import type { DisplayUnits } from '@shared/schemas/sites';
import { isKUnit, type KUnit } from '@shared/units/conductivity';
import { Table, Td, Th } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import { useSessionState } from '@/lib/use-session-state';
import { recordFitsQueryOptions } from '../api';
import { defaultKUnit, formatK } from '../format';
import { FitStatusBadge } from './fit-status-badge';

/** The record's fits: the latest revision of each, with its state, K and who prepared it. */
export function RecordFitsPanel({ siteId, recordId, displayUnits = 'SI' }: { siteId: string; recordId: string; displayUnits?: DisplayUnits }) {
  const { data: fits } = useSuspenseQuery(recordFitsQueryOptions(recordId));
  const [kUnit] = useSessionState<KUnit>(`kfield.kUnit.${siteId}`, defaultKUnit(displayUnits), isKUnit);
  const latest = new Map<string, (typeof fits)[number]>();
  for (const f of fits) {
    const current = latest.get(f.chainId);
    if (!current || f.revision > current.revision) latest.set(f.chainId, f);
  }
  const rows = [...latest.values()].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
  if (rows.length === 0) return <p className="text-sm text-slate-600">No fits of this record yet.</p>;
  return (
    <Table caption="Fits of this record, latest revision of each" stackOnMobile minWidth="min-w-[40rem]">
      <thead>
        <tr>
          <Th>Method</Th>
          <Th>Status</Th>
          <Th className="text-right">K</Th>
          <Th>Prepared by</Th>
          <Th>Changed</Th>
          <Th>
            <span className="sr-only">Open</span>
          </Th>
        </tr>
      </thead>
      <tbody>
        {rows.map((f) => (
          <tr key={f.id}>
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
            <Td label="Changed" className="whitespace-nowrap">
              {formatDateTime(f.updatedAt)}
            </Td>
            <Td className="text-right">
              <Link to={`/sites/${siteId}/fits/${f.id}`} className="font-medium text-accent-700 hover:underline" aria-label={`Open the ${f.method === 'hvorslev' ? 'Hvorslev' : 'Bouwer-Rice'} fit, revision ${f.revision}`}>
                Open
              </Link>
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
