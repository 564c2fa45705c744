import { useSuspenseQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { Table, Td, Th } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import { FIT_METHODS } from '@shared/hydraulics/fitting';
import { checksQueryOptions } from '../api';
import { formatK } from '../format';

/** The fits awaiting my check across my sites, oldest first. */
export function CheckQueue() {
  const { data } = useSuspenseQuery(checksQueryOptions());
  const items = [...data].sort((a, b) => a.submittedAt.localeCompare(b.submittedAt));
  if (items.length === 0) {
    return (
      <EmptyState title="Nothing awaits your check">
        Fits submitted on your sites appear here, oldest first. Fits you prepared yourself go to another Checker.
      </EmptyState>
    );
  }
  return (
    <Table caption="Fits awaiting my check, oldest first" stackOnMobile minWidth="min-w-[56rem]">
      <thead>
        <tr>
          <Th>Well</Th>
          <Th>Site</Th>
          <Th>Method</Th>
          <Th className="text-right">K</Th>
          <Th>Revision</Th>
          <Th>Prepared by</Th>
          <Th>Submitted</Th>
          <Th className="text-right">QC flags</Th>
          <Th>
            <span className="sr-only">Open</span>
          </Th>
        </tr>
      </thead>
      <tbody>
        {items.map((item) => (
          <tr key={item.fitId} className="hover:bg-slate-50">
            <Td label="Well">
              <Link to={`/sites/${item.siteId}/fits/${item.fitId}`} className="font-medium text-accent-700 hover:underline">
                {item.wellName}
              </Link>
            </Td>
            <Td label="Site">{item.siteName}</Td>
            <Td label="Method">{FIT_METHODS.find((m) => m.id === item.method)?.label ?? item.method}</Td>
            <Td label="K" className="text-right whitespace-nowrap tabular-nums">
              {formatK(item.kMetersPerSecond, 'm/s')}
            </Td>
            <Td label="Revision">{item.revision}</Td>
            <Td label="Prepared by">{item.preparedBy.name}</Td>
            <Td label="Submitted" className="whitespace-nowrap">
              <time dateTime={item.submittedAt}>{formatDateTime(item.submittedAt)}</time>
            </Td>
            <Td label="QC flags" className="text-right tabular-nums">
              {item.flagCount}
            </Td>
            <Td className="text-right">
              <ButtonLink to={`/sites/${item.siteId}/fits/${item.fitId}`} variant="secondary" size="sm" aria-label={`Review the fit of ${item.wellName}`}>
                Review
              </ButtonLink>
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
