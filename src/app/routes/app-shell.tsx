import { Link, Navigate, NavLink, Outlet, useLocation, useMatch, useNavigation } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Disclaimer } from '@/components/ui/disclaimer';
import { useToast } from '@/components/ui/toast';
import { Wordmark } from '@/components/ui/wordmark';
import { useMe, useSignOut } from '@/features/auth/hooks';
import { ChecksNavLink } from '@/features/fits/components/checks-nav-link';
import { SiteSwitch } from '@/features/sites/components/site-switch';
import { cn } from '@/lib/cn';
import { describeError } from '@/lib/errors';
import { signInPathFor } from '@/lib/safe-next';

const navLink = ({ isActive }: { isActive: boolean }) =>
  cn(
    'rounded-md px-2.5 py-1.5 text-sm whitespace-nowrap transition-colors',
    isActive ? 'bg-accent-50 font-medium text-accent-800' : 'text-slate-600 hover:bg-slate-100 hover:text-slate-900',
  );

export function AppShell() {
  const me = useMe();
  const location = useLocation();
  const navigation = useNavigation();
  const siteMatch = useMatch('/sites/:siteId/*');
  const signOut = useSignOut();
  const toast = useToast();

  if (!me) {
    // Mid-navigation (signing out) the destination decides; otherwise the session ended under us.
    if (navigation.state !== 'idle') return null;
    return <Navigate to={signInPathFor(location)} replace />;
  }

  return (
    <div className="flex min-h-dvh flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:rounded-md focus:bg-white focus:px-3 focus:py-2 focus:shadow"
      >
        Skip to content
      </a>
      <header className="border-b border-slate-200 bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-2.5">
          <Link to="/" className="rounded-md" aria-label="Kfield, all sites">
            <Wordmark />
          </Link>
          <nav aria-label="Main" className="order-last flex w-full flex-wrap items-center gap-1 sm:order-none sm:w-auto">
            <NavLink to="/" end className={() => navLink({ isActive: location.pathname === '/' || siteMatch !== null })}>
              Sites
            </NavLink>
            {siteMatch ? (
              <NavLink to={`/sites/${siteMatch.params.siteId}/map`} className={navLink}>
                K map
              </NavLink>
            ) : null}
            <ChecksNavLink className={navLink} />
            {me.isAdmin ? (
              <>
                <NavLink to="/admin/users" className={navLink}>
                  Users
                </NavLink>
                <NavLink to="/admin/outbox" className={navLink}>
                  Outbox
                </NavLink>
                <NavLink to="/admin/basemaps" className={navLink}>
                  Basemaps
                </NavLink>
              </>
            ) : null}
            <span className="ml-auto sm:ml-2">
              <SiteSwitch currentSiteId={siteMatch?.params.siteId} />
            </span>
          </nav>
          <div className="ml-auto flex min-w-0 items-center gap-3">
            <span className="min-w-0 truncate text-sm text-slate-700" title={me.email}>
              <span className="sr-only">Signed in as </span>
              {me.name}
              {me.isAdmin ? <span className="ml-1.5 text-xs text-slate-500">(Admin)</span> : null}
            </span>
            <Button
              variant="secondary"
              size="sm"
              pending={signOut.isPending}
              onClick={() => signOut.mutate(undefined, { onError: (error) => toast.error(describeError(error)) })}
            >
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-6xl flex-1 px-4 py-6 focus:outline-none sm:py-8">
        <Outlet />
      </main>
      <footer className="border-t border-slate-200 bg-white">
        <div className="mx-auto max-w-6xl px-4 py-4 text-xs text-slate-500">
          <Disclaimer />
        </div>
      </footer>
    </div>
  );
}
