import { Link } from 'react-router-dom';
import { useDocumentTitle } from '@/lib/use-document-title';
import { Alert } from './alert';

/** What a route shows for a resource that does not exist or is hidden from the caller. */
export function NotFoundPanel({ title, message, siteId }: { title: string; message: string; siteId: string }) {
  useDocumentTitle(title);
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight text-slate-900">{title}</h1>
      <Alert tone="error">{message}</Alert>
      <p className="text-sm">
        <Link to={`/sites/${siteId}/wells`} className="text-accent-700 hover:underline">
          Go to the site's wells
        </Link>
      </p>
    </div>
  );
}
