import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { useDocumentTitle } from '@/lib/use-document-title';

function describeRouteError(error: unknown): { title: string; detail: string } {
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) return { title: 'Page not found', detail: 'There is no page at this address.' };
    if (error.status === 403) {
      return { title: 'Not allowed', detail: typeof error.data === 'string' ? error.data : 'You do not have access to this page.' };
    }
    return { title: `Error ${error.status}`, detail: typeof error.data === 'string' ? error.data : error.statusText };
  }
  if (isApiError(error) && error.status === 0) return { title: 'Kfield is out of reach', detail: error.message };
  return { title: 'Something went wrong', detail: describeError(error) };
}

/** The error page for a failed route inside the signed-in shell: the top bar stays. */
export function RouteErrorPanel() {
  const error = useRouteError();
  const { title, detail } = describeRouteError(error);
  useDocumentTitle(title);
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight text-slate-900">{title}</h1>
      <Alert tone="error">{detail}</Alert>
      <p className="text-sm">
        <Link to="/" className="text-accent-700 hover:underline">
          Go to your sites
        </Link>
      </p>
    </div>
  );
}

/** The last line of defence, for failures outside the shell (the sign-in check itself failed). */
export function RootErrorPage() {
  const error = useRouteError();
  const { title, detail } = describeRouteError(error);
  useDocumentTitle(title);
  return (
    <main id="main" className="mx-auto flex min-h-dvh max-w-xl flex-col justify-center gap-4 px-4">
      <h1 className="text-2xl font-semibold tracking-tight text-slate-900">{title}</h1>
      <Alert tone="error">{detail}</Alert>
      <p className="text-sm">
        <a href="/" className="text-accent-700 hover:underline">
          Reload Kfield
        </a>
      </p>
    </main>
  );
}

export function NotFoundRoute() {
  useDocumentTitle('Page not found');
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight text-slate-900">Page not found</h1>
      <p className="text-sm text-slate-600">There is no page at this address.</p>
      <p className="text-sm">
        <Link to="/" className="text-accent-700 hover:underline">
          Go to your sites
        </Link>
      </p>
    </div>
  );
}
