import { Card } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { CheckQueue } from '@/features/fits/components/check-queue';
import { useDocumentTitle } from '@/lib/use-document-title';

export function ChecksRoute() {
  useDocumentTitle('Checks');
  return (
    <>
      <PageHeader
        title="Checks"
        description="Fits awaiting your check on every site where you are a Checker or Lead, oldest first. Open one to check it against its record and parameters, then sign it off or send it back with a comment."
      />
      <Card>
        <QueryBoundary loadingLabel="Loading the check queue…" errorTitle="The check queue could not be loaded">
          <CheckQueue />
        </QueryBoundary>
      </Card>
    </>
  );
}
