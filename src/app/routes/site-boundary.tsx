import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { RegionError } from '@/components/ui/error-boundary';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';

export function SiteNotFound() {
  useDocumentTitle('Site not found');
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight text-slate-900">Site not found</h1>
      <Alert tone="error">This site does not exist, or you are not a member of it.</Alert>
      <p className="text-sm">
        <Link to="/" className="text-accent-700 hover:underline">
          Go to your sites
        </Link>
      </p>
    </div>
  );
}

/** For the QueryBoundary around a site screen: a missing site is a page of its own, not a broken region. */
export function siteErrorRenderer({ error, reset }: { error: unknown; reset: () => void }): ReactNode {
  if (isApiError(error) && error.status === 404) return <SiteNotFound />;
  return <RegionError error={error} reset={reset} title="The site could not be loaded" />;
}
