import type { ReactNode } from 'react';
import { Link, Outlet } from 'react-router-dom';
import { Disclaimer } from '@/components/ui/disclaimer';
import { Wordmark } from '@/components/ui/wordmark';
import { useDocumentTitle } from '@/lib/use-document-title';

/** The frame of the screens used before (or instead of) being signed in. */
export function PublicLayout() {
  return (
    <div className="flex min-h-dvh flex-col bg-slate-50">
      <main id="main" className="flex flex-1 flex-col items-center px-4 py-10 sm:py-16">
        <Link to="/" className="mb-8 rounded-md" aria-label="Kfield home">
          <Wordmark />
        </Link>
        <Outlet />
      </main>
      <footer className="px-4 py-6 text-center text-xs text-slate-500">
        <Disclaimer />
      </footer>
    </div>
  );
}

export function AuthCard({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  useDocumentTitle(title);
  return (
    <section
      className="w-full max-w-md rounded-xl bg-white px-5 py-6 shadow-sm ring-1 ring-slate-200 sm:px-8 sm:py-8"
    >
      <h1 className="text-xl font-semibold tracking-tight text-slate-900">
        {title}
      </h1>
      {intro ? <div className="mt-2 text-sm text-slate-600">{intro}</div> : null}
      <div className="mt-6">{children}</div>
    </section>
  );
}
