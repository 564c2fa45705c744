import { useSearchParams } from 'react-router-dom';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { Outbox } from '@/features/admin/components/outbox';
import { useDocumentTitle } from '@/lib/use-document-title';

export function AdminOutboxRoute() {
  useDocumentTitle('Outbox');
  const [params] = useSearchParams();
  return (
    <>
      <PageHeader
        title="Outbox"
        crumbs={[{ label: 'Admin' }, { label: 'Outbox' }]}
        description="The e-mail Kfield has sent through its local mail service: invitations and password-reset links, newest first."
      />
      <QueryBoundary loadingLabel="Loading messages…" errorTitle="The outbox could not be loaded">
        <Outbox
          selectedId={params.get('message')}
          messageHref={(id) => `/admin/outbox?message=${encodeURIComponent(id)}`}
          listHref="/admin/outbox"
        />
      </QueryBoundary>
    </>
  );
}
