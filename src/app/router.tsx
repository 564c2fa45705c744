import { createBrowserRouter, data, redirect, type LoaderFunctionArgs, type RouteObject } from 'react-router-dom';
import type { QueryClient } from '@tanstack/react-query';
import { LoadingBlock } from '@/components/ui/spinner';
import { meQueryOptions } from '@/features/auth/api';
import type { Me } from '@shared/schemas/auth';
import { membersQueryOptions } from '@/features/members/api';
import { outboxQueryOptions, usersQueryOptions } from '@/features/admin/api';
import { adminBasemapsQueryOptions } from '@/features/basemaps/api';
import { siteQueryOptions, sitesQueryOptions } from '@/features/sites/api';
import { canManageViewerLinks, viewerLinksQueryOptions } from '@/features/viewer-links/api';
import { wellQueryOptions, wellsQueryOptions } from '@/features/wells/api';
import { recordQueryOptions, recordSeriesQueryOptions } from '@/features/records/api';
import { mapWellsQueryOptions } from '@/features/kmap/api';
import { checksQueryOptions, fitQueryOptions, recordMetaQueryOptions, reducedQueryOptions, seriesQueryOptions } from '@/features/fits/api';
import { safeNextPath, signInPathFor } from '@/lib/safe-next';
import { AcceptInvitationRoute } from './routes/accept-invitation';
import { AdminBasemapsRoute } from './routes/admin-basemaps';
import { AdminOutboxRoute } from './routes/admin-outbox';
import { AdminUsersRoute } from './routes/admin-users';
import { AppShell } from './routes/app-shell';
import { ChecksRoute } from './routes/checks';
import { NewFitRoute } from './routes/fit-new';
import { FitRoute } from './routes/fit-page';
import { ForgotPasswordRoute } from './routes/forgot-password';
import { PublicLayout } from './routes/public-layout';
import { NewLoggerRecordRoute, NewTapeRecordRoute } from './routes/record-new';
import { RecordPageRoute } from './routes/record-page';
import { ResetPasswordRoute } from './routes/reset-password';
import { RootLayout } from './routes/root';
import { NotFoundRoute, RootErrorPage, RouteErrorPanel } from './routes/route-error';
import { SignInRoute } from './routes/sign-in';
import { SiteMembersRoute } from './routes/site-members';
import { SiteOverviewRoute } from './routes/site-overview';
import { SiteViewerLinksRoute } from './routes/site-viewer-links';
import { SitesRoute } from './routes/sites';
import { SiteWellsRoute } from './routes/site-wells';
import { WellPageRoute } from './routes/well-page';
import { NewWellRoute } from './routes/well-new';
import { WellsImportRoute } from './routes/wells-import';

/*
 * Loaders only decide where a person may go and start fetches early; the screens read the same
 * queryOptions with useSuspenseQuery, so nothing is fetched twice.
 */
export function createRoutes(queryClient: QueryClient): RouteObject[] {
  const signedInOnly = async ({ request }: LoaderFunctionArgs) => {
    const me = await queryClient.ensureQueryData(meQueryOptions());
    if (!me) throw redirect(signInPathFor(new URL(request.url)));
    return null;
  };

  const adminOnly = async () => {
    const me = await queryClient.ensureQueryData(meQueryOptions());
    if (!me?.isAdmin) throw data('This page is for instance admins.', { status: 403 });
    return null;
  };

  const signedOutOnly = async ({ request }: LoaderFunctionArgs) => {
    const me = await queryClient.ensureQueryData(meQueryOptions());
    if (me) throw redirect(safeNextPath(new URL(request.url).searchParams.get('next')));
    return null;
  };

  /*
   * Child loaders run alongside the shell's sign-in check; they wait for it (one shared request)
   * so a signed-out visitor is not sent a volley of 401s before the redirect.
   */
  const prefetchWhenSignedIn =
    (start: (args: LoaderFunctionArgs, me: Me) => void) =>
    async (args: LoaderFunctionArgs) => {
      const me = await queryClient.ensureQueryData(meQueryOptions());
      if (me) start(args, me);
      return null;
    };

  const prefetchSite = prefetchWhenSignedIn(({ params }) => {
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(membersQueryOptions(params.siteId ?? ''));
  });

  // Viewer links are the Leads': the list is asked for only once the site says the person may see it.
  const prefetchViewerLinks = prefetchWhenSignedIn(({ params }, me) => {
    const siteId = params.siteId ?? '';
    void queryClient.fetchQuery(siteQueryOptions(siteId)).then(
      (site) => {
        if (canManageViewerLinks(site, me)) void queryClient.prefetchQuery(viewerLinksQueryOptions(siteId));
      },
      () => undefined, // the screen shows the site's error itself
    );
  });

  const prefetchWells = prefetchWhenSignedIn(({ params }) => {
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(wellsQueryOptions(params.siteId ?? ''));
  });

  const prefetchWell = prefetchWhenSignedIn(({ params }) => {
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(wellQueryOptions(params.wellId ?? ''));
  });

  const prefetchMap = prefetchWhenSignedIn(({ params }) => {
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(mapWellsQueryOptions(params.siteId ?? ''));
  });

  const prefetchRecord = prefetchWhenSignedIn(({ params }) => {
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(recordQueryOptions(params.recordId ?? ''));
    void queryClient.prefetchQuery(recordSeriesQueryOptions(params.recordId ?? ''));
  });

  const prefetchNewFit = prefetchWhenSignedIn(({ params }) => {
    const recordId = params.recordId ?? '';
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(recordMetaQueryOptions(recordId));
    void queryClient.prefetchQuery(reducedQueryOptions(recordId));
    void queryClient.prefetchQuery(seriesQueryOptions(recordId));
  });

  const prefetchFit = prefetchWhenSignedIn(({ params }) => {
    void queryClient.prefetchQuery(siteQueryOptions(params.siteId ?? ''));
    void queryClient.prefetchQuery(fitQueryOptions(params.fitId ?? ''));
  });

  const prefetchForAdmin = (start: () => void) =>
    prefetchWhenSignedIn((_, me) => {
      if (me.isAdmin) start();
    });

  return [
    {
      id: 'root',
      element: <RootLayout />,
      errorElement: <RootErrorPage />,
      hydrateFallbackElement: <LoadingBlock label="Starting Kfield…" />,
      children: [
        {
          element: <PublicLayout />,
          errorElement: <RootErrorPage />,
          children: [
            { path: 'sign-in', loader: signedOutOnly, element: <SignInRoute /> },
            { path: 'forgot-password', element: <ForgotPasswordRoute /> },
            { path: 'reset-password', element: <ResetPasswordRoute /> },
            { path: 'invitations/:token', element: <AcceptInvitationRoute /> },
          ],
        },
        // A viewer link's read-only map: no sign-in, no app shell; maplibre comes in its own chunk.
        { path: 'view/:token', errorElement: <RootErrorPage />, lazy: async () => ({ Component: (await import('./routes/view')).ViewRoute }) },
        {
          loader: signedInOnly,
          element: <AppShell />,
          children: [
            {
              errorElement: <RouteErrorPanel />,
              children: [
                { index: true, loader: prefetchWhenSignedIn(() => void queryClient.prefetchQuery(sitesQueryOptions())), element: <SitesRoute /> },
                {
                  path: 'sites/:siteId',
                  loader: prefetchSite,
                  element: <SiteOverviewRoute />,
                },
                {
                  path: 'sites/:siteId/members',
                  loader: prefetchSite,
                  element: <SiteMembersRoute />,
                },
                { path: 'sites/:siteId/viewer-links', loader: prefetchViewerLinks, element: <SiteViewerLinksRoute /> },
                { path: 'sites/:siteId/wells', loader: prefetchWells, element: <SiteWellsRoute /> },
                { path: 'sites/:siteId/wells/new', loader: prefetchWells, element: <NewWellRoute /> },
                { path: 'sites/:siteId/wells/import', loader: prefetchWells, element: <WellsImportRoute /> },
                { path: 'sites/:siteId/wells/:wellId', loader: prefetchWell, element: <WellPageRoute /> },
                { path: 'sites/:siteId/wells/:wellId/records/new/tape', loader: prefetchWell, element: <NewTapeRecordRoute /> },
                { path: 'sites/:siteId/wells/:wellId/records/new/logger', loader: prefetchWell, element: <NewLoggerRecordRoute /> },
                { path: 'sites/:siteId/records/:recordId', loader: prefetchRecord, element: <RecordPageRoute /> },
                // The K map loads maplibre: its own chunk, fetched when the page is opened.
                { path: 'sites/:siteId/map', loader: prefetchMap, lazy: async () => ({ Component: (await import('./routes/site-map')).SiteMapRoute }) },
                { path: 'sites/:siteId/records/:recordId/fit', loader: prefetchNewFit, element: <NewFitRoute /> },
                { path: 'sites/:siteId/fits/:fitId', loader: prefetchFit, element: <FitRoute /> },
                { path: 'checks', loader: prefetchWhenSignedIn(() => void queryClient.prefetchQuery(checksQueryOptions())), element: <ChecksRoute /> },
                {
                  path: 'admin',
                  loader: adminOnly,
                  children: [
                    { index: true, loader: () => redirect('/admin/users') },
                    { path: 'users', loader: prefetchForAdmin(() => void queryClient.prefetchQuery(usersQueryOptions())), element: <AdminUsersRoute /> },
                    { path: 'outbox', loader: prefetchForAdmin(() => void queryClient.prefetchQuery(outboxQueryOptions())), element: <AdminOutboxRoute /> },
                    { path: 'basemaps', loader: prefetchForAdmin(() => void queryClient.prefetchQuery(adminBasemapsQueryOptions())), element: <AdminBasemapsRoute /> },
                  ],
                },
                { path: '*', element: <NotFoundRoute /> },
              ],
            },
          ],
        },
      ],
    },
  ];
}

export function createRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
