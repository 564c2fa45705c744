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
        description="Every e-mail Kfield queues (invitations, password-reset links, fits to check and checked), newest first, with its delivery to the mail relay. A message the relay refuses is tried again later."
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
