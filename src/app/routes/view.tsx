import type { ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { LoadingBlock } from '@/components/ui/spinner';
import { Alert } from '@/components/ui/alert';
import { Disclaimer } from '@/components/ui/disclaimer';
import { Wordmark } from '@/components/ui/wordmark';
import { viewInfoQueryOptions } from '@/features/kmap/view/api';
import { ViewPage } from '@/features/kmap/view/view-page';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { useDocumentTitle } from '@/lib/use-document-title';

/** `/view/:token`: a viewer link's read-only K map, with no sign-in (loaded on its own, with maplibre). */
export function ViewRoute() {
  const { token = '' } = useParams();
  const info = useQuery(viewInfoQueryOptions(token));
  useDocumentTitle(info.data ? `${info.data.siteName} · K map (read-only)` : info.isError ? 'Link not found' : 'K map (read-only)');
  if (info.isPending) return <LoadingBlock label="Opening the shared K map…" />;
  if (info.isError) return isApiError(info.error) && info.error.status === 404 ? <ViewNotFound /> : <ViewUnavailable message={describeError(info.error)} />;
  return <ViewPage token={token} info={info.data} />;
}

function Frame({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col bg-slate-50">
      <main id="main" className="flex flex-1 flex-col items-center px-4 py-10 sm:py-16">
        <span className="mb-8">
          <Wordmark />
        </span>
        <section className="w-full max-w-md space-y-3 rounded-xl bg-white px-5 py-6 shadow-sm ring-1 ring-slate-200 sm:px-8 sm:py-8">{children}</section>
      </main>
      <footer className="px-4 py-6 text-center text-xs text-slate-500">
        <Disclaimer />
      </footer>
    </div>
  );
}

/** The one answer to an unknown, expired or revoked link (the server's status is 404 too): nothing says which. */
function ViewNotFound() {
  return (
    <Frame>
      <h1 className="text-xl font-semibold tracking-tight text-slate-900" data-testid="view-not-found">
        This link does not open a map
      </h1>
      <p className="text-sm text-slate-600">
        The viewer link may have been mistyped, may have expired, or may have been withdrawn by the project team. Ask the person who sent it to you for a new one.
      </p>
    </Frame>
  );
}

function ViewUnavailable({ message }: { message: string }) {
  return (
    <Frame>
      <h1 className="text-xl font-semibold tracking-tight text-slate-900">The map could not be opened</h1>
      <Alert tone="error">{message}</Alert>
      <p className="text-sm text-slate-600">Reload the page in a minute.</p>
    </Frame>
  );
}
